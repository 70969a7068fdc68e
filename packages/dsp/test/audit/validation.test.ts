/**
 * Spec validation: DESIGN.md's field names, bad values naming the field path, parseLoopSpec never
 * throwing, and analyzeDesign never returning NaN/±Infinity (fast-check, seeded).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { analyzeDesign, mainsSyncSpec, parseLoopSpec, ultrasonicSinglePoleSpec } from '../../src/index.ts';
import { generatedCases } from './specs.ts';

type Json = Record<string, any>;
const clone = (x: unknown): Json => JSON.parse(JSON.stringify(x));

// DESIGN.md, "The loop design spec": every field with exactly this name (a dot path).
const DESIGN_FIELDS = [
  'name', 'clockHz', 'sampleRateHz', 'centerHz', 'input.amplitude', 'detector.kind',
  'nco.accumulatorBits', 'nco.phaseBits', 'nco.amplitudeBits', 'nco.gainHzPerUnit', 'nco.waveform',
  'filter.kind', 'discretization.method',
  'fixedPoint.coefficientBits', 'fixedPoint.coefficientFractionBits', 'fixedPoint.dataBits',
  'fixedPoint.accumulatorBits', 'fixedPoint.rounding', 'fixedPoint.overflow',
];

function at(o: Json, path: string): { parent: Json; key: string } {
  const keys = path.split('.');
  let p = o;
  for (const k of keys.slice(0, -1)) p = p[k];
  return { parent: p, key: keys[keys.length - 1]! };
}
function mutate(base: unknown, path: string, value: unknown): Json {
  const s = clone(base);
  const { parent, key } = at(s, path);
  if (value === undefined) delete parent[key];
  else parent[key] = value;
  return s;
}
function issueFields(input: unknown): string[] {
  const r = parseLoopSpec(input);
  return r.ok ? [] : r.issues.map((i) => i.field);
}

describe('DESIGN.md field names', () => {
  it('the demo specs use every DESIGN.md field under its exact name and parse', () => {
    const s = clone(mainsSyncSpec);
    for (const f of DESIGN_FIELDS) {
      const { parent, key } = at(s, f);
      expect(parent, f).toHaveProperty(key);
    }
    expect(s).toHaveProperty('rippleFilter.order');
    expect(s).toHaveProperty('rippleFilter.cutoffHz');
    expect(s).toHaveProperty('discretization.prewarpHz');
    expect(parseLoopSpec(s).ok).toBe(true);
  });

  it.each(DESIGN_FIELDS)('missing %s → an issue naming it', (f) => {
    expect(issueFields(mutate(mainsSyncSpec, f, undefined))).toContain(f);
  });

  it.each(['filter.naturalHz', 'filter.damping'])('PI from targets: missing %s is named', (f) => {
    expect(issueFields(mutate(mainsSyncSpec, f, undefined))).toContain(f);
  });

  it('filter fields per kind: cutoffHz, tau1S/tau2S, order are each named when bad', () => {
    const sp = ultrasonicSinglePoleSpec;
    expect(issueFields(mutate(sp, 'filter.cutoffHz', undefined))).toContain('filter.cutoffHz');
    expect(issueFields(mutate(sp, 'filter', { kind: 'lag-lead', tau1S: 1e-3, tau2S: -1 }))).toContain('filter.tau2S');
    expect(issueFields(mutate(sp, 'filter', { kind: 'pi', tau1S: 0, tau2S: 1e-3 }))).toContain('filter.tau1S');
    expect(issueFields(mutate(sp, 'filter', { kind: 'butterworth', order: 5, cutoffHz: 100 }))).toContain('filter.order');
    expect(issueFields(mutate(sp, 'filter', { kind: 'butterworth', order: 2.5, cutoffHz: 100 }))).toContain('filter.order');
    expect(issueFields(mutate(sp, 'rippleFilter', { order: 0, cutoffHz: 100 }))).toContain('rippleFilter.order');
    expect(issueFields(mutate(sp, 'rippleFilter', { order: 2, cutoffHz: 0 }))).toContain('rippleFilter.cutoffHz');
  });
});

describe('bad values name the field path (DESIGN.md: "a clear error naming the field")', () => {
  const fs = mainsSyncSpec.sampleRateHz;
  const table: [string, unknown, string?][] = [
    ['sampleRateHz', 2e8, 'sampleRateHz'], // above clockHz (1e8)
    ['nco.accumulatorBits', 65],
    ['nco.accumulatorBits', 0],
    ['nco.accumulatorBits', 32.5],
    ['centerHz', fs / 2],
    ['centerHz', fs],
    ['centerHz', 0],
    ['centerHz', -50],
    ['clockHz', Number.NaN],
    ['clockHz', Number.POSITIVE_INFINITY],
    ['clockHz', '100e6'],
    ['input.amplitude', 0],
    ['input.amplitude', 1.5],
    ['input.amplitude', '1'],
    ['nco.gainHzPerUnit', -20],
    ['nco.gainHzPerUnit', 0],
    ['nco.phaseBits', 40],
    ['nco.amplitudeBits', 0],
    ['nco.waveform', 'triangle'],
    ['detector.kind', 'xor'],
    ['filter.naturalHz', 0],
    ['filter.naturalHz', fs],
    ['filter.damping', -0.7],
    ['filter.damping', Number.NaN],
    ['rippleFilter.cutoffHz', fs / 2],
    ['rippleFilter.order', 5],
    ['discretization.method', 'tustin'],
    ['discretization.prewarpHz', 0],
    ['discretization.prewarpHz', fs],
    ['discretization.prewarpHz', '100'],
    ['fixedPoint.coefficientBits', 0],
    ['fixedPoint.coefficientBits', 18.5],
    ['fixedPoint.coefficientFractionBits', 'AUTO'],
    ['fixedPoint.coefficientFractionBits', -1],
    ['fixedPoint.dataBits', 1],
    ['fixedPoint.dataBits', Number.POSITIVE_INFINITY],
    ['fixedPoint.accumulatorBits', 65],
    ['fixedPoint.accumulatorBits', 8], // below max(dataBits, coefficientBits)
    ['fixedPoint.rounding', 'round'],
    ['fixedPoint.overflow', 'clip'],
    ['name', 'Mains'],
    ['name', '1abc'],
    ['name', 'a'.repeat(41)],
    ['name', 'x; drop'],
    ['specVersion', 2],
  ];
  it.each(table)('%s = %s', (path, value, expected) => {
    const fields = issueFields(mutate(mainsSyncSpec, path, value));
    expect(fields.length).toBeGreaterThan(0);
    expect(fields).toContain(expected ?? path);
  });

  it('every issue carries a non-empty message that names its field (common practice, no source)', () => {
    for (const [path, value] of table) {
      const r = parseLoopSpec(mutate(mainsSyncSpec, path, value));
      if (r.ok) throw new Error(`${path} accepted`);
      for (const i of r.issues) {
        expect(i.message.length).toBeGreaterThan(5);
        if (i.field) expect(i.message).toContain(i.field.split('.').pop()!);
      }
    }
  });

  it('lag-lead targets that need τ2 ≤ 0 or τ1 ≤ 0 are rejected by name (README; G3: τ1+τ2 = K/ωn², τ2 = 2ζ/ωn − 1/K)', () => {
    const sp = ultrasonicSinglePoleSpec; // K = 0.4·2π·2000 ≈ 5026.5 1/s
    const k = 0.4 * 2 * Math.PI * 2000;
    // τ2 = 2ζ/ωn − 1/K ≤ 0 ⇔ ζ ≤ ωn/(2K): ωn = 2π·500 ⇒ ζ ≤ 0.3125
    expect(issueFields(mutate(sp, 'filter', { kind: 'lag-lead', naturalHz: 500, damping: 0.3 }))).toContain('filter.damping');
    expect(parseLoopSpec(mutate(sp, 'filter', { kind: 'lag-lead', naturalHz: 500, damping: 0.32 })).ok).toBe(true);
    // τ1 = K/ωn² − τ2 ≤ 0 ⇔ K/ωn² ≤ 2ζ/ωn − 1/K: at ζ = 5, ωn = 2π·1000, K/ωn² = 1.27e-4 < τ2 = 1.39e-3
    expect(k / (2 * Math.PI * 1000) ** 2).toBeLessThan(10 / (2 * Math.PI * 1000) - 1 / k);
    expect(issueFields(mutate(sp, 'filter', { kind: 'lag-lead', naturalHz: 1000, damping: 5 }))).toContain('filter.naturalHz');
  });

  it('the clock/loop-rate ratio is reported exactly when it is not an integer (DESIGN.md: "say why not")', () => {
    const r = parseLoopSpec({ ...mainsSyncSpec, clockHz: 1e8 + 1 });
    expect(r.ok).toBe(true);
    const w = r.ok ? r.warnings.find((x) => x.field === 'sampleRateHz' || x.field === 'clockHz') : undefined;
    expect(w).toBeDefined();
    // 100000001/10000 = 10000.0001: a message that prints "10000.000" reads as an integer
    expect(w!.message).not.toMatch(/= 10000\.000 is not an integer/);
  });
});

describe('robustness (fast-check, seeded)', () => {
  it('parseLoopSpec never throws on arbitrary JSON or on a spec with one field replaced by junk', () => {
    fc.assert(fc.property(fc.jsonValue(), (v) => { parseLoopSpec(v); }), { seed: 11, numRuns: 500 });
    const paths = [...DESIGN_FIELDS, 'filter', 'rippleFilter', 'discretization', 'fixedPoint', 'nco', 'input'];
    fc.assert(
      fc.property(fc.constantFrom(...paths), fc.anything({ withNullPrototype: true, withBigInt: true, withMap: true }), (p, junk) => {
        const r = parseLoopSpec(mutate(mainsSyncSpec, p, junk === undefined ? null : junk));
        expect(typeof r.ok).toBe('boolean');
      }),
      { seed: 12, numRuns: 500 },
    );
  });

  function nonFinitePaths(v: unknown, path = '$', out: string[] = []): string[] {
    if (typeof v === 'number') { if (!Number.isFinite(v)) out.push(path); }
    else if (ArrayBuffer.isView(v)) (Array.from(v as unknown as ArrayLike<number>)).forEach((x, i) => nonFinitePaths(x, `${path}[${i}]`, out));
    else if (Array.isArray(v)) v.forEach((x, i) => nonFinitePaths(x, `${path}[${i}]`, out));
    else if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) nonFinitePaths(x, `${path}.${k}`, out);
    return out;
  }

  it('analyzeDesign has no NaN/±Infinity anywhere for 300 random valid specs (README "no NaN")', () => {
    // Random specs built like specs.ts (every kind, ripple/prewarp, all rounding modes) from random seeds.
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 2 ** 31 - 1 }), fc.nat(35), fc.constantFrom('nearest', 'half-even', 'truncate'), fc.integer({ min: 8, max: 32 }),
        (seed, pick, rounding, bits) => {
          const c = generatedCases(seed)[pick]!;
          // dataBits + coefficientBits ≤ 52 keeps the bit-true MAC exact in float64 (the schema's rule, limits.ts).
          const spec = { ...c.spec, fixedPoint: { ...c.spec.fixedPoint, rounding, coefficientBits: bits, dataBits: Math.min(bits, 24, 52 - bits), accumulatorBits: 56 } };
          const parsed = parseLoopSpec(spec);
          if (!parsed.ok) throw new Error(`generated spec invalid: ${JSON.stringify(parsed.issues)}`);
          const bad = nonFinitePaths(analyzeDesign(parsed.spec));
          expect(bad, c.label).toEqual([]);
        }),
      { seed: 2026, numRuns: 300 },
    );
  }, 120_000);
});
