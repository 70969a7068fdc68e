import type { DbAddress } from '../src/config.ts';

/** Where the API tests' MariaDB listens (provided by global-setup.ts). */
export type TestDb = DbAddress;
