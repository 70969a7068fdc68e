import type { Role } from '../api/types.ts';

/** Where each role starts after sign-in: the screen of its main job (DESIGN.md "Users and roles"). */
export function homeRouteFor(roles: readonly Role[]): string {
  if (roles.includes('designer')) return 'projects';
  if (roles.includes('reviewer')) return 'projects';
  if (roles.includes('firmware')) return 'downloads';
  if (roles.includes('admin')) return 'admin';
  return 'sign-in';
}
