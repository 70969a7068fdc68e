/**
 * The one HTTP client of the app: owns the base URL, JSON encoding and the error shape.
 * It never shows UI messages; it throws ApiError and the views decide how to show it.
 * Server errors are `{ "error": { "code", "message", "field"? } }` (DESIGN.md "API shape").
 * Every reply the app reads is parsed with its schema from @loopwright/contract, so a server that
 * breaks the contract fails here, naming the field, instead of somewhere in a view.
 */
import type { z } from 'zod';
import { asSentence, fieldMessage } from '../lib/messages.ts';

export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly field: string | undefined;
  /** The parsed error body (a 409 carries the current record beside the error). */
  readonly body: unknown;

  constructor(status: number, code: string, message: string, field?: string, body?: unknown) {
    super(message);
    this.name = 'ApiError';
    this.status = status;
    this.code = code;
    this.field = field;
    this.body = body;
  }
}

export type HttpMethod = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

export interface RequestOptions {
  readonly method?: HttpMethod;
  /** A plain value is sent as JSON; FormData is sent as multipart. */
  readonly body?: unknown;
  readonly query?: Readonly<Record<string, string | number | boolean | undefined>>;
  readonly signal?: AbortSignal;
}

export interface ApiClient {
  readonly baseUrl: string;
  /** Call the API and parse its reply with the contract's schema for it. */
  request<S extends z.ZodType>(path: string, response: S, options?: RequestOptions): Promise<z.output<S>>;
  /** Call the API for its effect only; the reply's body is not read. */
  send(path: string, options?: RequestOptions): Promise<void>;
  url(path: string, query?: RequestOptions['query']): string;
  /**
   * Be told of every 401 (a session that expired or was ended by an admin). The client only reports
   * it; the app decides what to do (the router sends the person to sign-in). Returns an unsubscribe.
   */
  onUnauthenticated(listener: (path: string) => void): () => void;
}

type FetchFn = (input: string, init: RequestInit) => Promise<Response>;

export function createApiClient(baseUrl = '/api', fetchFn: FetchFn = (i, o) => fetch(i, o)): ApiClient {
  const url = (path: string, query?: RequestOptions['query']): string => buildUrl(baseUrl, path, query);
  const listeners = new Set<(path: string) => void>();
  async function call(path: string, options: RequestOptions): Promise<{ status: number; body: unknown }> {
    let response: Response;
    try {
      response = await fetchFn(url(path, options.query), buildInit(options));
    } catch (cause) {
      if (isAbort(cause)) throw cause;
      throw new ApiError(0, 'network', 'The server could not be reached. Check the connection and try again.');
    }
    if (response.status === 401) for (const listener of listeners) listener(path);
    return { status: response.status, body: await readResponse(response) };
  }
  return {
    baseUrl,
    url,
    async request<S extends z.ZodType>(path: string, schema: S, options: RequestOptions = {}): Promise<z.output<S>> {
      const reply = await call(path, options);
      const parsed = schema.safeParse(reply.body);
      if (!parsed.success) throw contractError(reply.status, path, parsed.error);
      return parsed.data;
    },
    async send(path: string, options: RequestOptions = {}): Promise<void> {
      await call(path, options);
    },
    onUnauthenticated(listener) {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
  };
}

function buildUrl(baseUrl: string, path: string, query?: RequestOptions['query']): string {
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query ?? {})) {
    if (value !== undefined) params.set(key, String(value));
  }
  const qs = params.toString();
  return `${baseUrl}${path}${qs ? `?${qs}` : ''}`;
}

function buildInit(options: RequestOptions): RequestInit {
  // The API refuses state-changing browser requests without this header (its CSRF rule).
  const headers: Record<string, string> = { Accept: 'application/json', 'X-Requested-With': 'loopwright' };
  const init: RequestInit = { method: options.method ?? 'GET', headers, credentials: 'same-origin' };
  if (options.signal) init.signal = options.signal;
  if (options.body instanceof FormData) {
    init.body = options.body;
  } else if (options.body !== undefined) {
    headers['Content-Type'] = 'application/json';
    init.body = JSON.stringify(options.body);
  }
  return init;
}

async function readResponse(response: Response): Promise<unknown> {
  if (response.status === 204) return undefined;
  const text = await response.text();
  const body = parseJson(text);
  if (response.ok) return body;
  throw toApiError(response.status, body, text);
}

/** A successful reply that does not match the contract: the server and the app disagree. */
function contractError(status: number, path: string, error: z.ZodError): ApiError {
  const issue = error.issues[0];
  const field = issue ? issue.path.map(String).join('.') : '';
  const where = field === '' ? 'the reply' : field;
  return new ApiError(status, 'contract', `The server's reply to ${path} does not match what this app expects (${where}: ${issue?.message ?? 'invalid'}). Reload the page; if it persists, the app and the server are out of step.`, field || undefined);
}

function parseJson(text: string): unknown {
  if (text === '') return undefined;
  try {
    return JSON.parse(text) as unknown;
  } catch {
    return undefined;
  }
}

export function toApiError(status: number, body: unknown, text = ''): ApiError {
  const error = isRecord(body) && isRecord(body['error']) ? body['error'] : undefined;
  if (!error) {
    const fallback = text.trim().slice(0, 200) || `The server answered ${status}.`;
    return new ApiError(status, `http_${status}`, fallback, undefined, body);
  }
  const code = typeof error['code'] === 'string' ? error['code'] : `http_${status}`;
  const message = typeof error['message'] === 'string' ? error['message'] : `The server answered ${status}.`;
  const field = typeof error['field'] === 'string' ? error['field'] : undefined;
  return new ApiError(status, code, message, field, body);
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

function isAbort(cause: unknown): boolean {
  return cause instanceof DOMException && cause.name === 'AbortError';
}

/** The client every xxxApi module uses; tests build their own with createApiClient. */
export const api = createApiClient();

/** One sentence for a failed call, for views that show errors inline; the field is named by its label. */
export function describeError(cause: unknown): string {
  if (cause instanceof ApiError) return cause.field ? fieldMessage(cause.field, cause.message) : asSentence(cause.message);
  if (cause instanceof Error) return asSentence(cause.message);
  return 'Something went wrong.';
}
