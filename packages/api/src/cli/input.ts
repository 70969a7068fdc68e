/**
 * Reading the CLI's JSON inputs. Every failure is a UsageError whose message is one line naming the
 * file or the field, so `main` can print it to stderr and exit 2.
 */
import { readFileSync } from 'node:fs';
import { isAbsolute, resolve } from 'node:path';

export class UsageError extends Error {
  override readonly name = 'UsageError';
}

/** npm run sets INIT_CWD to where the user typed the command; the script itself runs at the root. */
export function resolveUserPath(path: string, env: NodeJS.ProcessEnv = process.env): string {
  return isAbsolute(path) ? path : resolve(env.INIT_CWD || process.cwd(), path);
}

export function readJsonFile(label: string, path: string): unknown {
  const full = resolveUserPath(path);
  let text: string;
  try {
    text = readFileSync(full, 'utf8');
  } catch (err) {
    throw new UsageError(`${label}: cannot read ${full} (${(err as NodeJS.ErrnoException).code ?? String(err)})`);
  }
  try {
    // A byte-order mark is not part of the JSON (RFC 8259 §8.1 lets a parser ignore it); editors add one.
    return JSON.parse(text.replace(/^\uFEFF/, '')) as unknown;
  } catch (err) {
    throw new UsageError(`${label}: ${full} is not valid JSON (${(err as Error).message})`);
  }
}

/** One line naming the first offending field, the others counted. */
export function issuesLine(label: string, issues: readonly { field: string; message: string }[]): string {
  const first = issues[0];
  if (!first) return `${label}: invalid`;
  const more = issues.length > 1 ? ` (and ${issues.length - 1} more issue${issues.length > 2 ? 's' : ''})` : '';
  const text = first.message.startsWith(first.field) || first.field === '' ? first.message : `${first.field}: ${first.message}`;
  return `${label} field ${first.field || '(document)'}: ${text.replace(/\s*\n\s*/g, ' ')}${more}`;
}
