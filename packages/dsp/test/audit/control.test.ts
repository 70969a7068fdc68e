/**
 * NCO control scaling (README "Control scaling"): K = gainHzPerUnit·2^N/(fs·2^(D−1)) accumulator LSBs
 * per filter-output LSB, G = round(K·2^S) with S the largest integer (≤ 62) for which G ≤ 2^(Wc−1) − 1;
 * worked here with exact BigInt arithmetic on the binary values, independent of the code.
 */
import { describe, expect, it } from 'vitest';
import { analyzeDesign, exampleSpecs, ncoControlScaling, type LoopSpec } from '../../src/index.ts';
import { generatedCases } from './specs.ts';

/** x as an exact fraction num/2^-exp (x > 0, a double). */
function exact(x: number): { num: bigint; den: bigint } {
  let e = 0;
  while (!Number.isInteger(x)) { x *= 2; e++; }
  return { num: BigInt(x), den: 2n ** BigInt(e) };
}

function expectedScaling(spec: LoopSpec): { g: bigint; s: number } {
  const g = exact(spec.nco.gainHzPerUnit);
  const fs = exact(spec.sampleRateHz);
  const n = BigInt(spec.nco.accumulatorBits);
  const d = BigInt(spec.fixedPoint.dataBits - 1);
  const max = 2n ** BigInt(spec.fixedPoint.coefficientBits - 1) - 1n;
  // K·2^S = g·2^N·2^S/(fs·2^(D−1)) as num/den, rounded half away from zero (K > 0; "nearest" spec mode)
  const roundAt = (s: number) => {
    const num = g.num * fs.den * 2n ** n * (s >= 0 ? 2n ** BigInt(s) : 1n);
    const den = g.den * fs.num * 2n ** d * (s < 0 ? 2n ** BigInt(-s) : 1n);
    return (2n * num + den) / (2n * den);
  };
  for (let s = 62; s >= -200; s--) if (roundAt(s) <= max) return { g: roundAt(s), s };
  throw new Error('no shift');
}

describe('control scaling (worked with BigInt)', () => {
  const specs = [...exampleSpecs.map((e) => e.spec), ...generatedCases(31).map((c) => c.spec)]
    .filter((s) => s.fixedPoint.rounding === 'nearest');
  it.each(specs.map((s) => [s.name, s] as const))('%s', (_n, spec) => {
    const c = ncoControlScaling({
      gainHzPerUnit: spec.nco.gainHzPerUnit, sampleRateHz: spec.sampleRateHz, accumulatorBits: spec.nco.accumulatorBits,
      dataBits: spec.fixedPoint.dataBits, coefficientBits: spec.fixedPoint.coefficientBits, rounding: spec.fixedPoint.rounding,
    });
    const e = expectedScaling(spec);
    expect(c.gainShift).toBe(e.s);
    expect(BigInt(c.gainCode)).toBe(e.g);
    // realised gain = G·2^−S·fs·2^(D−1)/2^N (README)
    const actual = (c.gainCode * 2 ** -c.gainShift * spec.sampleRateHz * 2 ** (spec.fixedPoint.dataBits - 1)) / 2 ** spec.nco.accumulatorBits;
    expect(c.actualGainHzPerUnit / actual).toBeCloseTo(1, 12);
    expect(Math.abs(c.actualGainHzPerUnit / spec.nco.gainHzPerUnit - 1)).toBeLessThan(2 ** -(spec.fixedPoint.coefficientBits - 3));
  });

  it('analyzeDesign reports the same control scaling as ncoControlScaling', () => {
    const r = analyzeDesign(exampleSpecs[0]!.spec);
    const e = expectedScaling(exampleSpecs[0]!.spec);
    expect(BigInt(r.nco.control!.gainCode)).toBe(e.g);
    expect(r.nco.control!.gainShift).toBe(e.s);
  });

  it('the Bode grid ends exactly at fs/2 (README; DESIGN.md closed interval)', () => {
    for (const spec of specs) expect(analyzeDesign(spec).bode.freqHz.at(-1)).toBe(spec.sampleRateHz / 2);
  });
});
