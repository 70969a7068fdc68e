import { spawn } from 'node:child_process';
import fs from 'node:fs/promises';
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
      // A zombie (state Z, waiting for a reaper that a container's PID 1 may never be) has stopped too.
      const running = async (pid: number) => {
        const stat = await fs.readFile(`/proc/${pid}/stat`, 'utf8').catch(() => '');
        return stat !== '' && stat.slice(stat.lastIndexOf(')') + 2)[0] !== 'Z';
      };
      const alive = () => Promise.all(workers.map(running));
      let stillThere = await alive();
      for (let waitedMs = 0; stillThere.some(Boolean) && waitedMs < 5000; waitedMs += 100) {
        await new Promise((resolve) => setTimeout(resolve, 100));
        stillThere = await alive();
      }
      expect(stillThere).toEqual(workers.map(() => false));
    } finally {
      if (server.exitCode === null) server.kill('SIGKILL');
    }
  });
});
