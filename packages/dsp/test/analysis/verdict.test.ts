/**
 * The verdict: stable and margins met for the demo designs; each failure named in `reasons`.
 * Requirements PM ≥ 45°, GM ≥ 6 dB by default (common practice, no source).
 */
import { describe, expect, it } from 'vitest';
import { analyzeDesign } from '../../src/planDesign.ts';
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

  it('2-bit coefficients leave the quantised loop without a gain crossover: the reason says so in words', () => {
    const spec: LoopSpec = { ...ultrasonicSinglePoleSpec, fixedPoint: { ...ultrasonicSinglePoleSpec.fixedPoint, coefficientBits: 2, coefficientFractionBits: 'auto' } };
    const v = analyzeDesign(spec).verdict;
    expect(v.marginsMet).toBe(false);
    const text = v.reasons.join(' ');
    expect(text).not.toMatch(/undefined|NaN|null/);
    expect(text).toMatch(/the quantised loop has no phase margin: \|L\| does not cross 0 dB between .* Hz and .* Hz; at least 45° is required/);
  });

  it('4-bit coefficients make the quantised loop unstable: stable false with the reason', () => {
    const spec: LoopSpec = { ...ultrasonicSinglePoleSpec, fixedPoint: { ...ultrasonicSinglePoleSpec.fixedPoint, coefficientBits: 4 } };
    const r = analyzeDesign(spec);
    expect(r.stability.discreteStable).toBe(true);
    expect(r.verdict.stable).toBe(false);
    // The quantiser succeeded (no format error): it is the loop it made that is unstable.
    expect(r.quantization.error).toBeNull();
    expect(r.verdict.reasons).toContain('the loop with quantised coefficients is unstable');
    expect(r.verdict.reasons.some((m) => m.startsWith('quantisation failed'))).toBe(false);
  });
});

describe('fixed-point datapath range (README, "Bit-true arithmetic")', () => {
  it('a MAC narrower than Fc + D clamps the outputs at 2^(Wa−Fc−D) of full scale and fails the verdict', async () => {
    const { mainsSyncSpec } = await import('../../src/spec/examples.ts');
    // 24-bit data and coefficients in a 40-bit MAC: Fc is chosen by "auto" from the coefficients.
    const spec: LoopSpec = { ...mainsSyncSpec, fixedPoint: { ...mainsSyncSpec.fixedPoint, dataBits: 24, coefficientBits: 24, accumulatorBits: 40 } };
    const r = analyzeDesign(spec);
    const fc = r.quantization.filter!.format.fractionBits;
    expect(fc + 24).toBeGreaterThan(40);
    const dp = r.quantization.datapath!;
    expect(dp.macLimitsOutput).toBe(true);
    expect(dp.outputLimitUnits).toBe(2 ** (40 - fc - 24));
    expect(dp.controlRangeHz).toBeCloseTo(spec.nco.gainHzPerUnit * 2 ** (40 - fc - 24), 12);
    expect(r.verdict.datapathOk).toBe(false);
    expect(r.verdict.reasons.join(' ')).toMatch(/fixedPoint\.accumulatorBits/);
  });

  it('a MAC of Fc + D bits reaches full scale: no datapath reason', async () => {
    const { mainsSyncSpec } = await import('../../src/spec/examples.ts');
    const r0 = analyzeDesign(mainsSyncSpec);
    const fc = r0.quantization.filter!.format.fractionBits;
    const spec: LoopSpec = { ...mainsSyncSpec, fixedPoint: { ...mainsSyncSpec.fixedPoint, accumulatorBits: fc + mainsSyncSpec.fixedPoint.dataBits } };
    const r = analyzeDesign(spec);
    expect(r.quantization.datapath!.macLimitsOutput).toBe(false);
    expect(r.quantization.datapath!.controlRangeHz).toBeCloseTo(spec.nco.gainHzPerUnit * (1 - 2 ** -(spec.fixedPoint.dataBits - 1)), 12);
    expect(r.verdict.datapathOk).toBe(true);
  });
});
