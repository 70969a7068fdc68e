import { spawn, spawnSync } from 'node:child_process';
import fs from 'node:fs/promises';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { findFreePort } from '../../../scripts/lib/ports.ts';
import { dbEnv } from '../src/config.ts';
import { testDb } from './helpers.ts';

const API_DIR = path.resolve(import.meta.dirname, '..');

async function childrenOf(pid: number): Promise<number[]> {
  const children: number[] = [];
  for (const entry of await fs.readdir('/proc')) {
    if (!/^\d+$/.test(entry)) continue;
    const stat = await fs.readFile(`/proc/${entry}/stat`, 'utf8').catch(() => '');
    if (stat && Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]) === pid) children.push(Number(entry));
  }
  return children;
}

/** True while the process runs (a zombie, waiting for a reaper a container's PID 1 may never be, has stopped). */
async function running(pid: number): Promise<boolean> {
  const stat = await fs.readFile(`/proc/${pid}/stat`, 'utf8').catch(() => '');
  return stat !== '' && stat.slice(stat.lastIndexOf(')') + 2)[0] !== 'Z';
}

/**
 * Waits up to 15 s (a loaded CI machine schedules slowly) for every pid to stop; returns the command
 * line of each that still runs, so a failure names the process left behind.
 */
async function leftRunning(pids: readonly number[]): Promise<string[]> {
  const alive = async () => (await Promise.all(pids.map(async (pid) => ((await running(pid)) ? pid : undefined)))).filter((pid) => pid !== undefined);
  let left = await alive();
  for (let waitedMs = 0; left.length > 0 && waitedMs < 15_000; waitedMs += 100) {
    await new Promise((resolve) => setTimeout(resolve, 100));
    left = await alive();
  }
  return Promise.all(left.map(async (pid) => `${pid} ${(await fs.readFile(`/proc/${pid}/cmdline`, 'utf8').catch(() => '')).replaceAll('\0', ' ').trim()}`));
}

function startServer(env: Record<string, string>) {
  const server = spawn(process.execPath, ['--import', 'tsx', 'src/server.ts'], { cwd: API_DIR, env: { ...process.env, ...env }, stdio: ['ignore', 'pipe', 'pipe'] });
  let output = '';
  server.stdout.on('data', (chunk) => (output += String(chunk)));
  server.stderr.on('data', (chunk) => (output += String(chunk)));
  const exited = new Promise<number | null>((resolve) => server.once('exit', (code) => resolve(code)));
  return { server, exited, output: () => output };
}

/** Waits up to `timeoutMs` for the server's output to match `pattern`; true when it did. */
async function logged(output: () => string, pattern: RegExp, timeoutMs = 30_000): Promise<boolean> {
  for (let waitedMs = 0; !pattern.test(output()) && waitedMs < timeoutMs; waitedMs += 100) await new Promise((resolve) => setTimeout(resolve, 100));
  return pattern.test(output());
}

async function healthy(url: string): Promise<Response | undefined> {
  let health: Response | undefined;
  for (let attempt = 0; attempt < 300 && !health?.ok; attempt += 1) {
    health = await fetch(url).catch(() => undefined);
    if (!health?.ok) await new Promise((resolve) => setTimeout(resolve, 200));
  }
  return health;
}

