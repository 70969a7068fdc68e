/**
 * MariaDB's own client programs (Debian's mariadb-client, which mariadb-server depends on):
 * mariadb-dump writes a database as SQL, mariadb runs SQL. Credentials go in a temporary option file
 * readable by this user only (`--defaults-extra-file`, which must be the first option; MariaDB 10.11
 * manual, "Configuring MariaDB with Option Files"), never on a command line other users can read.
 */
import { spawn } from 'node:child_process';
import { createWriteStream, existsSync } from 'node:fs';
import fs from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { pipeline } from 'node:stream/promises';
import type { Readable } from 'node:stream';
import type { DbAddress } from '../config.ts';

export class MariaDbProgramError extends Error {
  override readonly name = 'MariaDbProgramError';
}

export function mariadbProgram(name: string): string {
  for (const dir of ['/usr/bin', '/usr/sbin', '/usr/local/bin', '/usr/local/sbin']) {
    const candidate = path.join(dir, name);
    if (existsSync(candidate)) return candidate;
  }
  throw new MariaDbProgramError(`MariaDB program '${name}' not found: install Debian's mariadb-client`);
}

/** An option-file value in double quotes, with backslash and quote escaped (the option-file syntax). */
function quoted(value: string): string {
  return `"${value.replace(/\\/g, '\\\\').replace(/"/g, '\\"')}"`;
}

async function withOptionFile<T>(db: DbAddress, work: (optionFile: string) => Promise<T>): Promise<T> {
  const dir = await fs.mkdtemp(path.join(os.tmpdir(), 'lw-mariadb-'));
  const file = path.join(dir, 'client.cnf');
  try {
    const text = ['[client]', `host=${quoted(db.host)}`, `port=${db.port}`, 'protocol=TCP', `user=${quoted(db.user)}`, `password=${quoted(db.password)}`, ''].join('\n');
    await fs.writeFile(file, text, { mode: 0o600 });
    return await work(file);
  } finally {
    await fs.rm(dir, { recursive: true, force: true });
  }
}

/** Runs a program; its stdout goes to `stdout` (or is dropped), `stdin` is piped in; rejects with its last stderr lines. */
function run(program: string, args: readonly string[], io: { stdin?: Readable; stdout?: NodeJS.WritableStream }): Promise<void> {
  return new Promise((resolve, reject) => {
    const child = spawn(program, args, { stdio: [io.stdin ? 'pipe' : 'ignore', io.stdout ? 'pipe' : 'ignore', 'pipe'] });
    let stderr = '';
    child.stderr?.on('data', (chunk: Buffer) => (stderr = (stderr + chunk.toString()).slice(-4000)));
    const streams: Promise<void>[] = [];
    if (io.stdin && child.stdin) streams.push(pipeline(io.stdin, child.stdin));
    if (io.stdout && child.stdout) streams.push(pipeline(child.stdout, io.stdout));
    const exited = new Promise<number | null>((done) => child.once('close', (code) => done(code)));
    child.once('error', (err) => reject(new MariaDbProgramError(`${path.basename(program)} could not start: ${err.message}`)));
    void Promise.all([exited, Promise.allSettled(streams)]).then(([code, piped]) => {
      const brokenPipe = piped.find((p): p is PromiseRejectedResult => p.status === 'rejected');
      if (code === 0 && !brokenPipe) return resolve();
      const why = stderr.trim().split('\n').slice(-2).join(' ') || (brokenPipe ? String((brokenPipe.reason as Error).message) : `exit ${code}`);
      reject(new MariaDbProgramError(`${path.basename(program)} failed: ${why}`));
    });
  });
}

/**
 * The whole database as SQL in one consistent snapshot (--single-transaction: InnoDB, no table locks),
 * with its triggers, binary columns as hex, no dump date (the same data dumps to the same bytes), and
 * without the rows of `ignoreRowsOf` (their tables are created empty on restore).
 */
export function dumpDatabase(db: DbAddress, outFile: string, ignoreRowsOf: readonly string[]): Promise<void> {
  return withOptionFile(db, (optionFile) =>
    run(
      mariadbProgram('mariadb-dump'),
      [
        `--defaults-extra-file=${optionFile}`,
        '--single-transaction',
        '--quick',
        '--triggers',
        '--hex-blob',
        '--skip-dump-date',
        '--no-tablespaces',
        '--default-character-set=utf8mb4',
        ...ignoreRowsOf.map((table) => `--ignore-table-data=${db.database}.${table}`),
        db.database,
      ],
      { stdout: createWriteStream(outFile, { mode: 0o600 }) },
    ),
  );
}

/** Runs the SQL from `sql` in the database, stopping at the first error. */
export function runSql(db: DbAddress, sql: Readable): Promise<void> {
  return withOptionFile(db, (optionFile) => run(mariadbProgram('mariadb'), [`--defaults-extra-file=${optionFile}`, '--default-character-set=utf8mb4', db.database], { stdin: sql }));
}
