import { api, ApiError } from './client.ts';
import type { SessionUser, SignInRequest } from './types.ts';

export const sessionApi = {
  /** Who am I; null when nobody is signed in (the server may answer 401 or `{ user: null }`). */
  async current(): Promise<SessionUser | null> {
    try {
      const body = await api.request<{ user: SessionUser | null } | undefined>('/session');
      return body?.user ?? null;
    } catch (cause) {
      if (cause instanceof ApiError && cause.status === 401) return null;
      throw cause;
    }
  },
  async signIn(request: SignInRequest): Promise<SessionUser> {
    const body = await api.request<{ user: SessionUser }>('/session', { method: 'POST', body: request });
    return body.user;
  },
  async signOut(): Promise<void> {
    await api.request<void>('/session', { method: 'DELETE' });
  },
};
