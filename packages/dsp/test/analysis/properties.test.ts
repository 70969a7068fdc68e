/**
 * Property tests (fast-check) over random valid specs and random junk: results never hold NaN or
 * ±Infinity, invalid input is reported by field and never throws, and well-margined designs are stable.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { analyzeDesign, tryAnalyzeDesign } from '../../src/planDesign.ts';
import { parseLoopSpec } from '../../src/spec/schema.ts';
import { mulberry32, randomLoopSpec } from '../reference/random.ts';
import { mainsSyncSpec } from '../../src/spec/examples.ts';

function nonFinitePaths(x: unknown, path = ''): string[] {
  if (typeof x === 'number') return Number.isFinite(x) ? [] : [path];
  if (Array.isArray(x)) return x.flatMap((v, i) => nonFinitePaths(v, `${path}[${i}]`));
  if (x && typeof x === 'object') return Object.entries(x).flatMap(([k, v]) => nonFinitePaths(v, `${path}.${k}`));
  return [];
}

const validSpec = fc.integer({ min: 1, max: 2 ** 31 - 1 }).map((seed) => randomLoopSpec(mulberry32(seed), seed % 1000));

describe('analyzeDesign over random valid specs', () => {
  it('never yields NaN or ±Infinity anywhere in the result', () => {
    fc.assert(
      fc.property(validSpec, (spec) => {
        const r = analyzeDesign(spec);
        expect(nonFinitePaths(r)).toEqual([]);
      }),
      { numRuns: 60 },
    );
  });

  it('is deterministic and survives a JSON round trip unchanged', () => {
    fc.assert(
      fc.property(validSpec, (spec) => {
        const a = analyzeDesign(spec);
        const b = analyzeDesign(structuredClone(spec));
        expect(JSON.parse(JSON.stringify(a))).toEqual(JSON.parse(JSON.stringify(b)));
      }),
      { numRuns: 20 },
    );
  });

  it('a design with comfortable analog margins is stable, analog and discrete', () => {
    fc.assert(
      fc.property(validSpec, (spec) => {
        const r = analyzeDesign(spec);
        const m = r.margins.analog;
        fc.pre(m.phaseMarginDeg !== null && m.phaseMarginDeg > 30 && (m.gainMarginDb === null || m.gainMarginDb > 6));
        expect(r.stability.analogStable).toBe(true);
        expect(r.stability.discreteStable).toBe(true);
      }),
      { numRuns: 60 },
    );
  });

  it('a loop with negative phase margin is reported unstable (Nyquist criterion, Og5)', () => {
    // Four-pole Butterworth far inside a wide loop: phase falls well past −180° before |L| = 1.
    const spec = { ...mainsSyncSpec, filter: { kind: 'butterworth' as const, order: 4, cutoffHz: 2 }, rippleFilter: null };
    const r = analyzeDesign(spec);
    expect(r.margins.analog.phaseMarginDeg!).toBeLessThan(0);
    expect(r.stability.analogStable).toBe(false);
    expect(r.stability.discreteStable).toBe(false);
    expect(r.verdict.stable).toBe(false);
  });
});

describe('tryAnalyzeDesign over the whole valid range', () => {
  const lu = (lo: number, hi: number) => fc.double({ min: Math.log10(lo), max: Math.log10(hi), noNaN: true }).map((e) => 10 ** e);
  const wideSpec = fc
    .record({
      fs: lu(1, 1e11),
      amplitude: lu(1e-6, 1),
      center: lu(1e-6, 0.49),
      gain: lu(1e-6, 1e10),
      kind: fc.constantFrom('single-pole', 'lag-lead', 'pi', 'butterworth'),
      corner: lu(1e-6, 0.49),
      damping: lu(0.01, 10),
      order: fc.integer({ min: 1, max: 4 }),
      ripple: fc.option(lu(1e-6, 0.49)),
      prewarp: fc.option(lu(1e-6, 0.49)),
      coefficientBits: fc.integer({ min: 2, max: 32 }),
    })
    .map((p) => ({
      ...mainsSyncSpec,
      clockHz: p.fs,
      sampleRateHz: p.fs,
      centerHz: p.center * p.fs,
      input: { amplitude: p.amplitude },
      nco: { ...mainsSyncSpec.nco, gainHzPerUnit: p.gain },
      filter:
        p.kind === 'single-pole'
          ? { kind: p.kind, cutoffHz: p.corner * p.fs }
          : p.kind === 'butterworth'
            ? { kind: p.kind, order: p.order, cutoffHz: p.corner * p.fs }
            : { kind: p.kind, naturalHz: p.corner * p.fs, damping: p.damping },
      rippleFilter: p.ripple === null ? null : { order: p.order, cutoffHz: p.ripple * p.fs },
      discretization: { method: 'bilinear', prewarpHz: p.prewarp === null ? null : p.prewarp * p.fs },
      fixedPoint: { ...mainsSyncSpec.fixedPoint, coefficientBits: p.coefficientBits, accumulatorBits: 64 },
    }));

  it('never throws and never yields NaN or ±Infinity, for unstable, degenerate and extreme loops too', () => {
    // Extremes on purpose: 2-bit coefficients (poles quantised onto the unit circle), loop gains far
    // above the loop rate (unstable, diverging step responses), corners a millionth of the rate.
    fc.assert(
      fc.property(wideSpec, (spec) => {
        const r = tryAnalyzeDesign(spec);
        if (r.ok) expect(nonFinitePaths(r.result)).toEqual([]);
        else expect(r.issues.length).toBeGreaterThan(0);
      }),
      { numRuns: 300 },
    );
  });
});

describe('invalid input', () => {
  it('parseLoopSpec and tryAnalyzeDesign never throw on arbitrary values', () => {
    fc.assert(
      fc.property(fc.anything(), (x) => {
        const p = parseLoopSpec(x);
        expect(p.ok).toBe(false);
        const t = tryAnalyzeDesign(x);
        expect(t.ok).toBe(false);
      }),
      { numRuns: 300 },
    );
  });

  it('a valid spec with one numeric field replaced by any double is either accepted with finite results or rejected naming that field', () => {
    const paths = ['clockHz', 'sampleRateHz', 'centerHz', 'input.amplitude', 'nco.gainHzPerUnit', 'filter.naturalHz', 'filter.damping', 'rippleFilter.cutoffHz', 'discretization.prewarpHz'];
    fc.assert(
      fc.property(fc.constantFrom(...paths), fc.double(), (path, value) => {
        const spec = structuredClone(mainsSyncSpec) as unknown as Record<string, Record<string, unknown>>;
        const [a, b] = path.split('.') as [string, string | undefined];
        if (b === undefined) (spec as Record<string, unknown>)[a] = value;
        else spec[a]![b] = value;
        const r = tryAnalyzeDesign(spec);
        if (r.ok) expect(nonFinitePaths(r.result)).toEqual([]);
        else expect(r.issues.map((i) => i.field).some((f) => f === path || f.startsWith(path.split('.')[0]!) || ['centerHz', 'sampleRateHz', 'filter.damping', 'filter.naturalHz'].includes(f))).toBe(true);
      }),
      { numRuns: 200 },
    );
  });
});
