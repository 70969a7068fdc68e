import type { RouteLocationNormalized, RouteLocationRaw } from 'vue-router';
import type { Role } from '../api/types.ts';
import { homeRouteFor } from './home.ts';
import { isBareRoute } from '../lib/navigation.ts';

declare module 'vue-router' {
  interface RouteMeta {
    /** Open to everybody (sign-in, the e-mail review link). */
    public?: boolean;
    /** Any one of these roles opens the route; absent means any signed-in user. */
    roles?: readonly Role[];
    title?: string;
  }
}

/** What the guard needs to know about the session, so it can be tested without a store. */
export interface GuardSession {
  ensureLoaded(): Promise<void>;
  readonly signedIn: boolean;
  readonly roles: readonly Role[];
}

/** Decides each navigation: true to go on, or where to go instead. */
export async function roleGuard(to: RouteLocationNormalized, session: GuardSession): Promise<true | RouteLocationRaw> {
  if (to.meta.public) {
    // A public screen drawn with the rail (the not-found page) shows the rail of whoever is signed in.
    if (!isBareRoute(to.name)) await session.ensureLoaded();
    return true;
  }
  await session.ensureLoaded();
  if (!session.signedIn) return { name: 'sign-in', query: { redirect: to.fullPath } };
  const wanted = to.meta.roles;
  if (!wanted || wanted.some((role) => session.roles.includes(role))) return true;
  const home = homeRouteFor(session.roles);
  if (home === to.name) return { name: 'sign-in' };
  return { name: home, query: { denied: String(to.name ?? to.fullPath) } };
}

/** Signed-in users who open the sign-in page go to their home screen instead. */
export async function signInGuard(to: RouteLocationNormalized, session: GuardSession): Promise<true | RouteLocationRaw> {
  if (to.name !== 'sign-in') return true;
  await session.ensureLoaded();
  if (!session.signedIn) return true;
  return { name: homeRouteFor(session.roles) };
}
