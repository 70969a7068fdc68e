import { currentSessionResponseSchema, sessionResponseSchema } from '@loopwright/contract';
import { api } from './client.ts';
import type { SessionUser, SignInRequest } from './types.ts';

export const sessionApi = {
  /** Who am I; null when nobody is signed in (the server says so with 200 and user null). */
  async current(): Promise<SessionUser | null> {
    return (await api.request('/session', currentSessionResponseSchema)).user;
  },
  async signIn(request: SignInRequest): Promise<SessionUser> {
    return (await api.request('/session', sessionResponseSchema, { method: 'POST', body: request })).user;
  },
  signOut: (): Promise<void> => api.send('/session', { method: 'DELETE' }),
};
