import type { ErrorCode } from '@loopwright/contract';

/**
 * A domain error with a machine-readable code. Services throw these; one middleware
 * (middleware/errors.ts) turns them into HTTP. Messages are for people and never carry SQL or stacks.
 */
export class AppError extends Error {
  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly status: number,
    readonly field?: string,
    /** Extra members of the error body, e.g. the current design on a stale revision. */
    readonly extra?: Readonly<Record<string, unknown>>,
  ) {
    super(message);
    this.name = 'AppError';
  }
}

export const invalidInput = (field: string, message: string) => new AppError('invalid_input', message, 400, field);

/**
 * The one way input issues become the API's error: dsp's spec and scenario issues (`{ field, message }`,
 * field a dot path inside the document) and the request schemas' (routes/table.ts) alike. 400
 * invalid_input naming the first field under `prefix` (`spec`, `file`, `scenario`, or "" for a field
 * path that is already whole), with every issue's message. The terminal says the same in its own words
 * (cli/input.ts, issuesLine).
 */
export function issuesError(issues: readonly { readonly field: string; readonly message: string }[], prefix: string): AppError {
  const field = [prefix, issues[0]?.field ?? ''].filter((part) => part !== '').join('.');
  return invalidInput(field, issues.map((issue) => issue.message).join('; '));
}
export const notFound = (what: string) => new AppError('not_found', `${what} not found`, 404);
export const conflict = (message: string, field?: string) => new AppError('conflict', message, 409, field);
export const forbidden = (message = 'your roles do not allow this') => new AppError('forbidden', message, 403);
export const unauthenticated = (message = 'sign in first') => new AppError('unauthenticated', message, 401);
export const staleRevision = (current: unknown, baseRevision: number, currentRevision: number) =>
  new AppError(
    'stale_revision',
    `the design changed since revision ${baseRevision}; it is now at revision ${currentRevision}`,
    409,
    'baseRevision',
    { current },
  );
