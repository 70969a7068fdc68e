/**
 * High-gain corners: margins of 108 loops with crossovers near or past Nyquist (many unstable) against
 * the independent SciPy model (reference/audit_reference.py; Og5 definitions, grid + brentq), and what
 * the analysis says about closed-loop figures of an unstable loop.
 */
import { describe, expect, it } from 'vitest';
import { analyzeDesign } from '../../src/index.ts';
import { runAuditReference } from './reference/run.ts';
import { boostedCases } from './specs.ts';

interface M { crossoverHz: number | null; phaseMarginDeg: number | null; phaseCrossoverHz: number | null; gainMarginDb: number | null; gainCrossingsHz: number[]; phaseCrossingsHz: number[] }
const cases = boostedCases();
const refs = runAuditReference<{ cases: { analogMargins: M; discreteMargins: M; discreteClosed: { bandwidth3dbHz: number | null; peakingDb: number }; discreteNoiseHz: number }[] }>({
  cases: cases.map((c) => c.spec),
}).cases;
const results = cases.map((c) => analyzeDesign(c.spec));

const close = (a: number | null, b: number | null, tol: number) =>
  a === null || b === null ? a === b : Math.abs(a - b) <= tol * Math.max(1, Math.abs(b));

describe('margins of high-gain loops match SciPy', () => {
  it.each(cases.map((c, i) => [c.label, i] as const))('%s', (_l, i) => {
    const r = results[i]!;
    const e = refs[i]!;
    for (const [m, x] of [[r.margins.analog, e.analogMargins], [r.margins.discrete, e.discreteMargins]] as const) {
      expect(m.gainCrossingsHz.length).toBe(x.gainCrossingsHz.length);
      expect(m.phaseCrossings.length).toBe(x.phaseCrossingsHz.length);
      expect(close(m.crossoverHz, x.crossoverHz, 1e-7)).toBe(true);
      expect(close(m.phaseMarginDeg, x.phaseMarginDeg, 1e-7)).toBe(true);
      expect(close(m.phaseCrossoverHz, x.phaseCrossoverHz, 1e-7)).toBe(true);
      expect(close(m.gainMarginDb, x.gainMarginDb, 1e-7)).toBe(true);
    }
    if (r.stability.discreteStable) {
      expect(close(r.closedLoop.discrete.bandwidth3dbHz, e.discreteClosed.bandwidth3dbHz, 1e-7)).toBe(true);
      expect(Math.abs(r.closedLoop.discrete.peakingDb! - e.discreteClosed.peakingDb)).toBeLessThan(1e-6);
      expect(Math.abs(r.noiseBandwidth.discreteHz! / e.discreteNoiseHz - 1)).toBeLessThan(1e-6);
    }
  });
});

describe('closed-loop figures of an unstable loop', () => {
  // |H(e^{jωT})| of an unstable closed loop is not a frequency response (there is no steady state), so
  // its −3 dB bandwidth, peaking and ∫|H|² do not exist. README: "a figure that does not exist is null
  // with a reason in a notes list" (common practice, no source).
  const unstable = results.filter((r) => !r.stability.discreteStable);
  it('the set holds unstable discrete loops', () => expect(unstable.length).toBeGreaterThan(10));
  it('an unstable discrete loop reports no noise bandwidth and says why in the closed-loop notes', () => {
    for (const r of unstable) {
      expect(r.noiseBandwidth.discreteHz, r.specName).toBeNull();
      expect(r.closedLoop.discrete.notes.join(' '), r.specName).toMatch(/unstable/);
    }
  });
});
