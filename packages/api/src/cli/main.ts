/**
 * `loopwright design SPEC.json` | `acquire SPEC.json` | `simulate SPEC.json SCENARIO.json [--vectors N]` | `render SPEC.json OUTDIR`
 * | `verify OUTDIR [--samples N]` | `estimate SPEC.json` | `backup FILE` | `restore FILE`.
 * stdout carries only the JSON or CSV; errors are one line on stderr. Exit codes: 0 ok, 2 bad input
 * or usage, 1 an internal failure; verify: 1 when a testbench FAILs or gives no verdict, 3 when no
 * simulator is installed (nothing was verified).
 */
import { pathToFileURL } from 'node:url';
import { parseArgs } from 'node:util';
import { acquireCommand, designCommand, estimateCommand, renderCommand, simulateCommand, verifyCommand, type CommandOutput } from './commands.ts';
import { UsageError } from './input.ts';

const USAGE =
  'usage: loopwright design SPEC.json | acquire SPEC.json | simulate SPEC.json SCENARIO.json [--vectors N] | render SPEC.json OUTDIR | verify OUTDIR [--samples N] | estimate SPEC.json | backup FILE | restore FILE';

export async function runCli(argv: readonly string[]): Promise<CommandOutput> {
  let parsed;
  try {
    parsed = parseArgs({ args: [...argv], allowPositionals: true, strict: true, options: { vectors: { type: 'string' }, samples: { type: 'string' } } });
  } catch (err) {
    throw new UsageError(`${(err as Error).message.split('\n')[0]}; ${USAGE}`);
  }
  const [command, ...rest] = parsed.positionals;
  const arity = (n: number) => {
    if (rest.length !== n) throw new UsageError(`${command} takes ${n} argument${n > 1 ? 's' : ''}, got ${rest.length}; ${USAGE}`);
  };
  if (command !== 'simulate' && parsed.values.vectors !== undefined) throw new UsageError(`--vectors belongs to simulate; ${USAGE}`);
  if (command !== 'verify' && parsed.values.samples !== undefined) throw new UsageError(`--samples belongs to verify; ${USAGE}`);
  const ok = (stdout: string): CommandOutput => ({ stdout, exitCode: 0 });
  switch (command) {
    case 'design':
      arity(1);
      return ok(designCommand(rest[0]!));
    case 'acquire':
      arity(1);
      return ok(acquireCommand(rest[0]!));
    case 'simulate':
      arity(2);
      return ok(simulateCommand(rest[0]!, rest[1]!, vectorCount(parsed.values.vectors)));
    case 'render':
      arity(2);
      return ok(renderCommand(rest[0]!, rest[1]!));
    case 'verify':
      arity(1);
      return verifyCommand(rest[0]!, parsed.values.samples === undefined ? undefined : wholeNumber('--samples', parsed.values.samples));
    case 'estimate':
      arity(1);
      return estimateCommand(rest[0]!);
    // Loaded only when used: they bring in the database layer (TypeORM entities), the others need none of it.
    case 'backup':
      arity(1);
      return ok(await (await import('./backupCommands.ts')).backupCommand(rest[0]!));
    case 'restore':
      arity(1);
      return ok(await (await import('./backupCommands.ts')).restoreCommand(rest[0]!));
    default:
      throw new UsageError(`${command === undefined ? 'no command given' : `unknown command "${command}"`}; ${USAGE}`);
  }
}

function vectorCount(text: string | undefined): number | undefined {
  return text === undefined ? undefined : wholeNumber('--vectors', text);
}

function wholeNumber(flag: string, text: string): number {
  const n = Number(text);
  if (!/^[0-9]+$/.test(text) || !Number.isSafeInteger(n) || n < 1 || n > 10_000_000) {
    throw new UsageError(`${flag}: must be a whole number from 1 to 10000000, got "${text}"`);
  }
  return n;
}

/**
 * Runs the CLI as the shell sees it: stdout gets only the command's output, stderr at most one line,
 * and the exit code is 0 (ok), 2 (bad input or usage), 1 (an internal failure) or the command's own —
 * never a stack trace.
 */
export async function cliMain(argv: readonly string[], stdout: (text: string) => void, stderr: (text: string) => void): Promise<number> {
  try {
    const out = await runCli(argv);
    stdout(out.stdout);
    return out.exitCode;
  } catch (err) {
    if (err instanceof UsageError) {
      stderr(`loopwright: ${err.message}\n`);
      return 2;
    }
    // One line, like every other message: a CI log gets what failed, not the call stack.
    stderr(`loopwright: internal error: ${(err instanceof Error ? err.message : String(err)).replace(/\s*\n\s*/g, ' ')}\n`);
    return 1;
  }
}

async function main(): Promise<void> {
  process.exitCode = await cliMain(
    process.argv.slice(2),
    (text) => process.stdout.write(text),
    (text) => process.stderr.write(text),
  );
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) void main();
