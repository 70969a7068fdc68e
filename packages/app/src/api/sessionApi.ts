import { sessionResponseSchema } from '@loopwright/contract';
import { api, ApiError } from './client.ts';
import type { SessionUser, SignInRequest } from './types.ts';

export const sessionApi = {
  /** Who am I; null when nobody is signed in (the server answers 401). */
  async current(): Promise<SessionUser | null> {
    try {
      return (await api.request('/session', sessionResponseSchema)).user;
    } catch (cause) {
      if (cause instanceof ApiError && cause.status === 401) return null;
      throw cause;
    }
  },
  async signIn(request: SignInRequest): Promise<SessionUser> {
    return (await api.request('/session', sessionResponseSchema, { method: 'POST', body: request })).user;
  },
  signOut: (): Promise<void> => api.send('/session', { method: 'DELETE' }),
};
