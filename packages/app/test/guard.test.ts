import { describe, expect, it } from 'vitest';
import type { RouteLocationNormalized } from 'vue-router';
import { roleGuard, signInGuard, type GuardSession } from '../src/router/guard.ts';
import type { Role } from '../src/api/types.ts';

function to(name: string, meta: RouteLocationNormalized['meta'], fullPath = `/${name}`): RouteLocationNormalized {
  return { name, meta, fullPath, path: fullPath, params: {}, query: {}, hash: '', matched: [], redirectedFrom: undefined };
}

function session(roles: readonly Role[] | null): GuardSession & { loads: number } {
  const s = { loads: 0, signedIn: roles !== null, roles: roles ?? [], ensureLoaded: async () => void s.loads++ };
  return s;
}

describe('role guard', () => {
  it('lets anyone open a public route without asking the server', async () => {
    const s = session(null);
    expect(await roleGuard(to('review', { public: true }), s)).toBe(true);
    expect(s.loads).toBe(0);
  });

  it('loads the session for the not-found page, which keeps the rail of whoever is signed in', async () => {
    const s = session(['designer']);
    expect(await roleGuard(to('not-found', { public: true }, '/no-such-screen'), s)).toBe(true);
    expect(s.loads).toBe(1);
  });

  it('sends a signed-out visitor to sign-in and remembers where they were going', async () => {
    const result = await roleGuard(to('admin', { roles: ['admin'] }, '/admin?x=1'), session(null));
    expect(result).toEqual({ name: 'sign-in', query: { redirect: '/admin?x=1' } });
  });

  it('opens a route to a user holding any one of its roles', async () => {
    expect(await roleGuard(to('conformance', { roles: ['firmware', 'designer'] }), session(['designer']))).toBe(true);
  });

  it('turns away a user without the role to their own home screen', async () => {
    const result = await roleGuard(to('admin', { roles: ['admin'] }), session(['firmware']));
    expect(result).toEqual({ name: 'downloads', query: { denied: 'admin' } });
  });

  it('sends a signed-in user away from the sign-in page to their home', async () => {
    expect(await signInGuard(to('sign-in', { public: true }), session(['admin']))).toEqual({ name: 'admin' });
    expect(await signInGuard(to('sign-in', { public: true }), session(null))).toBe(true);
  });
});
