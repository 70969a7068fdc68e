/**
 * A MariaDB connection of the test's own (mysql2, the API package's driver), to look at what is
 * stored after a fault and to hold locks that stop a request at a chosen step.
 */
import { createRequire } from 'node:module';
import path from 'node:path';
import { ROOT } from '../../e2e/harness/paths.ts';

const requireFromApi = createRequire(path.join(ROOT, 'packages', 'api', 'package.json'));

export interface Sql {
  /** Rows of a SELECT (or the driver's result of another statement). */
  query<T = Record<string, unknown>>(sql: string, values?: readonly unknown[]): Promise<T[]>;
  close(): Promise<void>;
}

interface Mysql2Promise {
  createConnection(options: Record<string, unknown>): Promise<{ query(sql: string, values?: readonly unknown[]): Promise<[unknown, unknown]>; end(): Promise<void>; destroy(): void }>;
}

export async function connect(db: { host: string; port: number; user: string; password: string; database: string }): Promise<Sql> {
  const mysql = requireFromApi('mysql2/promise') as Mysql2Promise;
  const connection = await mysql.createConnection({ host: db.host, port: db.port, user: db.user, password: db.password, database: db.database, connectTimeout: 5_000 });
  return {
    async query<T>(sql: string, values: readonly unknown[] = []) {
      const [rows] = await connection.query(sql, values);
      return rows as T[];
    },
    async close() {
      // A connection to a killed server cannot say goodbye.
      await connection.end().catch(() => connection.destroy());
    },
  };
}

/** Waits until MariaDB runs a statement matching `pattern` on another connection (a request stopped at a lock). */
export async function waitForStatement(sql: Sql, pattern: RegExp, timeoutMs = 30_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const rows = await sql.query<{ INFO: string | null }>('SELECT `INFO` FROM `information_schema`.`PROCESSLIST` WHERE `ID` <> CONNECTION_ID() AND `INFO` IS NOT NULL');
    if (rows.some((r) => pattern.test(r.INFO ?? ''))) return;
    if (Date.now() > deadline) throw new Error(`no statement matching ${pattern} within ${timeoutMs / 1000} s`);
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}
