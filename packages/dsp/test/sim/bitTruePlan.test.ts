import { describe, expect, it } from 'vitest';
import { planBitTrue } from '../../src/sim/bitTruePlan.ts';
import { quantizeFilter } from '../../src/fixed/quantizeFilter.ts';
import { ultrasonicSinglePoleSpec as spec } from '../../src/spec/examples.ts';
import type { LoopSpec } from '../../src/spec/schema.ts';

describe('planBitTrue', () => {
  it('holds the constants the firmware needs', () => {
    const plan = planBitTrue(spec, quantizeFilter(spec));
    // 40 kHz at 1 MHz, N = 32: M = round(0.04·2^32) = round(171798691.84) = 171798692.
    expect(plan.tuning.tuningWord).toBe(171798692);
    expect(plan.coefficientCodes.length).toBe(5 * plan.sectionCount);
    expect(plan.sineTable.length).toBe(2 ** spec.nco.phaseBits);
  });

  it('rejects widths the exact integer arithmetic cannot hold, naming the field', () => {
    const wide: LoopSpec = { ...spec, fixedPoint: { ...spec.fixedPoint, dataBits: 28, coefficientBits: 28 } };
    expect(() => planBitTrue(wide, quantizeFilter(wide))).toThrow(/fixedPoint.dataBits/);
    const amp: LoopSpec = { ...spec, fixedPoint: { ...spec.fixedPoint, dataBits: 24 }, nco: { ...spec.nco, amplitudeBits: 32 } };
    expect(() => planBitTrue(amp, quantizeFilter(amp))).toThrow(/nco.amplitudeBits/);
  });
});

describe('bitTrueFormats', () => {
  it('states word and fraction bits of each signal as the README defines them', async () => {
    const { bitTrueFormats } = await import('../../src/sim/bitTruePlan.ts');
    const plan = planBitTrue(spec, quantizeFilter(spec));
    const f = Object.fromEntries(bitTrueFormats(plan).map((s) => [s.signal, s]));
    expect(f['input']).toMatchObject({ wordBits: 16, fractionBits: 15, signed: true });
    expect(f['mac']).toMatchObject({ wordBits: 40, fractionBits: plan.coefficientFractionBits + 15 });
    expect(f['phase']).toMatchObject({ wordBits: 32, signed: false });
  });
});
