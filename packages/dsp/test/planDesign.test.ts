/**
 * planDesign is the one computation of a design: each figure is derived once and every part of the
 * result reads the same object, so the release's constants, its vectors and its analysis cannot drift
 * apart. Checked against the bit-true arithmetic's definition (README "Bit-true arithmetic") and the
 * tuning-word formula M = round(f·2^N/fs) (TRG71).
 */
import { describe, expect, it } from 'vitest';
import { planDesign, simulatePlan, tryPlanDesign } from '../src/planDesign.ts';
import { defaultGoldenScenario, GOLDEN_VECTOR_SAMPLES } from '../src/vectors/goldenVectors.ts';
import { exampleSpecs, mainsSyncSpec } from '../src/spec/examples.ts';
import { requireValidSpec } from '../src/spec/schema.ts';

const mains = requireValidSpec(mainsSyncSpec);

describe('planDesign: one result, each figure once', () => {
  const plan = planDesign(mains, { goldenVectors: true });

  it('gives the analysis, the bit-true constants and the quantised filter the same objects', () => {
    expect(plan.analysis.quantization.filter).toBe(plan.quantized);
    expect(plan.analysis.filter).toBe(plan.filter);
    expect(plan.analysis.nco).toBe(plan.nco);
    expect(plan.bitTrue!.tuning).toBe(plan.nco.tuning);
    expect(plan.bitTrue!.control).toBe(plan.nco.control);
  });

  it('takes the bit-true coefficient codes from the quantised sections, in section order', () => {
    const codes = plan.quantized!.sections.flatMap((s) => [s.codes.b0, s.codes.b1, s.codes.b2, s.codes.a1, s.codes.a2]);
    expect(plan.bitTrue!.coefficientCodes).toEqual(codes);
    expect(plan.bitTrue!.coefficientBits).toBe(mains.fixedPoint.coefficientBits);
    expect(plan.bitTrue!.accumulatorBits).toBe(mains.fixedPoint.accumulatorBits);
  });

  it('holds the tuning word of TRG71: 50 Hz at 10 kHz, N = 32 gives round(0.005·2^32) = 21474836', () => {
    expect(plan.nco.tuning.tuningWordDecimal).toBe('21474836');
    expect(plan.nco.tuning.tuningWordHi * 2 ** 32 + plan.nco.tuning.tuningWordLo).toBe(21474836);
  });

  it('runs the golden vectors on its own bit-true constants: a simulation of the plan gives the same record', () => {
    const again = simulatePlan(plan, defaultGoldenScenario(mains), { mode: 'bit-true', keepRecord: true }).bitTrue!;
    expect(plan.goldenVectors!.checksum).toBe(again.checksum);
    expect(Array.from(plan.goldenVectors!.record.filterCode)).toEqual(Array.from(again.record!.filterCode));
    expect(plan.goldenVectors!.record.length).toBe(GOLDEN_VECTOR_SAMPLES);
  });

  it('makes golden vectors only when asked', () => {
    expect(planDesign(mains).goldenVectors).toBeNull();
  });

  it('is frozen: no reader can change a figure another reader sees', () => {
    expect(Object.isFrozen(plan)).toBe(true);
    expect(Object.isFrozen(plan.analysis.margins.discrete)).toBe(true);
    expect(Object.isFrozen(plan.quantized!.sections[0]!.codes)).toBe(true);
    expect(Object.isFrozen(plan.analysis.bode)).toBe(true);
    expect(Object.isFrozen(plan.analysis.margins.discrete.phaseCrossings)).toBe(true);
    expect(() => {
      (plan.analysis.verdict as { stable: boolean }).stable = false;
    }).toThrow(TypeError);
  });
});

describe('planDesign when the widths cannot represent the loop', () => {
  it('keeps the analysis and says which field stops the bit-true loop (a 4-bit word cannot hold b0 ≈ 2ζωn/K ≈ 50)', () => {
    // PI from targets (G3 Ch. 2): τ1 = K/ωn², τ2 = 2ζ/ωn, so the bilinear b0 ≈ τ2/τ1 = 2ζωn/K = 50 here.
    const narrow = requireValidSpec({ ...mainsSyncSpec, filter: { kind: 'pi', naturalHz: 5, damping: 50 }, fixedPoint: { ...mainsSyncSpec.fixedPoint, coefficientBits: 4 } });
    const plan = planDesign(narrow, { goldenVectors: true });
    expect(plan.quantized).toBeNull();
    expect(plan.bitTrue).toBeNull();
    expect(plan.bitTrueIssue?.field).toBe('fixedPoint.coefficientBits');
    expect(plan.analysis.quantization.error?.field).toBe('fixedPoint.coefficientBits');
    expect(plan.analysis.verdict.stable).toBe(false);
    expect(plan.goldenVectors).toBeNull();
  });
});

describe('tryPlanDesign', () => {
  it('plans every example', () => {
    for (const e of exampleSpecs) {
      const r = tryPlanDesign(e.spec);
      expect(r.ok && r.plan.bitTrue !== null).toBe(true);
    }
  });

  it('gives the field issues of an invalid spec instead of a plan', () => {
    const r = tryPlanDesign({ ...mainsSyncSpec, nco: { ...mainsSyncSpec.nco, phaseBits: 40 } });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.issues.map((i) => i.field)).toContain('nco.phaseBits');
  });
});
