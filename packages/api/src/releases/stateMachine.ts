/**
 * The one place that decides whether a release may move. The states, events and allowed
 * transitions are data in the contract package (RELEASE_TRANSITIONS, with the diagram); services ask
 * `transition` and never write a state themselves; the database update is a compare-and-set on the
 * state read here.
 */
import { RELEASE_EVENTS, RELEASE_TRANSITIONS, type ReleaseEvent, type ReleaseState } from '@loopwright/contract';

export type TransitionResult =
  | { readonly ok: true; readonly to: ReleaseState }
  | { readonly ok: false; readonly message: string };

export function transition(from: ReleaseState, event: ReleaseEvent): TransitionResult {
  const to = RELEASE_TRANSITIONS[event][from];
  if (to !== undefined) return { ok: true, to };
  const allowedFrom = Object.keys(RELEASE_TRANSITIONS[event]).join(', ');
  return { ok: false, message: `cannot ${event} a release that is ${from} (only from: ${allowedFrom})` };
}

/** Events that may happen in a state (the app shows only these buttons). */
export function allowedEvents(state: ReleaseState): ReleaseEvent[] {
  return RELEASE_EVENTS.filter((event) => RELEASE_TRANSITIONS[event][state] !== undefined);
}
