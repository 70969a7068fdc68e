import fs from 'node:fs/promises';
import path from 'node:path';
import type { TestProject } from 'vitest/node';
import { startMariaDb } from '../../../scripts/lib/mariadb.ts';
import { dbEnv } from '../src/config.ts';
import { createDataSource, runMigrations } from '../src/data-source.ts';
import type { TestDb } from './db.ts';

const ROOT = path.resolve(import.meta.dirname, '../../..');

declare module 'vitest' {
  export interface ProvidedContext {
    lwDb: TestDb;
    /** The release file store of this test run (LW_FILE_STORE_DIR). */
    lwFileStoreDir: string;
  }
}

/**
 * One MariaDB for the API tests: the root test command's, when it set LW_DB_PORT, else a fresh
 * project-local one under .data/test-<pid>. Either way the migrations run before any test, and the
 * release files go to a file store of this run (.data/test-files-<pid>), removed afterwards.
 */
export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  let stop = async (): Promise<void> => {};
  let db: TestDb;
  if (process.env.LW_DB_PORT) {
    db = {
      host: process.env.LW_DB_HOST ?? '127.0.0.1',
      port: Number(process.env.LW_DB_PORT),
      user: process.env.LW_DB_USER ?? 'loopwright',
      password: process.env.LW_DB_PASSWORD ?? '',
      database: process.env.LW_DB_NAME ?? 'loopwright',
    };
  } else {
    const dataDir = path.join(ROOT, '.data', `test-${process.pid}`);
    const instance = await startMariaDb({
      dataDir,
      fresh: true,
      database: 'loopwright_test',
      user: 'loopwright',
      password: 'test-only-password',
    });
    db = { host: instance.host, port: instance.port, user: instance.user, password: instance.password, database: instance.database };
    stop = async () => {
      await instance.stop();
      await fs.rm(dataDir, { recursive: true, force: true });
    };
  }
  const fileStoreDir = path.join(ROOT, '.data', `test-files-${process.pid}`);
  await fs.rm(fileStoreDir, { recursive: true, force: true });
  const stopDb = stop;
  stop = async () => {
    await stopDb();
    await fs.rm(fileStoreDir, { recursive: true, force: true });
  };
  Object.assign(process.env, dbEnv(db), { LW_FILE_STORE_DIR: fileStoreDir });
  const dataSource = createDataSource({ ...db, poolSize: 2, connectTimeoutMs: 5_000 });
  await dataSource.initialize();
  try {
    await runMigrations(dataSource);
  } finally {
    await dataSource.destroy();
  }
  project.provide('lwDb', db);
  project.provide('lwFileStoreDir', fileStoreDir);
  return stop;
}
