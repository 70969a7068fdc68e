/**
 * `npm test`: type-checks every package, checks that every declared dependency is used and every used
 * one declared (lib/dependency-check.ts), starts a MariaDB of its own (a fresh data directory, never
 * the one of `npm start`), runs every Vitest suite in turn, stops what it started, and ends with one
 * plain `N passed, N failed` line that adds up every suite (Vitest's own summary is not such a line).
 */
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import fs from 'node:fs/promises';
import path from 'node:path';
import { dbEnv } from '../packages/api/src/config.ts';
import { DEPENDENCY_CHECK_COMMAND } from './lib/dependency-check.ts';
import { startMariaDb, type MariaDbInstance } from './lib/mariadb.ts';
import { ROOT, onShutdown } from './lib/process.ts';
import { StartupError } from './lib/startup-error.ts';

interface Tally {
  passed: number;
  failed: number;
  skipped: number;
}

interface CheckSuite {
  readonly name: string;
  readonly kind: 'check';
  readonly cwd: string;
  readonly command: readonly string[];
}

interface VitestSuite {
  readonly name: string;
  readonly kind: 'vitest';
  readonly cwd: string;
  readonly config: string;
}

type Suite = CheckSuite | VitestSuite;

const SUITES: readonly Suite[] = [
  { name: 'types: dsp', kind: 'check', cwd: 'packages/dsp', command: ['pnpm', 'exec', 'tsc', '-p', '.'] },
  { name: 'types: contract', kind: 'check', cwd: 'packages/contract', command: ['pnpm', 'exec', 'tsc', '-p', '.'] },
  { name: 'types: api', kind: 'check', cwd: 'packages/api', command: ['pnpm', 'exec', 'tsc', '-p', '.'] },
  { name: 'types: app', kind: 'check', cwd: 'packages/app', command: ['pnpm', 'exec', 'vue-tsc', '--noEmit', '-p', 'tsconfig.json'] },
  { name: 'types: scripts', kind: 'check', cwd: '.', command: ['pnpm', 'exec', 'tsc', '-p', 'scripts'] },
  { name: 'types: tests', kind: 'check', cwd: '.', command: ['pnpm', 'exec', 'tsc', '-p', 'tests'] },
  { name: 'dependencies', kind: 'check', cwd: '.', command: DEPENDENCY_CHECK_COMMAND },
  { name: 'dsp', kind: 'vitest', cwd: 'packages/dsp', config: 'vitest.config.ts' },
  { name: 'contract', kind: 'vitest', cwd: 'packages/contract', config: 'vitest.config.ts' },
  { name: 'api', kind: 'vitest', cwd: 'packages/api', config: 'vitest.config.ts' },
  { name: 'app', kind: 'vitest', cwd: 'packages/app', config: 'vitest.config.ts' },
  { name: 'foundation', kind: 'vitest', cwd: '.', config: 'tests/vitest.config.ts' },
  { name: 'e2e', kind: 'vitest', cwd: '.', config: 'tests/e2e/vitest.config.ts' },
  { name: 'faults', kind: 'vitest', cwd: '.', config: 'tests/faults/vitest.config.ts' },
];

function runCommand(cwd: string, command: readonly string[], env: NodeJS.ProcessEnv): Promise<number> {
  return new Promise((resolve) => {
    const [cmd, ...args] = command;
    const child = spawn(cmd ?? 'false', args, { cwd: path.join(ROOT, cwd), stdio: 'inherit', env });
    child.on('exit', (code) => resolve(code ?? 1));
    child.on('error', () => resolve(127));
  });
}

interface VitestJson {
  numPassedTests: number;
  numFailedTests: number;
  numPendingTests: number;
  numTodoTests: number;
  testResults: { status: string; assertionResults: unknown[]; message?: string; name: string }[];
}

