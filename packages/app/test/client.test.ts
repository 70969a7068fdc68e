import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { projectRecordSchema } from '@loopwright/contract';
import { ApiError, createApiClient } from '../src/api/client.ts';

const anything = z.unknown();

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
    const reply = await client.request('/designs/3', z.object({ ok: z.boolean() }), { method: 'PUT', body: { a: 1 }, query: { x: 'y z', skip: undefined } });
    expect(reply).toEqual({ ok: true });
    expect(seen.url).toBe('/api/designs/3?x=y+z');
    expect(seen.init?.method).toBe('PUT');
    expect(seen.init?.body).toBe('{"a":1}');
    expect((seen.init?.headers as Record<string, string>)['Content-Type']).toBe('application/json');
  });

  it('turns the documented error body into an ApiError with code, message and field', async () => {
    const body = '{"error":{"code":"validation","message":"must be positive","field":"clockHz"}}';
    const client = createApiClient('/api', fakeFetch(422, body));
    const error = await client.request('/x', anything).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ApiError);
    expect(error).toMatchObject({ status: 422, code: 'validation', message: 'must be positive', field: 'clockHz' });
  });

  it('keeps the status of a 409 apart from other errors and exposes the body', async () => {
    const body = '{"error":{"code":"conflict","message":"revision moved"},"design":{"revision":5}}';
    const client = createApiClient('/api', fakeFetch(409, body));
    const error = (await client.request('/x', anything).catch((e: unknown) => e)) as ApiError;
    expect(error.status).toBe(409);
    expect(error.field).toBeUndefined();
    expect((error.body as { design: { revision: number } }).design.revision).toBe(5);
  });

  it('gives a non-JSON failure a generic code naming the status', async () => {
    const client = createApiClient('/api', fakeFetch(502, 'Bad gateway'));
    const error = (await client.request('/x', anything).catch((e: unknown) => e)) as ApiError;
    expect(error.code).toBe('http_502');
    expect(error.message).toBe('Bad gateway');
  });

  it('reports an unreachable server as a network error', async () => {
    const client = createApiClient('/api', async () => {
      throw new TypeError('fetch failed');
    });
    const error = (await client.request('/x', anything).catch((e: unknown) => e)) as ApiError;
    expect(error.code).toBe('network');
    expect(error.status).toBe(0);
  });

  it('sends a call for its effect alone and accepts 204 No Content', async () => {
    const seen: { url?: string; init?: RequestInit } = {};
    const client = createApiClient('/api', fakeFetch(204, '', seen));
    await expect(client.send('/session', { method: 'DELETE' })).resolves.toBeUndefined();
    expect(seen.init?.method).toBe('DELETE');
  });

  it('parses a reply with its contract schema, so the types the views get are the ones checked', async () => {
    const project = { id: 4, name: 'Mains sync', description: '', archived: false, designCount: 2, createdAt: '2026-01-01T00:00:00.000Z', updatedAt: '2026-01-01T00:00:00.000Z', extra: 1 };
    const client = createApiClient('/api', fakeFetch(200, JSON.stringify(project)));
    const reply = await client.request('/projects/4', projectRecordSchema);
    expect(reply).toEqual({ ...project, extra: undefined });
    expect('extra' in reply).toBe(false);
  });

  it('refuses a reply that breaks the contract with an ApiError naming the field', async () => {
    const drifted = { id: 4, name: 'Mains sync', description: '', archived: 'no', designCount: 2, createdAt: 'x', updatedAt: 'x' };
    const client = createApiClient('/api', fakeFetch(200, JSON.stringify(drifted)));
    const error = (await client.request('/projects/4', projectRecordSchema).catch((e: unknown) => e)) as ApiError;
    expect(error).toBeInstanceOf(ApiError);
    expect(error).toMatchObject({ status: 200, code: 'contract', field: 'archived' });
    expect(error.message).toContain('/projects/4');
  });
});

describe('api client: ended sessions', () => {
  it('tells its listeners of a 401 and still throws the error to the caller', async () => {
    const client = createApiClient('/api', async () => new Response('{"error":{"code":"unauthenticated","message":"sign in"}}', { status: 401 }));
    const heard: string[] = [];
    const stop = client.onUnauthenticated((path) => heard.push(path));
    await expect(client.request('/designs/1', anything)).rejects.toMatchObject({ status: 401, code: 'unauthenticated' });
    stop();
    await expect(client.request('/designs/2', anything)).rejects.toMatchObject({ status: 401 });
    expect(heard).toEqual(['/designs/1']);
  });
});
