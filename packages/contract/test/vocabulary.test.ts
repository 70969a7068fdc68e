import { describe, expect, it } from 'vitest';
import { RELEASE_EVENTS, RELEASE_STATES, RELEASE_TRANSITIONS, isRole } from '../src/index.ts';

// The flow of docs/design.md: review is asked for a draft; approval and a request for changes end a
// review; anything not yet withdrawn may be withdrawn; withdrawn is final.
describe('release transitions as data', () => {
  it('lead only from and to known states', () => {
    for (const event of RELEASE_EVENTS) {
      for (const [from, to] of Object.entries(RELEASE_TRANSITIONS[event])) {
        expect(RELEASE_STATES).toContain(from);
        expect(RELEASE_STATES).toContain(to);
      }
    }
  });

  it('leave withdrawn with no way out, and approved only by withdrawal', () => {
    const leaving = (state: string) => RELEASE_EVENTS.filter((e) => state in RELEASE_TRANSITIONS[e]);
    expect(leaving('withdrawn')).toEqual([]);
    expect(leaving('approved')).toEqual(['withdraw']);
    expect(leaving('changes-requested')).toEqual(['withdraw']);
    expect(leaving('draft')).toEqual(['request-review', 'withdraw']);
  });
});

describe('isRole', () => {
  it('accepts the four roles and nothing else', () => {
    expect(['designer', 'reviewer', 'firmware', 'admin'].every(isRole)).toBe(true);
    expect(isRole('Designer')).toBe(false);
    expect(isRole(undefined)).toBe(false);
  });
});
