import { describe, expect, it } from 'vitest';
import { ApiError, createApiClient } from '../src/api/client.ts';

function fakeFetch(status: number, body: string, seen: { url?: string; init?: RequestInit } = {}) {
  return async (url: string, init: RequestInit): Promise<Response> => {
    seen.url = url;
    seen.init = init;
    return new Response(status === 204 ? null : body, { status, headers: { 'Content-Type': 'application/json' } });
  };
}

describe('api client', () => {
  it('sends JSON to base URL + path with the query string and parses the reply', async () => {
    const seen: { url?: string; init?: RequestInit } = {};
    const client = createApiClient('/api', fakeFetch(200, '{"ok":true}', seen));
    const reply = await client.request<{ ok: boolean }>('/designs/3', { method: 'PUT', body: { a: 1 }, query: { x: 'y z', skip: undefined } });
    expect(reply).toEqual({ ok: true });
    expect(seen.url).toBe('/api/designs/3?x=y+z');
    expect(seen.init?.method).toBe('PUT');
    expect(seen.init?.body).toBe('{"a":1}');
    expect((seen.init?.headers as Record<string, string>)['Content-Type']).toBe('application/json');
  });

  it('turns the documented error body into an ApiError with code, message and field', async () => {
    const body = '{"error":{"code":"validation","message":"must be positive","field":"clockHz"}}';
    const client = createApiClient('/api', fakeFetch(422, body));
    const error = await client.request('/x').catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ApiError);
    expect(error).toMatchObject({ status: 422, code: 'validation', message: 'must be positive', field: 'clockHz' });
  });

  it('keeps the status of a 409 apart from other errors and exposes the body', async () => {
    const body = '{"error":{"code":"conflict","message":"revision moved"},"design":{"revision":5}}';
    const client = createApiClient('/api', fakeFetch(409, body));
    const error = (await client.request('/x').catch((e: unknown) => e)) as ApiError;
    expect(error.status).toBe(409);
    expect(error.field).toBeUndefined();
    expect((error.body as { design: { revision: number } }).design.revision).toBe(5);
  });

  it('gives a non-JSON failure a generic code naming the status', async () => {
    const client = createApiClient('/api', fakeFetch(502, 'Bad gateway'));
    const error = (await client.request('/x').catch((e: unknown) => e)) as ApiError;
    expect(error.code).toBe('http_502');
    expect(error.message).toBe('Bad gateway');
  });

  it('reports an unreachable server as a network error', async () => {
    const client = createApiClient('/api', async () => {
      throw new TypeError('fetch failed');
    });
    const error = (await client.request('/x').catch((e: unknown) => e)) as ApiError;
    expect(error.code).toBe('network');
    expect(error.status).toBe(0);
  });

  it('returns undefined for 204 No Content', async () => {
    const client = createApiClient('/api', fakeFetch(204, ''));
    expect(await client.request('/session', { method: 'DELETE' })).toBeUndefined();
  });
});

describe('api client: ended sessions', () => {
  it('tells its listeners of a 401 and still throws the error to the caller', async () => {
    const client = createApiClient('/api', async () => new Response('{"error":{"code":"unauthenticated","message":"sign in"}}', { status: 401 }));
    const heard: string[] = [];
    const stop = client.onUnauthenticated((path) => heard.push(path));
    await expect(client.request('/designs/1')).rejects.toMatchObject({ status: 401, code: 'unauthenticated' });
    stop();
    await expect(client.request('/designs/2')).rejects.toMatchObject({ status: 401 });
    expect(heard).toEqual(['/designs/1']);
  });
});
