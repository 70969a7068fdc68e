/**
 * The discrete loop: equivalences between the representations and convergence to the analog
 * prototype as the loop rate grows (bilinear: s ↔ z map agrees for ωT → 0, OS3 Sec. 7.2 (memory)).
 */
import { describe, expect, it } from 'vitest';
import { discreteLoopMargins, integratorCount } from '../../src/analysis/discreteLoop.ts';
import { analyzeDesign } from '../../src/planDesign.ts';
import { designLoopFilter } from '../../src/design.ts';
import { schurCohnStable, discreteLoopStable, routhHurwitzStable } from '../../src/analysis/stability.ts';
import { ultrasonicLagLeadSpec, mainsSyncSpec } from '../../src/spec/examples.ts';
import type { LoopSpec } from '../../src/spec/schema.ts';

describe('discreteLoopMargins accepts b/a and sections alike', () => {
  it.each([ultrasonicLagLeadSpec, mainsSyncSpec])('$name: same margins and stability from digital b/a and from sections', (spec) => {
    const d = designLoopFilter(spec);
    const a = discreteLoopMargins(spec, d.sections);
    const b = discreteLoopMargins(spec, d.digital);
    expect(b.margins.crossoverHz!).toBeCloseTo(a.margins.crossoverHz!, 6);
    expect(b.margins.phaseMarginDeg!).toBeCloseTo(a.margins.phaseMarginDeg!, 6);
    expect(b.margins.gainMarginDb!).toBeCloseTo(a.margins.gainMarginDb!, 6);
    expect(b.stable).toBe(a.stable);
    expect(b.loopType).toBe(a.loopType);
  });

  it('counts the PI integrator in either representation (loop type 2)', () => {
    const d = designLoopFilter(mainsSyncSpec);
    expect(integratorCount(d.sections)).toBe(1);
    expect(integratorCount(d.digital)).toBe(1);
  });
});

describe('the discrete loop converges to the analog prototype as sampleRateHz grows', () => {
  it('phase-margin difference shrinks about tenfold per decade of loop rate', () => {
    const base: LoopSpec = { ...mainsSyncSpec, clockHz: 1e8 };
    const diffs = [1e3, 1e4, 1e5, 1e6].map((fs) => {
      const r = analyzeDesign({ ...base, sampleRateHz: fs });
      return Math.abs(r.margins.analog.phaseMarginDeg! - r.margins.discrete.phaseMarginDeg!);
    });
    for (let i = 1; i < diffs.length; i++) expect(diffs[i]! / diffs[i - 1]!).toBeLessThan(0.2);
    // The NCO's sample of delay costs 180°·fc/fs at the crossover (common practice, no source): first order.
    const r = analyzeDesign({ ...base, sampleRateHz: 1e4 });
    expect(diffs[1]! / ((180 * r.margins.discrete.crossoverHz!) / 1e4)).toBeGreaterThan(0.5);
  });
});

describe('stability tests agree with each other where all are reliable', () => {
  it('Schur–Cohn on b/a and the section-wise test agree for moderate loops; Routh agrees with known polynomials', () => {
    for (const spec of [ultrasonicLagLeadSpec, mainsSyncSpec]) {
      const d = designLoopFilter(spec);
      const k = 2 * Math.PI * spec.nco.gainHzPerUnit * (spec.input.amplitude / 2);
      for (const scale of [0.5, 1, 4, 50, 400]) {
        const viaSections = discreteLoopStable(d.sections, k * scale, spec.sampleRateHz);
        const kt = (k * scale) / spec.sampleRateHz;
        const charA = [...d.digital.a, 0].map((x, i) => x - (d.digital.a[i - 1] ?? 0) + kt * (d.digital.b[i - 1] ?? 0));
        expect(viaSections).toBe(schurCohnStable(charA));
      }
    }
    // (s+1)(s+2)(s+3) is Hurwitz; s³ + s² + s + 2 is not (Routh: 1·1 < 2); s² + 1 is marginal (Og5 Sec. 5-6).
    expect(routhHurwitzStable([1, 6, 11, 6])).toBe(true);
    expect(routhHurwitzStable([1, 1, 1, 2])).toBe(false);
    expect(routhHurwitzStable([1, 0, 1])).toBe(false);
  });
});
