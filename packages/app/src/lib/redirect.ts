import type { Role } from '../api/types.ts';
import { homeRouteFor } from '../router/home.ts';

/**
 * Where to go after sign-in: back to the page that asked for it when that is a local path
 * (never an outside URL: an open redirect would let a crafted link send people elsewhere).
 */
export function afterSignIn(redirect: unknown, roles: readonly Role[]): string | { name: string } {
  if (typeof redirect === 'string' && redirect.startsWith('/') && !redirect.startsWith('//')) return redirect;
  return { name: homeRouteFor(roles) };
}
