import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { useSessionStore } from '../src/stores/useSessionStore.ts';
import { sessionApi } from '../src/api/sessionApi.ts';
import { ApiError } from '../src/api/client.ts';

const designer = { id: 1, email: 'designer@example.test', displayName: 'Dana Designer', roles: ['designer' as const], organizationId: 1 };

describe('session store', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    vi.restoreAllMocks();
  });

  it('asks the server who is signed in only once', async () => {
    const current = vi.spyOn(sessionApi, 'current').mockResolvedValue(designer);
    const store = useSessionStore();
    await store.ensureLoaded();
    await store.ensureLoaded();
    expect(current).toHaveBeenCalledTimes(1);
    expect(store.signedIn).toBe(true);
    expect(store.hasRole('designer')).toBe(true);
    expect(store.hasRole('admin')).toBe(false);
  });

  it('keeps nobody signed in when the password is refused, and passes the error on', async () => {
    vi.spyOn(sessionApi, 'signIn').mockRejectedValue(new ApiError(401, 'bad_credentials', 'Wrong e-mail or password'));
    const store = useSessionStore();
    await expect(store.signIn({ email: 'x@example.test', password: 'nope' })).rejects.toMatchObject({ code: 'bad_credentials' });
    expect(store.signedIn).toBe(false);
    expect(store.signingIn).toBe(false);
  });

  it('forgets the user on sign-out even when the server call fails', async () => {
    vi.spyOn(sessionApi, 'signIn').mockResolvedValue(designer);
    vi.spyOn(sessionApi, 'signOut').mockRejectedValue(new ApiError(0, 'network', 'down'));
    const store = useSessionStore();
    await store.signIn({ email: designer.email, password: 'loopwright-demo' });
    await store.signOut().catch(() => undefined);
    expect(store.user).toBeNull();
  });
});
