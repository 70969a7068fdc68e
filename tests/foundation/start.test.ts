/**
 * The README's first command, end to end: `npm start`'s script on a data directory of its own,
 * signed into with a demo account, stopped with Ctrl-C (SIGINT), started again with the data kept.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs/promises';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { findFreePort } from '../../scripts/lib/ports.ts';
import { ROOT } from '../../scripts/lib/process.ts';

const scratch = await fs.mkdtemp(path.join(os.tmpdir(), 'lw-start-'));
const children: ChildProcess[] = [];
afterAll(async () => {
  for (const child of children) if (child.exitCode === null) child.kill('SIGKILL');
  await fs.rm(scratch, { recursive: true, force: true });
});

interface Started {
  readonly child: ChildProcess;
  readonly output: () => string;
  readonly exited: Promise<number | null>;
}

function launchStart(env: Record<string, string>): Started {
  let output = '';
  const child = spawn(process.execPath, ['--import', 'tsx', 'scripts/start.ts'], {
    cwd: ROOT,
    env: { ...process.env, ...env, LW_DATA_DIR: path.join(scratch, 'data') },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  children.push(child);
  child.stdout!.on('data', (chunk: Buffer) => { output += chunk.toString(); });
  child.stderr!.on('data', (chunk: Buffer) => { output += chunk.toString(); });
  const exited = new Promise<number | null>((resolve) => child.on('exit', (code) => resolve(code)));
  return { child, output: () => output, exited };
}

async function waitFor(predicate: () => boolean, what: string, timeoutS: number): Promise<void> {
  const deadline = Date.now() + timeoutS * 1000;
  while (!predicate()) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

async function pidAlive(pidFile: string): Promise<boolean> {
  try {
    process.kill(Number((await fs.readFile(pidFile, 'utf8')).trim()), 0);
    return true;
  } catch {
    return false;
  }
}

async function signIn(baseUrl: string, email: string): Promise<{ cookie: string; body: { user: { email: string; roles: string[] } } }> {
  const response = await fetch(`${baseUrl}/api/session`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-requested-with': 'loopwright' },
    body: JSON.stringify({ email, password: 'loopwright-demo' }),
  });
  expect(response.status).toBe(200);
  return { cookie: response.headers.get('set-cookie')?.split(';')[0] ?? '', body: (await response.json()) as never };
}

describe('npm start', () => {
  it('serves app and API with the demo data, stops everything on Ctrl-C and keeps the data for the next start', async () => {
    const env = { PORT: String(await findFreePort()), LW_DB_PORT: String(await findFreePort()) };
    const baseUrl = `http://127.0.0.1:${env.PORT}`;

    const first = launchStart(env);
    await waitFor(() => first.output().includes('Loopwright is running at') || first.child.exitCode !== null, 'the first start', 200);
    expect(first.output()).toContain(`Loopwright is running at ${baseUrl}`);
    for (const role of ['designer', 'reviewer', 'firmware', 'admin']) expect(first.output()).toContain(`${role}@example.test`);

    const health = (await (await fetch(`${baseUrl}/api/health`)).json()) as { database: string };
    expect(health.database).toBe('up');
    const page = await fetch(`${baseUrl}/`);
    expect(await page.text()).toMatch(/<div id="app">/);
    const { body } = await signIn(baseUrl, 'designer@example.test');
    expect(body.user.roles).toContain('designer');

    first.child.kill('SIGINT');
    expect(await first.exited).not.toBeNull();
    const pidFile = path.join(scratch, 'data', 'mariadb', 'mariadbd.pid');
    await waitFor(() => true, 'nothing', 1);
    expect(await pidAlive(pidFile)).toBe(false);
    await expect(fetch(`${baseUrl}/api/health`)).rejects.toThrow();

    // The second start in the README's scale-out setting: two API processes behind nginx, same data.
    const second = launchStart({ ...env, LW_API_PROCESSES: '2', LW_BALANCER: 'nginx' });
    await waitFor(() => second.output().includes('Loopwright is running at') || second.child.exitCode !== null, 'the second start', 200);
    expect(second.output()).toContain(`Loopwright is running at ${baseUrl} (2 API process(es) behind nginx)`);
    expect(second.output()).toMatch(/demo seed skipped/);
    const again = await signIn(baseUrl, 'admin@example.test');
    expect(again.body.user.roles).toContain('admin');
    const served = new Set<string | null>();
    for (let i = 0; i < 4; i += 1) served.add((await fetch(`${baseUrl}/api/health`)).headers.get('x-loopwright-process'));
    expect([...served].sort()).toEqual(['api-1', 'api-2']);
    expect(await fs.readFile(path.join(scratch, 'data', 'balancer', 'nginx.conf'), 'utf8')).toContain(`listen 127.0.0.1:${env.PORT};`);
    second.child.kill('SIGINT');
    await second.exited;
    await expect(fetch(`${baseUrl}/api/health`)).rejects.toThrow();
  });

  it('says in one line that the HTTP port is taken, and starts nothing', async () => {
    const blocker = net.createServer();
    await new Promise<void>((resolve) => blocker.listen(0, '127.0.0.1', resolve));
    const port = (blocker.address() as net.AddressInfo).port;
    try {
      const run = launchStart({ PORT: String(port) });
      expect(await run.exited).toBe(1);
      expect(run.output().trim()).toBe(`loopwright: error: port ${port} on 127.0.0.1 is taken by another program; set PORT to a free port`);
    } finally {
      blocker.close();
    }
  });

  it('refuses a PORT that is not a port number, naming the variable', async () => {
    const run = launchStart({ PORT: 'eighty' });
    expect(await run.exited).toBe(1);
    expect(run.output()).toContain('PORT=eighty is not a TCP port');
  });
});
