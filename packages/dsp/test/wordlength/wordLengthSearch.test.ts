/**
 * Word-length search: invariants of the curve, equivalence with analyzeDesign's quantised loop, and a
 * parameter sweep showing that narrower loops (poles nearer z = 1) need longer coefficients
 * (OS3 Sec. 6.8 (memory): the realisable pole grid is sparse near z = 1).
 */
import { describe, expect, it } from 'vitest';
import { wordLengthSearch } from '../../src/wordlength/wordLengthSearch.ts';
import { analyzeDesign } from '../../src/planDesign.ts';
import { mainsSyncSpec, ultrasonicSinglePoleSpec } from '../../src/spec/examples.ts';
import type { LoopSpec } from '../../src/spec/schema.ts';

describe('coefficient width search', () => {
  const spec = ultrasonicSinglePoleSpec;
  const r = wordLengthSearch(spec, { data: false, maxCoefficientBits: 28 });

  it('reports a minimum from which every wider width passes, and the width below it fails', () => {
    expect(r.coefficients.minBits).not.toBeNull();
    const min = r.coefficients.minBits!;
    for (const p of r.coefficients.curve) if (p.coefficientBits >= min) expect(p.passes, `${p.coefficientBits} bits`).toBe(true);
    const below = r.coefficients.curve.find((p) => p.coefficientBits === min - 1);
    expect(below?.passes).toBe(false);
    expect(below?.reasons.length).toBeGreaterThan(0);
  });

  it('says in words why a width without a phase margin fails (no "undefined")', () => {
    const none = r.coefficients.curve.filter((p) => p.phaseMarginDeg === null);
    expect(none.length).toBeGreaterThan(0);
    for (const p of none) expect(p.reasons.join('; '), `${p.coefficientBits} bits`).toMatch(/^(unstable; )?no phase margin/);
  });

  it('at the spec’s own width agrees with analyzeDesign’s quantised loop (same quantiser, same margins)', () => {
    const a = analyzeDesign(spec);
    const p = r.coefficients.curve.find((q) => q.coefficientBits === spec.fixedPoint.coefficientBits)!;
    expect(p.phaseMarginDeg!).toBeCloseTo(a.quantization.loop!.margins.phaseMarginDeg!, 6);
    expect(p.maxDeviationDb!).toBeCloseTo(a.quantization.filter!.maxDeviationDb!, 12);
    expect(r.reference.phaseMarginDeg!).toBeCloseTo(a.margins.discrete.phaseMarginDeg!, 6);
  });

  it('the phase-margin error vanishes as the word grows (common practice, no source)', () => {
    const last = r.coefficients.curve.at(-1)!;
    expect(Math.abs(last.phaseMarginErrorDeg!)).toBeLessThan(1e-3);
    expect(last.maxDeviationDb!).toBeLessThan(1e-3);
  });

  it('reports progress that rises to 1', () => {
    const seen: number[] = [];
    wordLengthSearch(spec, { data: false, minCoefficientBits: 10, maxCoefficientBits: 14, onProgress: (f) => seen.push(f) });
    expect(seen.length).toBe(5);
    for (let i = 1; i < seen.length; i++) expect(seen[i]!).toBeGreaterThan(seen[i - 1]!);
    expect(seen.at(-1)).toBe(1);
  });

  it('keeps the integer bits of an explicit Q format as the word changes', () => {
    const explicit: LoopSpec = { ...spec, fixedPoint: { ...spec.fixedPoint, coefficientBits: 18, coefficientFractionBits: 16 } };
    const e = wordLengthSearch(explicit, { data: false, minCoefficientBits: 12, maxCoefficientBits: 20 });
    for (const p of e.coefficients.curve) expect(p.fractionBits).toBe(p.coefficientBits - 2);
  });
});

describe('narrower loops need longer coefficients (OS3 Sec. 6.8 (memory))', () => {
  it('minimum coefficient width does not fall as the natural frequency shrinks relative to the loop rate', () => {
    const widths = [100, 10, 1].map((naturalHz) => {
      const s: LoopSpec = { ...mainsSyncSpec, rippleFilter: null, filter: { kind: 'pi', naturalHz, damping: 0.707 } };
      return wordLengthSearch(s, { data: false, maxCoefficientBits: 40 }).coefficients.minBits!;
    });
    expect(widths[1]!).toBeGreaterThanOrEqual(widths[0]!);
    expect(widths[2]!).toBeGreaterThanOrEqual(widths[1]!);
    expect(widths[2]!).toBeGreaterThan(widths[0]!);
  });
});

