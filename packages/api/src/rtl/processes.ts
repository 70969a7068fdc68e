/**
 * Child processes of the RTL checks (simulators, yosys): run with a timeout, never through a shell,
 * output kept bounded. A program that is not installed is reported as missing, not as a failure.
 */
import { spawn } from 'node:child_process';

export interface ProcessResult {
  /** Exit code; null when the program is missing or was killed. */
  readonly code: number | null;
  readonly stdout: string;
  readonly stderr: string;
  readonly missing: boolean;
  readonly timedOut: boolean;
  readonly durationMs: number;
}

export interface RunOptions {
  readonly cwd: string;
  readonly timeoutMs: number;
  /** Environment of the child (default: this process's). */
  readonly env?: NodeJS.ProcessEnv;
}

/** Output beyond this is dropped from the middle: the verdict line is among the last ones. */
const MAX_OUTPUT_CHARS = 256 * 1024;

function keep(text: string, more: string): string {
  const s = text + more;
  return s.length <= MAX_OUTPUT_CHARS ? s : s.slice(0, MAX_OUTPUT_CHARS / 4) + '\n…\n' + s.slice(s.length - (3 * MAX_OUTPUT_CHARS) / 4);
}

/** Children still running; killed when this process exits, so no simulator or yosys outlives the server. */
const live = new Set<ReturnType<typeof spawn>>();
process.once('exit', () => {
  for (const child of live) child.kill('SIGKILL');
});

export function runProcess(command: string, args: readonly string[], options: RunOptions): Promise<ProcessResult> {
  const started = performance.now();
  return new Promise((resolve) => {
    let stdout = '';
    let stderr = '';
    let timedOut = false;
    let settled = false;
    const child = spawn(command, args, { cwd: options.cwd, env: options.env ?? process.env, stdio: ['ignore', 'pipe', 'pipe'] });
    live.add(child);
    const timer = setTimeout(() => {
      timedOut = true;
      child.kill('SIGKILL');
    }, options.timeoutMs);
    const finish = (code: number | null, missing: boolean) => {
      if (settled) return;
      settled = true;
      live.delete(child);
      clearTimeout(timer);
      resolve({ code, stdout, stderr, missing, timedOut, durationMs: Math.round(performance.now() - started) });
    };
    child.stdout.setEncoding('utf8').on('data', (d: string) => (stdout = keep(stdout, d)));
    child.stderr.setEncoding('utf8').on('data', (d: string) => (stderr = keep(stderr, d)));
    child.on('error', (err: NodeJS.ErrnoException) => finish(null, err.code === 'ENOENT'));
    child.on('close', (code) => finish(timedOut ? null : code, false));
  });
}

/** The first line a program prints for its version flag, or null when it is not installed. */
export async function toolVersion(command: string, flag: string, env?: NodeJS.ProcessEnv): Promise<string | null> {
  const r = await runProcess(command, [flag], { cwd: process.cwd(), timeoutMs: 10_000, ...(env ? { env } : {}) });
  if (r.missing || r.code !== 0) return null;
  return `${r.stdout}${r.stderr}`.trim().split('\n')[0]?.trim() || null;
}
