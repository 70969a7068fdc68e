/**
 * Seeded mutation of JSON documents for the fuzz suite (fast-check draws every choice, so a seed
 * replays a run exactly). A mutation picks any path of the document — a leaf or a whole object — and
 * replaces it with a value of another kind or at an edge, scales a number by a power of ten, steps an
 * integer past a bound, deletes a field, or adds an unknown one.
 */
import fc from 'fast-check';

type Json = null | boolean | number | string | Json[] | { [key: string]: Json };
type Path = readonly (string | number)[];

/** Values at the edges: of the number line, of the schema's bounds, and of the other JSON kinds. */
const edgeValue: fc.Arbitrary<Json> = fc.oneof(
  fc.constantFrom<Json>(0, -0, -1, 1, 2, 3, 0.5, 1e-13, 1e-12, 1e-7, 1e-6, 4, 15, 16, 17, 23, 24, 25, 31, 32, 33, 53, 63, 64, 65, 1e6, 1e12, 1.0000001e12, 1e15, 1e300, -1e300),
  fc.constantFrom<Json>(2 ** 31, 2 ** 32, 2 ** 53, 2 ** 64, Number.MIN_VALUE, Number.EPSILON, Number.MAX_SAFE_INTEGER),
  fc.integer({ min: -70, max: 70 }),
  fc.double({ noNaN: true, noDefaultInfinity: true }),
  fc.double({ min: 1e-9, max: 1e13, noNaN: true }),
  fc.constantFrom<Json>('', 'x', 'auto', 'sine', 'square', 'pi', 'lag-lead', 'butterworth', 'single-pole', 'nearest', 'half-even', 'truncate', 'wrap', 'saturate', 'bilinear', 'multiplier', 'tone', 'fm', '12', ' 1', 'a'.repeat(300), 'pll_\u00e9'),
  fc.constantFrom<Json>(null, true, false, [], {}, [1, 2], { kind: 'pi' }, { order: 2, cutoffHz: 100 }),
);

type Mutation =
  | { readonly op: 'replace'; readonly at: number; readonly value: Json }
  | { readonly op: 'scale'; readonly at: number; readonly exponent: number }
  | { readonly op: 'step'; readonly at: number; readonly by: number }
  | { readonly op: 'delete'; readonly at: number }
  | { readonly op: 'add'; readonly at: number; readonly key: string; readonly value: Json };

const mutation: fc.Arbitrary<Mutation> = fc.oneof(
  { weight: 4, arbitrary: fc.record({ op: fc.constant('replace' as const), at: fc.nat(), value: edgeValue }) },
  { weight: 3, arbitrary: fc.record({ op: fc.constant('scale' as const), at: fc.nat(), exponent: fc.integer({ min: -14, max: 14 }) }) },
  { weight: 2, arbitrary: fc.record({ op: fc.constant('step' as const), at: fc.nat(), by: fc.constantFrom(-2, -1, 1, 2) }) },
  { weight: 1, arbitrary: fc.record({ op: fc.constant('delete' as const), at: fc.nat() }) },
  { weight: 1, arbitrary: fc.record({ op: fc.constant('add' as const), at: fc.nat(), key: fc.constantFrom('extra', 'rippleFilter', 'prewarpHz', 'order', 'seed', 'tau1S'), value: edgeValue }) },
);

function paths(doc: Json, prefix: Path = []): Path[] {
  if (doc === null || typeof doc !== 'object') return [prefix];
  const children = Array.isArray(doc) ? doc.map((v, i) => paths(v, [...prefix, i])) : Object.entries(doc).map(([k, v]) => paths(v, [...prefix, k]));
  return [prefix, ...children.flat()];
}

function get(doc: Json, path: Path): Json {
  return path.reduce<Json>((node, key) => (node as Record<string | number, Json>)[key] ?? null, doc);
}

function set(doc: Json, path: Path, value: Json | undefined): Json {
  if (path.length === 0) return value ?? null;
  const parent = get(doc, path.slice(0, -1)) as Record<string | number, Json>;
  const key = path[path.length - 1]!;
  if (value === undefined) delete parent[key];
  else parent[key] = value;
  return doc;
}

function apply(doc: Json, m: Mutation): Json {
  const all = paths(doc);
  const at = all[m.at % all.length]!;
  const current = get(doc, at);
  switch (m.op) {
    case 'replace':
      return set(doc, at, structuredClone(m.value));
    case 'scale':
      return typeof current === 'number' ? set(doc, at, current * 10 ** m.exponent) : doc;
    case 'step':
      return typeof current === 'number' ? set(doc, at, current + m.by) : doc;
    case 'delete':
      return at.length === 0 ? doc : set(doc, at, undefined);
    case 'add':
      return current !== null && typeof current === 'object' && !Array.isArray(current) ? set(doc, [...at, m.key], structuredClone(m.value)) : doc;
  }
}

/** Documents made from `bases` by one to three mutations each. */
export function mutated<T>(bases: readonly T[]): fc.Arbitrary<unknown> {
  return fc.tuple(fc.constantFrom(...bases), fc.array(mutation, { minLength: 1, maxLength: 3 })).map(([base, ms]) => ms.reduce<Json>((doc, m) => apply(doc, m), structuredClone(base) as Json));
}

/** `count` draws of `arb` under a fixed seed (the same documents on every run). */
export function draws<T>(arb: fc.Arbitrary<T>, count: number, seed: number): T[] {
  return fc.sample(arb, { numRuns: count, seed });
}
