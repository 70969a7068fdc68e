/**
 * Which spec fields an edit changed, with the old and new value of each, for the audit trail: a
 * reader of the trail sees "centerHz 50 → 60", not that "specJson" changed.
 */
import { flatten } from '../releases/diff.ts';

export interface SpecFieldChange {
  /** Dot path in the spec (arrays by index). */
  readonly field: string;
  /** The leaf value before and after; null where the field did not exist on that side. */
  readonly from: unknown;
  readonly to: unknown;
}

export function specFieldChanges(before: unknown, after: unknown): SpecFieldChange[] {
  const a = flatten(before);
  const b = flatten(after);
  const fields = [...new Set([...a.keys(), ...b.keys()])].sort();
  return fields
    .filter((field) => JSON.stringify(a.get(field)) !== JSON.stringify(b.get(field)))
    .map((field) => ({ field, from: a.has(field) ? a.get(field) : null, to: b.has(field) ? b.get(field) : null }));
}
