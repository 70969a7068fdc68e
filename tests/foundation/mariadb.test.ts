import { execFileSync } from 'node:child_process';
import fs from 'node:fs/promises';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { startMariaDb } from '../../scripts/lib/mariadb.ts';
import { StartupError } from '../../scripts/lib/startup-error.ts';

const scratch = await fs.mkdtemp(path.join(os.tmpdir(), 'lw-db-'));
afterAll(() => fs.rm(scratch, { recursive: true, force: true }));

const credentials = { database: 'lw_found', user: 'lw_found', password: 'found-pass-1' } as const;

function query(socket: string, sql: string): string {
  return execFileSync('mariadb', ['--socket', socket, '-uroot', '-N', '-B', '-e', sql], { encoding: 'utf8' }).trim();
}

describe('project-local MariaDB', () => {
  it('keeps data across a stop and a second start of the same data directory', async () => {
    const dataDir = path.join(scratch, 'keep');
    const first = await startMariaDb({ dataDir, ...credentials, fresh: true });
    query(first.socket, `CREATE TABLE ${credentials.database}.kept (v INT); INSERT INTO ${credentials.database}.kept VALUES (42);`);
    await first.stop();
    const second = await startMariaDb({ dataDir, ...credentials });
    try {
      expect(second.port).toBe(first.port);
      expect(query(second.socket, `SELECT v FROM ${credentials.database}.kept`)).toBe('42');
    } finally {
      await second.stop();
    }
  });

  it('listens on loopback only, with the application user able to sign in over TCP', async () => {
    const db = await startMariaDb({ dataDir: path.join(scratch, 'tcp'), ...credentials, fresh: true });
    try {
      const out = execFileSync('mariadb', ['-h', '127.0.0.1', '-P', String(db.port), `-u${db.user}`, `-p${db.password}`, '-N', '-B', '-e', 'SELECT @@bind_address, @@port'], { encoding: 'utf8' });
      expect(out.trim().split('\t')).toEqual(['127.0.0.1', String(db.port)]);
    } finally {
      await db.stop();
    }
  });

  it('refuses a port that another program holds, in one line that names the port', async () => {
    const blocker = net.createServer();
    await new Promise<void>((resolve) => blocker.listen(0, '127.0.0.1', resolve));
    const port = (blocker.address() as net.AddressInfo).port;
    try {
      const attempt = startMariaDb({ dataDir: path.join(scratch, 'taken'), port, ...credentials, fresh: true });
      await expect(attempt).rejects.toBeInstanceOf(StartupError);
      await expect(attempt).rejects.toThrow(new RegExp(`^port ${port} on 127\\.0\\.0\\.1 is taken`));
    } finally {
      blocker.close();
    }
  });

  it('refuses an unusable data directory with a message that names it', async () => {
    const notADirectory = path.join(scratch, 'plain-file');
    await fs.writeFile(notADirectory, 'not a directory');
    const attempt = startMariaDb({ dataDir: path.join(notADirectory, 'db'), ...credentials });
    await expect(attempt).rejects.toBeInstanceOf(StartupError);
    await expect(attempt).rejects.toThrow(/data directory .*plain-file\/db is unusable/);
  });

  it('rejects a database name that is not a plain identifier before running any SQL', async () => {
    const attempt = startMariaDb({ dataDir: path.join(scratch, 'badname'), database: 'x; DROP DATABASE mysql', user: 'lw', password: 'found-pass-1', fresh: true });
    await expect(attempt).rejects.toThrow(/database name .* must match/);
  });
});
