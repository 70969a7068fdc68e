/**
 * `npm run -s bench -- --json`: every performance figure of the project in one JSON document.
 * Targets are reported beside the figures (met: true/false); nothing here fails a test run.
 */
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { ROOT, shutdown } from './lib/process.ts';

interface BenchEntry {
  readonly name: string;
  readonly module: string;
  readonly exportName: string;
}

const BENCHES: readonly BenchEntry[] = [
  { name: 'dsp', module: 'packages/dsp/bench/bench.ts', exportName: 'runDspBench' },
  { name: 'api', module: 'packages/api/bench/bench.ts', exportName: 'runApiBench' },
  { name: 'release', module: 'packages/api/bench/release-bench.ts', exportName: 'runReleaseBench' },
  { name: 'app', module: 'packages/app/bench/bench.ts', exportName: 'runAppBench' },
];

async function runOne(entry: BenchEntry): Promise<unknown> {
  try {
    const mod = (await import(pathToFileURL(path.join(ROOT, entry.module)).href)) as Record<string, unknown>;
    const fn = mod[entry.exportName];
    if (typeof fn !== 'function') return { error: `${entry.module} does not export ${entry.exportName}` };
    return await (fn as () => Promise<unknown>)();
  } catch (err) {
    return { error: (err as Error).message };
  }
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
