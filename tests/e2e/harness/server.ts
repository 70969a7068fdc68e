/**
 * The real Loopwright server (packages/api/src/server.ts) as a child process, as `npm start` runs it:
 * its supervisor, its serving processes and, with LW_BALANCER=nginx, Debian's nginx in front. The
 * test reaches it only over HTTP, and can find, kill and restart its processes (fault tests).
 */
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs/promises';
import path from 'node:path';
import { ROOT } from './paths.ts';

const API_DIR = path.join(ROOT, 'packages', 'api');

export interface ServedProcess {
  /** LW_PROCESS_NAME: api-1, api-2, … (the X-Loopwright-Process header). */
  readonly name: string;
  readonly pid: number;
}

export interface ServerProcess {
  readonly baseUrl: string;
  readonly pid: number;
  /** Everything the server printed so far (stdout and stderr). */
  output(): string;
  /** The serving processes the supervisor runs now, by name. */
  processes(): Promise<ServedProcess[]>;
  /** The balancer's master process (nginx), when the server runs one. */
  balancerPid(): Promise<number | undefined>;
  /** Resolves once the supervisor runs process `name` under a pid other than `oldPid`. */
  waitForRestart(name: string, oldPid: number, timeoutMs?: number): Promise<ServedProcess>;
  /** SIGTERM and wait for the whole process group to end (SIGKILL after a grace period). */
  stop(): Promise<void>;
}

async function parentOf(pid: number): Promise<number | undefined> {
  const stat = await fs.readFile(`/proc/${pid}/stat`, 'utf8').catch(() => '');
  if (!stat || stat.slice(stat.lastIndexOf(')') + 2)[0] === 'Z') return undefined;
  return Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]);
}

async function processNameOf(pid: number): Promise<string | undefined> {
  const environ = await fs.readFile(`/proc/${pid}/environ`, 'utf8').catch(() => '');
  return environ.split('\0').find((entry) => entry.startsWith('LW_PROCESS_NAME='))?.slice('LW_PROCESS_NAME='.length);
}

/** Running processes whose parent is `pid` (proc(5): field 4 of /proc/<pid>/stat). */
export async function childrenOf(pid: number): Promise<number[]> {
  const found: number[] = [];
  for (const entry of await fs.readdir('/proc')) {
    if (/^\d+$/.test(entry) && (await parentOf(Number(entry))) === pid) found.push(Number(entry));
  }
  return found;
}

async function balancerOf(supervisorPid: number): Promise<number | undefined> {
  for (const pid of await childrenOf(supervisorPid)) {
    const cmdline = await fs.readFile(`/proc/${pid}/cmdline`, 'utf8').catch(() => '');
    if (/^(nginx: master|\S*\/nginx\0)/.test(cmdline)) return pid;
  }
  return undefined;
}

async function servedProcesses(supervisorPid: number): Promise<ServedProcess[]> {
  const found: ServedProcess[] = [];
  for (const pid of await childrenOf(supervisorPid)) {
    const name = await processNameOf(pid);
    if (name) found.push({ name, pid });
  }
  return found.sort((a, b) => a.name.localeCompare(b.name));
}

export async function waitForHealth(baseUrl: string, child: ChildProcess, timeoutMs: number, output: () => string): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`the server exited during start-up (code ${child.exitCode}):\n${output().slice(-2000)}`);
    const response = await fetch(`${baseUrl}/api/health`).catch(() => undefined);
    if (response?.ok) return;
    await new Promise((resolve) => setTimeout(resolve, 200));
  }
  throw new Error(`the server did not become healthy within ${timeoutMs / 1000} s:\n${output().slice(-2000)}`);
}

/** Starts src/server.ts with `env` (on top of this process's) and waits until it is healthy. */
export async function startServer(env: Record<string, string>, options: { expectedProcesses: number; timeoutMs?: number }): Promise<ServerProcess> {
  const port = env.PORT;
  if (!port) throw new Error('startServer needs PORT in env');
  const baseUrl = `http://127.0.0.1:${port}`;
  let output = '';
  // Its own process group, so stop() can end nginx and the serving processes even if the supervisor is gone.
  const child = spawn(process.execPath, ['--import', 'tsx', 'src/server.ts'], {
    cwd: API_DIR,
    env: { ...process.env, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
    detached: true,
  });
  child.stdout!.on('data', (chunk: Buffer) => (output += chunk.toString()));
  child.stderr!.on('data', (chunk: Buffer) => (output += chunk.toString()));
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  const pid = child.pid!;
  const stop = async () => {
    if (child.exitCode === null && child.signalCode === null) {
      child.kill('SIGTERM');
      const timer = setTimeout(() => child.kill('SIGKILL'), 15_000);
      await exited;
      clearTimeout(timer);
    }
    // Whatever is left of the group (a process the supervisor could not stop) goes too.
    try {
      process.kill(-pid, 'SIGKILL');
    } catch {
      // the group is empty
    }
  };
  try {
    await waitForHealth(baseUrl, child, options.timeoutMs ?? 180_000, () => output);
    const deadline = Date.now() + 30_000;
    while ((await servedProcesses(pid)).length < options.expectedProcesses) {
      if (Date.now() > deadline) throw new Error(`the server runs ${(await servedProcesses(pid)).length} serving processes, not ${options.expectedProcesses}`);
      await new Promise((resolve) => setTimeout(resolve, 200));
    }
  } catch (err) {
    await stop();
    throw err;
  }
  return {
    baseUrl,
    pid,
    output: () => output,
    processes: () => servedProcesses(pid),
    balancerPid: () => balancerOf(pid),
    async waitForRestart(name, oldPid, timeoutMs = 120_000) {
      const deadline = Date.now() + timeoutMs;
      for (;;) {
        const now = (await servedProcesses(pid)).find((p) => p.name === name && p.pid !== oldPid);
        if (now && output.includes(`${name} is back (pid ${now.pid})`)) return now;
        if (Date.now() > deadline) throw new Error(`${name} was not restarted within ${timeoutMs / 1000} s:\n${output.slice(-2000)}`);
        await new Promise((resolve) => setTimeout(resolve, 200));
      }
    },
    stop,
  };
}