describe('data width search (bit-true simulation against float)', () => {
  const r = wordLengthSearch(ultrasonicSinglePoleSpec, { minCoefficientBits: 16, maxCoefficientBits: 18, minDataBits: 6, maxDataBits: 18 });

  it('finds a data width from which every wider one tracks the float loop within tolerance', () => {
    const d = r.data!;
    expect(d.floatReference.locked).toBe(true);
    expect(d.minBits).not.toBeNull();
    for (const p of d.curve) {
      if (p.dataBits >= d.minBits!) {
        expect(p.passes).toBe(true);
        expect(Math.abs(p.steadyStatePhaseErrorDeg - d.floatReference.steadyStatePhaseErrorDeg)).toBeLessThanOrEqual(r.tolerances.phaseErrorDeg);
      }
    }
  });

  it('a too-narrow data path fails with a reason', () => {
    const p = r.data!.curve[0]!;
    expect(p.dataBits).toBe(6);
    expect(p.passes).toBe(false);
    expect(p.reasons.join(' ')).not.toBe('');
  });

  it('the tone of the search settles to the type-1 steady-state error Δω/K in the float loop (G3 Ch. 2)', () => {
    const a = analyzeDesign(ultrasonicSinglePoleSpec);
    const offsetHz = r.data!.scenario.kind === 'tone' ? r.data!.scenario.offsetHz : Number.NaN;
    // With the sinusoidal detector the error is asin(Δω/K) (G3); the mean over the last 10 % of the run.
    const expectedDeg = (Math.asin(a.steadyState.frequencyStepRadPerHz * offsetHz) * 180) / Math.PI;
    expect(r.data!.floatReference.steadyStatePhaseErrorDeg).toBeCloseTo(expectedDeg, 1);
  });

  it('predicts a roundoff SNR that rises 6.02 dB per data bit (q²/12 per rounding point, WK08; 20·log10 2 per bit, Be48)', () => {
    const curve = r.data!.curve;
    // the signal is a full-scale sinusoid of peak 1 − 2^(1−D) (the D-bit word's largest code)
    const fullScaleDb = (d: number) => 20 * Math.log10(1 - 2 ** (1 - d));
    for (let i = 1; i < curve.length; i++) {
      const d = curve[i]!.dataBits;
      expect(curve[i]!.predictedSnrDb! - curve[i - 1]!.predictedSnrDb!).toBeCloseTo(20 * Math.log10(2) + fullScaleDb(d) - fullScaleDb(d - 1), 2);
      expect(curve[i]!.predictedPhaseJitterDeg!).toBeLessThan(curve[i - 1]!.predictedPhaseJitterDeg!);
    }
  });

  it('at the spec’s own data width predicts what analyzeDesign predicts', () => {
    const own = r.data!.curve.find((p) => p.dataBits === ultrasonicSinglePoleSpec.fixedPoint.dataBits)!;
    const noise = analyzeDesign(ultrasonicSinglePoleSpec).quantization.noise!;
    expect(own.predictedSnrDb).toBeCloseTo(noise.outputSnrDb, 6);
    expect(own.predictedPhaseJitterDeg).toBeCloseTo(noise.phaseJitterDeg, 9);
  });
});

describe('word-length search over random valid specs', () => {
  it('never throws and returns finite figures (fast-check)', async () => {
    const fc = (await import('fast-check')).default;
    const { mulberry32, randomLoopSpec } = await import('../reference/random.ts');
    const finite = (x: unknown): boolean =>
      typeof x === 'number' ? Number.isFinite(x) : Array.isArray(x) ? x.every(finite) : x && typeof x === 'object' ? Object.values(x).every(finite) : true;
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 2 ** 31 - 1 }), (seed) => {
        const spec = randomLoopSpec(mulberry32(seed), 0);
        const r = wordLengthSearch(spec, { minCoefficientBits: 8, maxCoefficientBits: 20, minDataBits: 10, maxDataBits: 14, maxSamplesPerRun: 20_000 });
        expect(finite(r)).toBe(true);
        expect(r.coefficients.curve).toHaveLength(13);
      }),
      { numRuns: 15 },
    );
  });
});

describe('wordLengthSearchAsync (for a Web Worker)', () => {
  it('gives the same result as the synchronous search', async () => {
    const { wordLengthSearchAsync } = await import('../../src/wordlength/wordLengthSearch.ts');
    const opts = { minCoefficientBits: 10, maxCoefficientBits: 16, minDataBits: 8, maxDataBits: 12 };
    const a = await wordLengthSearchAsync(ultrasonicSinglePoleSpec, opts);
    expect(a).toEqual(wordLengthSearch(ultrasonicSinglePoleSpec, opts));
  });

  it('stops with an AbortError once the signal is aborted', async () => {
    const { wordLengthSearchAsync } = await import('../../src/wordlength/wordLengthSearch.ts');
    const signal = { aborted: false };
    const run = wordLengthSearchAsync(ultrasonicSinglePoleSpec, { signal, onProgress: () => (signal.aborted = true) });
    await expect(run).rejects.toMatchObject({ name: 'AbortError' });
  });
});
