import { describe, expect, it } from 'vitest';
import { bitTrueFormats } from '../../src/sim/bitTruePlan.ts';
import { planDesign } from '../../src/planDesign.ts';
import { ultrasonicSinglePoleSpec } from '../../src/spec/examples.ts';
import { parseLoopSpec, requireValidSpec } from '../../src/spec/schema.ts';

const spec = requireValidSpec(ultrasonicSinglePoleSpec);

describe('planBitTrue', () => {
  it('holds the constants the firmware needs', () => {
    const plan = planDesign(spec).bitTrue!;
    // 40 kHz at 1 MHz, N = 32: M = round(0.04·2^32) = round(171798691.84) = 171798692.
    expect(plan.tuning.tuningWordDecimal).toBe('171798692');
    expect(plan.coefficientCodes.length).toBe(5 * plan.sectionCount);
    expect(plan.sineTable.length).toBe(2 ** spec.nco.phaseBits);
  });

  it('is never asked for widths the exact integer arithmetic cannot hold: the schema refuses them, naming the field', () => {
    const wide = parseLoopSpec({ ...spec, fixedPoint: { ...spec.fixedPoint, dataBits: 28, coefficientBits: 28 } });
    expect(wide.ok ? [] : wide.issues.map((i) => i.field)).toEqual(['fixedPoint.dataBits']);
    const amp = parseLoopSpec({ ...spec, fixedPoint: { ...spec.fixedPoint, dataBits: 24 }, nco: { ...spec.nco, amplitudeBits: 32 } });
    expect(amp.ok ? [] : amp.issues.map((i) => i.field)).toEqual(['nco.amplitudeBits']);
    // One bit less on each side is a valid spec with a bit-true plan: the limits sit exactly at 2^53.
    const edge = requireValidSpec({ ...spec, fixedPoint: { ...spec.fixedPoint, dataBits: 26, coefficientBits: 26, accumulatorBits: 64 } });
    expect(planDesign(edge).bitTrue).not.toBeNull();
  });
});

describe('bitTrueFormats', () => {
  it('states word and fraction bits of each signal as the README defines them', () => {
    const plan = planDesign(spec).bitTrue!;
    const f = Object.fromEntries(bitTrueFormats(plan).map((s) => [s.signal, s]));
    expect(f['input']).toMatchObject({ wordBits: 16, fractionBits: 15, signed: true });
    expect(f['mac']).toMatchObject({ wordBits: 40, fractionBits: plan.coefficientFractionBits + 15 });
    expect(f['phase']).toMatchObject({ wordBits: 32, signed: false });
  });
});
