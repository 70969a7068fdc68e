/**
 * The verdict: stable and margins met for the demo designs; each failure named in `reasons`.
 * Requirements PM ≥ 45°, GM ≥ 6 dB by default (common practice, no source).
 */
import { describe, expect, it } from 'vitest';
import { analyzeDesign } from '../../src/analysis/analyzeDesign.ts';
import { exampleSpecs, ultrasonicSinglePoleSpec } from '../../src/spec/examples.ts';
import type { LoopSpec } from '../../src/spec/schema.ts';

describe('analysis verdict', () => {
  it.each(exampleSpecs.map((e) => [e.id, e.spec] as const))('%s: stable, margins met, no reasons', (_id, spec) => {
    const v = analyzeDesign(spec).verdict;
    expect(v).toMatchObject({ stable: true, marginsMet: true, reasons: [] });
  });

  it('a stricter phase-margin requirement fails the margins but not stability, naming the margin', () => {
    const v = analyzeDesign(ultrasonicSinglePoleSpec, { minPhaseMarginDeg: 80 }).verdict;
    expect(v.stable).toBe(true);
    expect(v.marginsMet).toBe(false);
    expect(v.reasons.join(' ')).toMatch(/discrete phase margin .* below 80°/);
  });

  it('4-bit coefficients make the quantised loop unstable: stable false with the reason', () => {
    const spec: LoopSpec = { ...ultrasonicSinglePoleSpec, fixedPoint: { ...ultrasonicSinglePoleSpec.fixedPoint, coefficientBits: 4 } };
    const r = analyzeDesign(spec);
    expect(r.stability.discreteStable).toBe(true);
    expect(r.verdict.stable).toBe(false);
    expect(r.verdict.reasons.join(' ')).toMatch(/quantised|quantisation/);
  });
});
