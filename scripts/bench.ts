/**
 * `npm run -s bench -- --json`: every performance figure of the project in one JSON document.
 * Targets are reported beside the figures (met: true/false); nothing here fails a test run.
 */
import { spawn } from 'node:child_process';
import path from 'node:path';
import { ROOT, shutdown } from './lib/process.ts';

interface BenchEntry {
  readonly name: string;
  /** The package folder; the bench runs there, under that package's tsconfig. */
  readonly cwd: string;
  readonly module: string;
  readonly exportName: string;
  /** The tsconfig tsx compiles with, when not the package's own. */
  readonly tsconfig?: string;
}

const BENCHES: readonly BenchEntry[] = [
  { name: 'dsp', cwd: 'packages/dsp', module: 'bench/bench.ts', exportName: 'runDspBench' },
  { name: 'api', cwd: 'packages/api', module: 'bench/bench.ts', exportName: 'runApiBench' },
  { name: 'release', cwd: 'packages/api', module: 'bench/release-bench.ts', exportName: 'runReleaseBench' },
  { name: 'rtl', cwd: 'packages/api', module: 'bench/rtl-bench.ts', exportName: 'runRtlBench' },
  // The app bench serves the built app from the real API, whose TypeORM entities need the API's
  // decorator settings; the app's own files compile the same under either tsconfig.
  { name: 'app', cwd: 'packages/app', module: 'bench/bench.ts', exportName: 'runAppBench', tsconfig: 'packages/api/tsconfig.json' },
];

/** One bench in a child process; its last stdout line is its JSON result, its stderr passes through. */
function runOne(entry: BenchEntry): Promise<unknown> {
  const cwd = path.join(ROOT, entry.cwd);
  return new Promise((resolve) => {
    const child = spawn(process.execPath, ['--import', 'tsx', path.join(ROOT, 'scripts/lib/run-bench.ts'), entry.module, entry.exportName], {
      cwd,
      env: { ...process.env, TSX_TSCONFIG_PATH: entry.tsconfig ? path.join(ROOT, entry.tsconfig) : path.join(cwd, 'tsconfig.json') },
      stdio: ['ignore', 'pipe', 'inherit'],
    });
    let out = '';
    child.stdout.on('data', (chunk: Buffer) => { out += chunk.toString(); });
    child.on('exit', (code) => {
      const last = out.trim().split('\n').pop() ?? '';
      try {
        resolve(JSON.parse(last) as unknown);
      } catch {
        resolve({ error: `the ${entry.name} bench exited ${code} without a JSON result` });
      }
    });
  });
}

async function main(): Promise<void> {
  const asJson = process.argv.includes('--json');
  const only = process.argv.slice(2).filter((a) => !a.startsWith('--'));
  const results: Record<string, unknown> = {
    machine: { node: process.version, cores: (await import('node:os')).availableParallelism(), at: new Date().toISOString() },
  };
  for (const entry of BENCHES) {
    if (only.length > 0 && !only.includes(entry.name)) continue;
    if (!asJson) process.stderr.write(`bench: ${entry.name}\n`);
    results[entry.name] = await runOne(entry);
  }
  process.stdout.write(`${JSON.stringify(results, null, asJson ? 0 : 2)}\n`);
}

main()
  .catch((err: unknown) => {
    process.stderr.write(`loopwright: error: ${(err as Error).message}\n`);
    process.exitCode = 1;
  })
  .finally(() => void shutdown());
