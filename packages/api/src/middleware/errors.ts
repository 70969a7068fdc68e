import type { ErrorRequestHandler, RequestHandler } from 'express';
import type { ErrorBody, ErrorCode } from '@loopwright/contract';
import { AppError } from '../errors.ts';
import { StoredFileError } from '../storage/fileStore.ts';

/** mysql2 / Node network codes meaning "the database is not reachable right now". */
const DB_DOWN_CODES = new Set([
  'ECONNREFUSED',
  'ECONNRESET',
  'ETIMEDOUT',
  'EPIPE',
  'EHOSTUNREACH',
  'PROTOCOL_CONNECTION_LOST',
  'PROTOCOL_SEQUENCE_TIMEOUT',
  'ER_CON_COUNT_ERROR',
  'ER_SERVER_SHUTDOWN',
  'ER_CONNECTION_KILLED',
  'PROTOCOL_ENQUEUE_AFTER_FATAL_ERROR',
  'POOL_ENQUEUELIMIT',
  'POOL_CLOSED',
]);
const DB_DOWN_MESSAGES = /Can't add new command when connection is in closed state|Connection lost|Pool is closed|connect ETIMEDOUT|Queue limit reached/i;

function errorCodeChain(err: unknown): string[] {
  const codes: string[] = [];
  let current: unknown = err;
  for (let depth = 0; current && typeof current === 'object' && depth < 5; depth += 1) {
    const candidate = current as { code?: unknown; errno?: unknown; driverError?: unknown; cause?: unknown; errors?: unknown };
    if (typeof candidate.code === 'string') codes.push(candidate.code);
    if (Array.isArray(candidate.errors)) {
      for (const inner of candidate.errors) codes.push(...errorCodeChain(inner));
    }
    current = candidate.driverError ?? candidate.cause;
  }
  return codes;
}

/** The disk under the file store (or a quota on it) is full: ENOSPC / EDQUOT from the file system. */
export function isStorageFull(err: unknown): boolean {
  return errorCodeChain(err).some((code) => code === 'ENOSPC' || code === 'EDQUOT');
}

export function isDatabaseUnavailable(err: unknown): boolean {
  if (errorCodeChain(err).some((code) => DB_DOWN_CODES.has(code))) return true;
  return err instanceof Error && DB_DOWN_MESSAGES.test(err.message);
}

function body(code: ErrorCode, message: string, field?: string, extra?: Readonly<Record<string, unknown>>): ErrorBody {
  return { error: { code, message, ...(field === undefined ? {} : { field }), ...extra } };
}

interface HttpishError {
  status?: number;
  statusCode?: number;
  type?: string;
  expose?: boolean;
  code?: string;
  field?: string;
}

/**
 * The one place where errors become HTTP. Known failures keep their meaning; anything else is a 500
 * whose details go to the log only — no stack trace or SQL leaves the server.
 */
export function errorHandler(log: (message: string, err: unknown) => void): ErrorRequestHandler {
  return (err: unknown, req, res, next) => {
    if (res.headersSent) {
      next(err);
      return;
    }
    const e = err as HttpishError;
    if (err instanceof AppError) {
      res.status(err.status).json(body(err.code, err.message, err.field, err.extra));
      return;
    }
    if (e.type === 'entity.parse.failed') {
      res.status(400).json(body('malformed_json', 'the request body is not valid JSON'));
      return;
    }
    if (e.type === 'entity.too.large' || e.code === 'LIMIT_FILE_SIZE') {
      res.status(413).json(body('payload_too_large', 'the request body is larger than this server accepts', e.field));
      return;
    }
    if (typeof e.code === 'string' && e.code.startsWith('LIMIT_')) {
      // multer: unexpected field, too many files or parts
      res.status(400).json(body('invalid_input', `upload refused (${e.code.toLowerCase().replace(/_/g, ' ')})`, e.field));
      return;
    }
    if (err instanceof URIError) {
      // The router could not percent-decode a path parameter (e.g. /api/designs/%E0%A4%A).
      res.status(400).json(body('invalid_input', 'the path holds percent-encoding that does not decode as UTF-8', 'path'));
      return;
    }
    if (e.type === 'charset.unsupported' || e.type === 'encoding.unsupported') {
      res.status(415).json(body('unsupported_media_type', 'the request body encoding is not supported'));
      return;
    }
    if (err instanceof StoredFileError) {
      // Never send bytes that fail their check; say so plainly (the hash, no path) and log it.
      log(`stored file refused during ${req.method} ${req.originalUrl}`, err);
      res.status(500).json(body('internal', `a release file could not be served: ${err.message}`));
      return;
    }
    if (isStorageFull(err)) {
      // 507 Insufficient Storage (RFC 4918, 11.5). The file store writes whole files or none, and the
      // release rows are written only after every file is, so nothing of the request was kept.
      log(`file store full during ${req.method} ${req.originalUrl}`, err);
      res.status(507).json(body('storage_full', "the server's disk for release files is full, so nothing was stored; ask your administrator to free space, then try again"));
      return;
    }
    if (isDatabaseUnavailable(err)) {
      log(`database unavailable during ${req.method} ${req.originalUrl}`, err);
      res.status(503).set('Retry-After', '5').json(body('database_unavailable', 'the database is not reachable at the moment; try again shortly'));
      return;
    }
    const status = e.status ?? e.statusCode;
    if (typeof status === 'number' && status >= 400 && status < 500 && e.expose === true) {
      res.status(status).json(body('invalid_input', 'the request could not be read'));
      return;
    }
    log(`unexpected error during ${req.method} ${req.originalUrl}`, err);
    res.status(500).json(body('internal', 'something went wrong on the server; the error is logged'));
  };
}

export const apiNotFound: RequestHandler = (req, res) => {
  res.status(404).json(body('not_found', `no API route ${req.method} ${req.baseUrl}${req.path}`));
};
