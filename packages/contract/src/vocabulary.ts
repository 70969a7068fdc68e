/**
 * The words API and app share: account roles, release states, the events that move a release and
 * which state each event leads to from which (docs/design.md, "Users and roles" and "The flow").
 * Rules as data: the API's release state machine (packages/api/src/releases/stateMachine.ts) reads
 * RELEASE_TRANSITIONS and nothing else, and the app names states and roles only from here.
 */
import { z } from 'zod';

export const ROLES = ['designer', 'reviewer', 'firmware', 'admin'] as const;
export const roleSchema = z.enum(ROLES);
export type Role = z.infer<typeof roleSchema>;

export function isRole(value: unknown): value is Role {
  return typeof value === 'string' && (ROLES as readonly string[]).includes(value);
}

/**
 *   draft ──request-review──▶ in-review ──approvals complete──▶ approved
 *                                  │
 *                                  └──request-changes──▶ changes-requested
 *   draft | in-review | changes-requested | approved ──withdraw──▶ withdrawn
 *
 * A release's content never changes; the state says only what people decided about it. Changes are
 * made by editing the design and cutting the next release, so changes-requested has no way back.
 * Withdrawing an approved release recalls it from firmware.
 */
export const RELEASE_STATES = ['draft', 'in-review', 'approved', 'changes-requested', 'withdrawn'] as const;
export type ReleaseState = (typeof RELEASE_STATES)[number];
export const releaseStateSchema = z.enum(RELEASE_STATES);

export const RELEASE_EVENTS = ['request-review', 'approve', 'request-changes', 'withdraw'] as const;
export type ReleaseEvent = (typeof RELEASE_EVENTS)[number];
export const releaseEventSchema = z.enum(RELEASE_EVENTS);

/** For each event, the state it leads to from each state it is allowed in (absent: not allowed). */
export const RELEASE_TRANSITIONS: Readonly<Record<ReleaseEvent, Readonly<Partial<Record<ReleaseState, ReleaseState>>>>> = {
  'request-review': { draft: 'in-review' },
  approve: { 'in-review': 'approved' },
  'request-changes': { 'in-review': 'changes-requested' },
  withdraw: { draft: 'withdrawn', 'in-review': 'withdrawn', 'changes-requested': 'withdrawn', approved: 'withdrawn' },
};

export const REVIEW_DECISIONS = ['approve', 'request-changes'] as const;
export const reviewDecisionValueSchema = z.enum(REVIEW_DECISIONS);
export type ReviewDecision = (typeof REVIEW_DECISIONS)[number];