/** Counts from Vitest's JSON report; a file that failed to load counts as one failure. */
async function vitestTally(reportFile: string, exitCode: number): Promise<Tally> {
  let report: VitestJson;
  try {
    report = JSON.parse(await fs.readFile(reportFile, 'utf8')) as VitestJson;
  } catch {
    return { passed: 0, failed: 1, skipped: 0 };
  }
  const brokenFiles = report.testResults.filter((r) => r.status === 'failed' && r.assertionResults.length === 0).length;
  const tally = {
    passed: report.numPassedTests,
    failed: report.numFailedTests + brokenFiles,
    skipped: report.numPendingTests + report.numTodoTests,
  };
  // A non-zero exit with nothing counted as failed (e.g. no test files) is still a failure.
  if (exitCode !== 0 && tally.failed === 0) tally.failed = 1;
  return tally;
}

async function runSuite(suite: Suite, env: NodeJS.ProcessEnv, reportDir: string): Promise<Tally> {
  process.stdout.write(`\n=== ${suite.name} ===\n`);
  if (suite.kind === 'check') {
    const code = await runCommand(suite.cwd, suite.command, env);
    process.stdout.write(`${suite.name}: ${code === 0 ? 'passed' : `FAILED (exit ${code})`}\n`);
    return code === 0 ? { passed: 1, failed: 0, skipped: 0 } : { passed: 0, failed: 1, skipped: 0 };
  }
  if (!existsSync(path.join(ROOT, suite.cwd, suite.config))) {
    process.stdout.write(`${suite.name}: FAILED (missing ${path.join(suite.cwd, suite.config)})\n`);
    return { passed: 0, failed: 1, skipped: 0 };
  }
  const reportFile = path.join(reportDir, `${suite.name.replace(/\W+/g, '-')}.json`);
  const code = await runCommand(
    suite.cwd,
    ['pnpm', 'exec', 'vitest', 'run', '--config', suite.config, '--reporter=default', '--reporter=json', `--outputFile.json=${reportFile}`],
    env,
  );
  const tally = await vitestTally(reportFile, code);
  process.stdout.write(`${suite.name}: ${tally.passed} passed, ${tally.failed} failed\n`);
  return tally;
}

async function main(): Promise<number> {
  const runDir = path.join(ROOT, '.data', `test-${process.pid}`);
  const reportDir = path.join(runDir, 'reports');
  await fs.mkdir(reportDir, { recursive: true });
  let db: MariaDbInstance | undefined;
  onShutdown(async () => {
    await db?.stop();
    await fs.rm(runDir, { recursive: true, force: true });
  });

  db = await startMariaDb({
    dataDir: path.join(runDir, 'mariadb'),
    database: 'loopwright_test',
    user: 'loopwright',
    password: 'test-only-password',
    fresh: true,
  });
  process.stdout.write(`test database: MariaDB on 127.0.0.1:${db.port} (data in ${path.relative(ROOT, runDir)}, removed afterwards)\n`);
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    ...dbEnv(db),
  };

  const total: Tally = { passed: 0, failed: 0, skipped: 0 };
  const only = process.argv.slice(2);
  for (const suite of SUITES) {
    if (only.length > 0 && !only.some((o) => suite.name.includes(o))) continue;
    const tally = await runSuite(suite, env, reportDir);
    total.passed += tally.passed;
    total.failed += tally.failed;
    total.skipped += tally.skipped;
  }
  process.stdout.write('\n');
  process.stdout.write(`${total.passed} passed, ${total.failed} failed${total.skipped ? `, ${total.skipped} skipped` : ''}\n`);
  return total.failed === 0 && total.passed > 0 ? 0 : 1;
}

main()
  .then(async (code) => {
    await (await import('./lib/process.ts')).shutdown();
    process.exit(code);
  })
  .catch(async (err: unknown) => {
    process.stderr.write(`loopwright: error: ${err instanceof StartupError ? err.message : String((err as Error).stack ?? err)}\n`);
    await (await import('./lib/process.ts')).shutdown();
    process.stdout.write('0 passed, 1 failed\n');
    process.exit(1);
  });
