/**
 * `loopwright design SPEC.json` | `simulate SPEC.json SCENARIO.json [--vectors N]` | `render SPEC.json OUTDIR`.
 * stdout carries only the JSON or CSV; errors are one line on stderr. Exit codes: 0 ok, 2 bad input
 * or usage, 1 an internal failure.
 */
import { pathToFileURL } from 'node:url';
import { parseArgs } from 'node:util';
import { designCommand, renderCommand, simulateCommand } from './commands.ts';
import { UsageError } from './input.ts';

const USAGE = 'usage: loopwright design SPEC.json | simulate SPEC.json SCENARIO.json [--vectors N] | render SPEC.json OUTDIR';

export function runCli(argv: readonly string[]): string {
  let parsed;
  try {
    parsed = parseArgs({ args: [...argv], allowPositionals: true, strict: true, options: { vectors: { type: 'string' } } });
  } catch (err) {
    throw new UsageError(`${(err as Error).message.split('\n')[0]}; ${USAGE}`);
  }
  const [command, ...rest] = parsed.positionals;
  const arity = (n: number) => {
    if (rest.length !== n) throw new UsageError(`${command} takes ${n} argument${n > 1 ? 's' : ''}, got ${rest.length}; ${USAGE}`);
  };
  if (command !== 'simulate' && parsed.values.vectors !== undefined) throw new UsageError(`--vectors belongs to simulate; ${USAGE}`);
  switch (command) {
    case 'design':
      arity(1);
      return designCommand(rest[0]!);
    case 'simulate':
      arity(2);
      return simulateCommand(rest[0]!, rest[1]!, vectorCount(parsed.values.vectors));
    case 'render':
      arity(2);
      return renderCommand(rest[0]!, rest[1]!);
    default:
      throw new UsageError(`${command === undefined ? 'no command given' : `unknown command "${command}"`}; ${USAGE}`);
  }
}

function vectorCount(text: string | undefined): number | undefined {
  if (text === undefined) return undefined;
  const n = Number(text);
  if (!/^[0-9]+$/.test(text) || !Number.isSafeInteger(n) || n < 1 || n > 10_000_000) {
    throw new UsageError(`--vectors: must be a whole number from 1 to 10000000, got "${text}"`);
  }
  return n;
}

function main(): void {
  try {
    process.stdout.write(runCli(process.argv.slice(2)));
  } catch (err) {
    if (err instanceof UsageError) {
      process.stderr.write(`loopwright: ${err.message}\n`);
      process.exitCode = 2;
      return;
    }
    process.stderr.write(`loopwright: internal error: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}\n`);
    process.exitCode = 1;
  }
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) main();
