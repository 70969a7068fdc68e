/**
 * The difference between two releases of a design as data: every spec field that changed (dot
 * paths), every integer code that changed (by constant name, from the manifests) and the margins.
 */
import type { ReleaseDiff } from '@loopwright/contract';

type Change = ReleaseDiff['spec'][number];

/** Leaf values of a JSON document by dot path (arrays by index). */
export function flatten(value: unknown, prefix = '', out = new Map<string, unknown>()): Map<string, unknown> {
  if (value !== null && typeof value === 'object') {
    const entries = Array.isArray(value) ? value.map((v, i) => [String(i), v] as const) : Object.entries(value);
    if (entries.length === 0) out.set(prefix, value);
    for (const [key, v] of entries) flatten(v, prefix ? `${prefix}.${key}` : key, out);
  } else {
    out.set(prefix, value);
  }
  return out;
}

export function valueChanges(before: unknown, after: unknown): Change[] {
  const a = flatten(before);
  const b = flatten(after);
  const paths = [...new Set([...a.keys(), ...b.keys()])].sort();
  return paths
    .filter((p) => JSON.stringify(a.get(p)) !== JSON.stringify(b.get(p)))
    .map((path) => ({ path, before: a.has(path) ? a.get(path) : null, after: b.has(path) ? b.get(path) : null }));
}

export interface DiffSide {
  readonly id: number;
  readonly label: string;
  readonly spec: unknown;
  readonly constants: readonly { name: string; code: string }[];
  readonly margins: unknown;
}

export function releaseDiff(from: DiffSide, to: DiffSide): ReleaseDiff {
  const before = new Map(from.constants.map((c) => [c.name, c.code]));
  const after = new Map(to.constants.map((c) => [c.name, c.code]));
  const names = [...new Set([...before.keys(), ...after.keys()])];
  return {
    from: { id: from.id, label: from.label },
    to: { id: to.id, label: to.label },
    spec: valueChanges(from.spec, to.spec),
    codes: names
      .filter((n) => before.get(n) !== after.get(n))
      .map((name) => ({ name, before: before.get(name) ?? null, after: after.get(name) ?? null })),
    margins: valueChanges(from.margins, to.margins),
  };
}
