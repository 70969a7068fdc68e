/** Where the API tests' MariaDB listens (provided by global-setup.ts). */
export interface TestDb {
  host: string;
  port: number;
  user: string;
  password: string;
  database: string;
}
