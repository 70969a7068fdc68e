/**
 * The reach of the fixed-point loop (src/analysis/fixedPointReach.ts): the hold-in the bit-true loop
 * can actually keep, from the control range and the ripple's headroom, checked against the textbook
 * figures it is built from (G3 Ch. 2, B6) and against the bit-true loop itself; and the warnings that
 * name the field when an estimate or a scenario asks for more.
 */
import { describe, expect, it } from 'vitest';
import { planDesign, simulatePlan } from '../../src/planDesign.ts';
import { mainsSyncSpec, ultrasonicSinglePoleSpec } from '../../src/spec/examples.ts';
import { requireValidSpec, type LoopSpec } from '../../src/spec/schema.ts';
import { scenarioReachWarning } from '../../src/analysis/fixedPointReach.ts';

const planOf = (spec: LoopSpec) => planDesign(requireValidSpec(spec));

describe('fixed-point reach of a type-2 loop (the mains demo, 20 Hz/unit)', () => {
  const plan = planOf(mainsSyncSpec);
  const reach = plan.analysis.fixedPointReach!;

  it('is the control range less the ripple headroom of the PI section, by the PI design equations', () => {
    // PI from targets (G3 Ch. 2, B6): τ1 = K/ωn², τ2 = 2ζ/ωn; K = Kd·Ko, Kd = A/2 = 0.5, Ko = 2π·20.
    // The detector ripple (amplitude Kd at 2·50 Hz, multiplier identity) leaves the PI section with
    // Kd·|1 + jωτ2|/(ωτ1); a 16-bit output saturates at 1 − 2^−15, so the section's DC can only use
    // what is left, and the ripple filter after it passes DC unchanged (Butterworth, unit DC gain).
    const kd = 0.5;
    const k = kd * 2 * Math.PI * 20;
    const wn = 2 * Math.PI * 5;
    const tau1 = k / wn ** 2;
    const tau2 = (2 * 0.707) / wn;
    const w = 2 * Math.PI * 100;
    const ripple = (kd * Math.hypot(1, w * tau2)) / (w * tau1);
    const expectedHz = 20 * (1 - 2 ** -15 - ripple);
    expect(reach.limitedBy).toBe('control-range');
    expect(reach.rangeField).toBe('nco.gainHzPerUnit');
    expect(reach.limitingSection).toBe(0);
    // Bilinear warping at 100 Hz of a 10 kHz loop moves |F| by well under 0.1 % (OS3 Sec. 7.2).
    expect(reach.holdInHz / expectedHz).toBeCloseTo(1, 3);
    expect(reach.highestHz - reach.lowestHz).toBeCloseTo(2 * reach.holdInHz, 9);
    expect(plan.analysis.estimates.holdInHz).toBeNull(); // the ideal PI loop: unbounded (G3)
  });

  it('is where the bit-true loop stops locking while the float loop still locks', () => {
    const at = (hz: number) => simulatePlan(plan, { kind: 'tone', offsetHz: hz, durationS: 4 });
    const inside = at(0.96 * reach.holdInHz);
    expect(inside.bitTrue!.metrics.locked).toBe(true);
    expect(inside.warnings).toEqual([]);
    const outside = at(1.04 * reach.holdInHz);
    expect(outside.float!.metrics.locked).toBe(true);
    expect(outside.bitTrue!.metrics.locked).toBe(false);
    expect(outside.warnings?.[0]?.field).toBe('offsetHz');
  });

  it('warns naming the scenario field at a 25 Hz offset, where the bit-true loop slips cycles and the float loop locks', () => {
    const r = simulatePlan(plan, { kind: 'tone', offsetHz: 25, durationS: 4 });
    expect(r.float!.metrics.locked).toBe(true);
    expect(r.bitTrue!.metrics.locked).toBe(false);
    expect(r.bitTrue!.metrics.cycleSlips).toBeGreaterThan(10);
    expect(r.warnings).toHaveLength(1);
    expect(r.warnings![0]!.message).toMatch(/^offsetHz 25 Hz is beyond the ±12\.\d+ Hz the fixed-point loop can hold/);
  });

  it('names the field of each scenario kind that asks for too much, and none for a phase step', () => {
    const far = 2 * reach.holdInHz;
    expect(scenarioReachWarning(reach, { kind: 'frequency-step', stepHz: -far, atS: 0.1, durationS: 1 })?.field).toBe('stepHz');
    expect(scenarioReachWarning(reach, { kind: 'fm', modulation: 'sine', rateHz: 1, deviationHz: far, durationS: 1 })?.field).toBe('deviationHz');
    expect(scenarioReachWarning(reach, { kind: 'sweep', fromHz: 0, toHz: far, rateHzPerS: 10, durationS: 2 * (far / 10) })?.field).toBe('toHz');
    expect(scenarioReachWarning(reach, { kind: 'phase-step', stepDeg: 90, atS: 0.1, durationS: 1 })).toBeNull();
  });

  it('warns naming the NCO gain when the pull-out estimate is beyond the fixed-point hold-in', () => {
    // Pull-out ≈ 1.8·ωn·(ζ + 1) (B6): 15.4 Hz for fn = 5 Hz, ζ = 0.707, beyond the ≈ 12.9 Hz reach.
    const w = plan.analysis.warnings.filter((x) => x.field === 'nco.gainHzPerUnit' && /pull-out estimate/.test(x.message));
    expect(w).toHaveLength(1);
    expect(plan.analysis.estimates.pullOutHz!).toBeCloseTo(1.8 * 5 * 1.707, 1);
  });
});

describe('fixed-point reach of a type-1 loop', () => {
  it('is the hold-in K·F(0) when the control range is wider (the ultrasonic demo, 800 Hz, G3)', () => {
    const plan = planOf(ultrasonicSinglePoleSpec);
    const reach = plan.analysis.fixedPointReach!;
    expect(reach.limitedBy).toBe('loop-gain');
    expect(reach.holdInHz).toBeCloseTo((0.8 / 2) * 2000, 6);
    expect(plan.analysis.warnings.filter((w) => /fixed-point loop can hold/.test(w.message))).toEqual([]);
  });

  it('is the MAC limit when the accumulator is too narrow, and the warning names fixedPoint.accumulatorBits', () => {
    // A Wa-bit MAC with Fc + D − 1 fraction bits clamps every section output at 2^(Wa−Fc−D) of full
    // scale (datapath.ts; fixed-point range, REFERENCES.md): two bits short, a quarter, 500 Hz < 800 Hz.
    const fc = planOf(ultrasonicSinglePoleSpec).quantized!.format.fractionBits;
    const d = ultrasonicSinglePoleSpec.fixedPoint.dataBits;
    const spec: LoopSpec = { ...ultrasonicSinglePoleSpec, fixedPoint: { ...ultrasonicSinglePoleSpec.fixedPoint, coefficientFractionBits: fc, accumulatorBits: fc + d - 2 } };
    const plan = planOf(spec);
    const reach = plan.analysis.fixedPointReach!;
    expect(reach.limitedBy).toBe('control-range');
    expect(reach.rangeField).toBe('fixedPoint.accumulatorBits');
    expect(reach.holdInHz).toBeLessThan(0.25 * 2000);
    expect(reach.holdInHz).toBeGreaterThan(0.24 * 2000);
    expect(plan.analysis.warnings.some((w) => w.field === 'fixedPoint.accumulatorBits' && /hold-in estimate 800 Hz is beyond/.test(w.message))).toBe(true);
  });
});
