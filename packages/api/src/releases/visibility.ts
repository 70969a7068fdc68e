/**
 * Who sees which release (DESIGN.md "Users and roles"): designers, reviewers and admins see every
 * state; an account that is firmware only sees approved releases. A hidden release answers 404, as
 * if it did not exist, so its existence does not leak.
 */
import type { SessionUser } from '@loopwright/contract';
import type { ReleaseState } from '@loopwright/contract';

export const FIRMWARE_VISIBLE_STATES: readonly ReleaseState[] = ['approved'];

export function seesAllStates(user: Pick<SessionUser, 'roles'>): boolean {
  return user.roles.some((role) => role === 'designer' || role === 'reviewer' || role === 'admin');
}

export function canSee(user: Pick<SessionUser, 'roles'>, state: ReleaseState): boolean {
  return seesAllStates(user) || FIRMWARE_VISIBLE_STATES.includes(state);
}
