/**
 * The one place that says which release state may follow which. Services ask `transition` and
 * never write a state themselves; the database update is a compare-and-set on the state read here.
 *
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

export const RELEASE_EVENTS = ['request-review', 'approve', 'request-changes', 'withdraw'] as const;
export type ReleaseEvent = (typeof RELEASE_EVENTS)[number];

const TRANSITIONS: Readonly<Record<ReleaseEvent, Partial<Record<ReleaseState, ReleaseState>>>> = {
  'request-review': { draft: 'in-review' },
  approve: { 'in-review': 'approved' },
  'request-changes': { 'in-review': 'changes-requested' },
  withdraw: { draft: 'withdrawn', 'in-review': 'withdrawn', 'changes-requested': 'withdrawn', approved: 'withdrawn' },
};

export type TransitionResult =
  | { readonly ok: true; readonly to: ReleaseState }
  | { readonly ok: false; readonly message: string };

export function transition(from: ReleaseState, event: ReleaseEvent): TransitionResult {
  const to = TRANSITIONS[event][from];
  if (to !== undefined) return { ok: true, to };
  const allowedFrom = Object.keys(TRANSITIONS[event]).join(', ');
  return { ok: false, message: `cannot ${event} a release that is ${from} (only from: ${allowedFrom})` };
}

/** Events that may happen in a state (the app shows only these buttons). */
export function allowedEvents(state: ReleaseState): ReleaseEvent[] {
  return RELEASE_EVENTS.filter((event) => TRANSITIONS[event][state] !== undefined);
}
