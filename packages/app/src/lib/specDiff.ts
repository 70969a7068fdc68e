/** Field-by-field comparison of two spec-like documents, by dot path (used for conflicts and release diffs). */

export function flatten(value: unknown, prefix = '', out: Record<string, string> = {}): Record<string, string> {
  if (value !== null && typeof value === 'object' && !Array.isArray(value)) {
    for (const [key, inner] of Object.entries(value as Record<string, unknown>)) {
      flatten(inner, prefix ? `${prefix}.${key}` : key, out);
    }
    return out;
  }
  if (prefix) out[prefix] = Array.isArray(value) ? JSON.stringify(value) : value === undefined ? '' : String(value);
  return out;
}

export interface FieldChange {
  readonly path: string;
  readonly before: string;
  readonly after: string;
}

export function diffDocuments(before: unknown, after: unknown): FieldChange[] {
  const a = flatten(before);
  const b = flatten(after);
  const paths = [...new Set([...Object.keys(a), ...Object.keys(b)])].sort();
  return paths
    .filter((path) => (a[path] ?? '') !== (b[path] ?? ''))
    .map((path) => ({ path, before: a[path] ?? '—', after: b[path] ?? '—' }));
}

export interface ThreeWayChange {
  readonly path: string;
  readonly base: string;
  readonly mine: string;
  readonly theirs: string;
  /** Both sides changed this field, to different values. */
  readonly clash: boolean;
}

/** What I changed and what they changed since the common base, field by field. */
export function threeWay(base: unknown, mine: unknown, theirs: unknown): ThreeWayChange[] {
  const b = flatten(base);
  const m = flatten(mine);
  const t = flatten(theirs);
  const paths = [...new Set([...Object.keys(b), ...Object.keys(m), ...Object.keys(t)])].sort();
  return paths
    .map((path) => ({ path, base: b[path] ?? '—', mine: m[path] ?? '—', theirs: t[path] ?? '—' }))
    .filter((c) => c.mine !== c.base || c.theirs !== c.base)
    .map((c) => ({ ...c, clash: c.mine !== c.base && c.theirs !== c.base && c.mine !== c.theirs }));
}
