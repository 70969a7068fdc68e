/**
 * The API over plain HTTP, for checks a browser cannot pin down: which serving process answered (the
 * X-Loopwright-Process header), and requests sent at the same moment.
 */
export const PROCESS_HEADER = 'x-loopwright-process';
const CSRF = { 'x-requested-with': 'loopwright' };

export interface ApiAnswer<T = unknown> {
  readonly status: number;
  readonly body: T;
  /** The serving process that answered (api-1, api-2, …). */
  readonly process: string | null;
  readonly headers: Headers;
  readonly bytes: Buffer;
}

export interface ApiCall {
  readonly method?: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  readonly cookie?: string;
  readonly json?: unknown;
  readonly form?: FormData;
  readonly signal?: AbortSignal;
}

export async function api<T = unknown>(baseUrl: string, path: string, call: ApiCall = {}): Promise<ApiAnswer<T>> {
  const headers: Record<string, string> = { ...CSRF };
  if (call.cookie) headers.cookie = call.cookie;
  if (call.json !== undefined) headers['content-type'] = 'application/json';
  const response = await fetch(`${baseUrl}${path}`, {
    method: call.method ?? (call.json !== undefined || call.form ? 'POST' : 'GET'),
    headers,
    body: call.json !== undefined ? JSON.stringify(call.json) : call.form,
    signal: call.signal,
  });
  const bytes = Buffer.from(await response.arrayBuffer());
  const isJson = (response.headers.get('content-type') ?? '').includes('application/json');
  return { status: response.status, body: (isJson ? JSON.parse(bytes.toString('utf8')) : null) as T, process: response.headers.get(PROCESS_HEADER), headers: response.headers, bytes };
}

/** Signs in through the API; returns the session cookie and the process that made the session. */
export async function apiSignIn(baseUrl: string, email: string, password = 'loopwright-demo'): Promise<{ cookie: string; process: string | null }> {
  const response = await fetch(`${baseUrl}/api/session`, { method: 'POST', headers: { ...CSRF, 'content-type': 'application/json' }, body: JSON.stringify({ email, password }) });
  if (response.status !== 200) throw new Error(`sign-in as ${email} answered ${response.status}: ${await response.text()}`);
  const cookie = response.headers.get('set-cookie')?.split(';')[0];
  if (!cookie) throw new Error(`sign-in as ${email} set no cookie`);
  return { cookie, process: response.headers.get(PROCESS_HEADER) };
}

/**
 * Sends cheap requests until the last one was answered by `process`, so that with strict round-robin
 * over two processes the next request goes to the other one. Throws if `process` never answers.
 */
export async function afterProcess(baseUrl: string, process: string, tries = 10): Promise<void> {
  for (let i = 0; i < tries; i += 1) {
    if ((await api(baseUrl, '/api/health')).process === process) return;
  }
  throw new Error(`${process} did not answer ${tries} requests in a row`);
}

/** Asks for a release's verification until the simulations gave a verdict (the server runs them in the background). */
export async function waitForVerdict(baseUrl: string, cookie: string, releaseId: number, timeoutMs = 180_000): Promise<{ verdict: string; summary: string }> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const v = await api<{ verdict: string | null; summary: string }>(baseUrl, `/api/releases/${releaseId}/verification`, { cookie });
    if (v.status !== 200) throw new Error(`verification of release ${releaseId} answered ${v.status}`);
    if (v.body.verdict !== null) return { verdict: v.body.verdict, summary: v.body.summary };
    if (Date.now() > until) throw new Error(`release ${releaseId} was not verified within ${timeoutMs} ms: ${v.body.summary}`);
    await new Promise((resolve) => setTimeout(resolve, 500));
  }
}