describe('src/server.ts', () => {
  it('serves the API from a supervised process on 127.0.0.1:PORT and stops everything on SIGTERM', async () => {
    const db = testDb();
    const port = await findFreePort();
    const server = spawn(process.execPath, ['--import', 'tsx', 'src/server.ts'], {
      cwd: API_DIR,
      env: { ...process.env, PORT: String(port), ...dbEnv(db) },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let output = '';
    server.stdout.on('data', (chunk) => (output += String(chunk)));
    const exited = new Promise<number | null>((resolve) => server.once('exit', (code) => resolve(code)));
    try {
      let health: Response | undefined;
      for (let attempt = 0; attempt < 100 && !health?.ok; attempt += 1) {
        health = await fetch(`http://127.0.0.1:${port}/api/health`).catch(() => undefined);
        if (!health?.ok) await new Promise((resolve) => setTimeout(resolve, 200));
      }
      expect(health?.status).toBe(200);
      // Secrets are named as defaulted, never printed.
      expect(output).toMatch(/LW_SESSION_SECRET: development default in use/);
      expect(output).not.toContain('loopwright-development-session-secret');
      const workers = await childrenOf(server.pid!);
      expect(workers.length).toBeGreaterThanOrEqual(1);

      server.kill('SIGTERM');
      expect(await exited).toBe(0);
      // Children (the serving process, tsx's esbuild service) end just after the supervisor: allow them
      // a few seconds, then every one must be gone.
      expect(await leftRunning(workers)).toEqual([]);
    } finally {
      if (server.exitCode === null) server.kill('SIGKILL');
    }
  });

  it('with LW_BALANCER=nginx runs each process on a loopback port of its own behind nginx, round-robin, and stops all of it on SIGTERM', async () => {
    const dataDir = await fs.mkdtemp(path.join(os.tmpdir(), 'lw-balancer-'));
    const port = await findFreePort();
    const { server, exited, output } = startServer({ PORT: String(port), ...dbEnv(testDb()), LW_BALANCER: 'nginx', LW_API_PROCESSES: '2', LW_DATA_DIR: dataDir });
    try {
      const health = await healthy(`http://127.0.0.1:${port}/api/health`);
      expect(health?.status).toBe(200);
      // nginx (Debian's) accepts the configuration the server generated.
      const configFile = path.join(dataDir, 'balancer', 'nginx.conf');
      const check = spawnSync('/usr/sbin/nginx', ['-t', '-p', path.join(dataDir, 'balancer'), '-c', configFile, '-e', path.join(dataDir, 'balancer', 'check.log')], { encoding: 'utf8' });
      expect(check.stderr).toMatch(/syntax is ok/);
      expect(check.status).toBe(0);
      const config = await fs.readFile(configFile, 'utf8');
      const backends = [...config.matchAll(/server 127\.0\.0\.1:(\d+)/g)].map((m) => Number(m[1]));
      expect(backends).toHaveLength(2);
      expect(new Set([...backends, port]).size).toBe(3);
      expect(config).toContain(`listen 127.0.0.1:${port};`);
      // No stickiness: consecutive requests alternate between the two processes, each of which also answers on its own port.
      const names: string[] = [];
      for (let i = 0; i < 6; i += 1) names.push((await fetch(`http://127.0.0.1:${port}/api/health`)).headers.get('x-loopwright-process') ?? '');
      expect(names.slice().sort()).toEqual(['api-1', 'api-1', 'api-1', 'api-2', 'api-2', 'api-2']);
      for (let i = 1; i < names.length; i += 1) expect(names[i]).not.toBe(names[i - 1]);
      const direct = await Promise.all(backends.map(async (p) => (await fetch(`http://127.0.0.1:${p}/api/health`)).headers.get('x-loopwright-process')));
      expect(direct.sort()).toEqual(['api-1', 'api-2']);

      // nginx serves a moment before the supervisor has seen its worker and says start-up is done; the
      // stop is sent after that line (a stop during start-up is test/supervisor.test.ts's case).
      expect(await logged(output, /nginx on http:\/\/127\.0\.0\.1:\d+ → 127\.0\.0\.1:\d+, 127\.0\.0\.1:\d+/)).toBe(true);
      const children = await childrenOf(server.pid!);
      expect(children.length).toBeGreaterThanOrEqual(3);
      server.kill('SIGTERM');
      expect(await exited).toBe(0);
      expect(await leftRunning(children)).toEqual([]);
    } finally {
      if (server.exitCode === null) server.kill('SIGKILL');
      await fs.rm(dataDir, { recursive: true, force: true });
    }
  });

  it('stops with exit code 1, instead of retrying for ever, when the balancer cannot take its port', async () => {
    const dataDir = await fs.mkdtemp(path.join(os.tmpdir(), 'lw-balancer-'));
    const squatter = net.createServer();
    await new Promise<void>((resolve) => squatter.listen(0, '127.0.0.1', resolve));
    const port = (squatter.address() as net.AddressInfo).port;
    const { server, exited, output } = startServer({ PORT: String(port), ...dbEnv(testDb()), LW_BALANCER: 'nginx', LW_API_PROCESSES: '1', LW_DATA_DIR: dataDir });
    try {
      expect(await exited).toBe(1);
      expect(output()).toMatch(/nginx did not start \(attempt 3 of 3\)/);
      expect(output()).toMatch(/nginx could not be started/);
      expect(await childrenOf(server.pid!)).toEqual([]);
    } finally {
      if (server.exitCode === null) server.kill('SIGKILL');
      squatter.close();
      await fs.rm(dataDir, { recursive: true, force: true });
    }
  });
});
