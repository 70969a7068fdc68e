import { describe, expect, it } from 'vitest';
import type { Sos } from '../../src/types/filter.ts';
import { quantizeSections } from '../../src/fixed/quantizeSections.ts';
import { sectionPoleRadius } from '../../src/fixed/sectionPoles.ts';
import { python } from './python.ts';

/**
 * A 2nd-order Butterworth low-pass section worked from first principles: analog poles at
 * Ωc·e^{±j3π/4} (Bu30), Ωc prewarped = 2fs·tan(π·fc/fs), mapped by the bilinear transform
 * z = (1 + s/2fs)/(1 − s/2fs) (OS3 Sec. 7.2, memory); then a1 = −2r·cos θ, a2 = r² (OS3 Sec. 6.8) and
 * b = g·[1, 2, 1] with g = (1 + a1 + a2)/4 for unit DC gain (zeros at z = −1).
 */
function butterworth2(cutoffHz: number, sampleRateHz: number): Sos {
  const k = 2 * sampleRateHz;
  const wc = k * Math.tan((Math.PI * cutoffHz) / sampleRateHz);
  const sRe = -wc * Math.SQRT1_2;
  const sIm = wc * Math.SQRT1_2;
  // z = (k + s)/(k − s)
  const nRe = k + sRe;
  const dRe = k - sRe;
  const r = Math.hypot(nRe, sIm) / Math.hypot(dRe, sIm);
  const theta = Math.atan2(sIm, nRe) + Math.atan2(sIm, dRe);
  const a1 = -2 * r * Math.cos(theta);
  const a2 = r * r;
  const g = (1 + a1 + a2) / 4;
  return { b: [g, 2 * g, g], a: [1, a1, a2] };
}

const fx18 = { coefficientBits: 18, rounding: 'nearest', overflow: 'saturate' } as const;

describe('quantizeSections: the narrow-band trap (10 Hz Butterworth at fs = 1 MHz, 18 bits)', () => {
  const section = butterworth2(10, 1e6);

  it('matches scipy.signal.butter for the unquantised section', () => {
    const ref = python<{ b: number[]; a: number[] }>(
      `import scipy.signal as s\nb, a = s.butter(2, 10, fs=1e6)\nout = {'b': list(b), 'a': list(a)}`,
      null,
    );
    // g = (1 + a1 + a2)/4 cancels to ~4e-9, so b agrees only to ~1e-7 relative.
    section.b.forEach((v, i) => expect(Math.abs(v / (ref.b[i] ?? NaN) - 1)).toBeLessThan(1e-6));
    section.a.forEach((v, i) => expect(v).toBeCloseTo(ref.a[i] ?? NaN, 12));
  });

  it('with "auto" fraction bits reports a zero numerator and a pole pushed onto the unit circle', () => {
    const q = quantizeSections([section], { ...fx18, coefficientFractionBits: 'auto' });
    // a1 ≈ −1.99991 needs the range [−2, 2): 18 − 2 = 16 fraction bits, LSB 2^−16 ≈ 1.5e-5.
    expect(q.format.fractionBits).toBe(16);
    // b0 ≈ 9.9e-10 is 6.5e-5 LSB: rounds to 0, as do b1, b2.
    const s = q.sections[0]!;
    expect(s.numeratorZero).toBe(true);
    // Expected codes from first principles: round(a·2^16).
    const a1Code = Math.round(section.a[1] * 2 ** 16);
    const a2Code = Math.round(section.a[2] * 2 ** 16);
    expect(s.codes.a1).toBe(a1Code);
    expect(s.codes.a2).toBe(a2Code);
    // A(1) = 2^16 + a1 + a2 in codes: zero means a pole exactly at z = 1 (OS3 Sec. 6.8 triangle).
    const expectOnCircle = 2 ** 16 + a1Code + a2Code === 0;
    expect(expectOnCircle).toBe(true);
    expect(s.stability).toBe('on-circle');
    expect(q.stable).toBe(false);
    expect(s.poleRadius).toBeCloseTo(1, 12);
    expect(q.maxDeviationDb).toBeNull();
    const kinds = q.traps.map((t) => t.kind);
    expect(kinds).toContain('numerator-zero');
    expect(kinds).toContain('pole-on-circle');
    expect(q.traps.find((t) => t.kind === 'pole-on-circle')!.message).toMatch(/unit circle/);
  });

  it('with 17 fraction bits reports that a1 overflows its word', () => {
    const q = quantizeSections([section], { ...fx18, coefficientFractionBits: 17 });
    // Range of Q(18, 17) is [−1, 1 − 2^−17]; a1 ≈ −2 does not fit and saturates to −1.
    const trap = q.traps.find((t) => t.kind === 'coefficient-overflow');
    expect(trap?.coefficient).toBe('a1');
    expect(q.sections[0]!.codes.a1).toBe(-(2 ** 17));
    expect(q.traps.map((t) => t.kind)).toContain('numerator-zero');
  });

  it('with truncation (toward −∞) pushes the pole outside the unit circle', () => {
    const q = quantizeSections([section], { ...fx18, rounding: 'truncate', coefficientFractionBits: 'auto' });
    // Codes from first principles: floor(a·2^16) (IEEE754 roundTowardNegative); A(1) < 0 means a real
    // pole beyond z = 1 (OS3 Sec. 6.8 stability triangle).
    const a1Code = Math.floor(section.a[1] * 2 ** 16);
    const a2Code = Math.floor(section.a[2] * 2 ** 16);
    expect(2 ** 16 + a1Code + a2Code).toBeLessThan(0);
    const s = q.sections[0]!;
    expect([s.codes.a1, s.codes.a2]).toEqual([a1Code, a2Code]);
    expect(s.stability).toBe('outside');
    expect(s.poleRadius).toBeGreaterThan(1);
    expect(q.traps.find((t) => t.kind === 'pole-outside-circle')?.message).toMatch(/outside the unit circle/);
  });

  it('a 100 Hz section at 1 MHz keeps its poles inside with enough bits (32-bit word)', () => {
    const q = quantizeSections([butterworth2(100, 1e6)], { coefficientBits: 32, coefficientFractionBits: 'auto', rounding: 'nearest', overflow: 'saturate' });
    expect(q.stable).toBe(true);
    expect(q.traps).toEqual([]);
    expect(q.maxDeviationDb!).toBeLessThan(0.05);
  });

  it('keeps the intended integrator of a PI section exact and calls it stable', () => {
    // PI by bilinear: F(z) = (b0 + b1 z^−1)/(1 − z^−1); the pole at z = 1 is intended (type 2).
    const pi: Sos = { b: [0.3, -0.29, 0], a: [1, -1, 0] };
    const q = quantizeSections([pi], { ...fx18, coefficientFractionBits: 'auto' });
    expect(q.sections[0]!.stability).toBe('integrator');
    expect(q.stable).toBe(true);
  });
});

describe('pole radius of a section', () => {
  it('matches numpy.roots on random sections, real and complex poles', () => {
    // numpy.roots (companion-matrix eigenvalues) as the reference.
    const pairs: [number, number][] = [];
    for (let i = 0; i < 60; i++) pairs.push([Math.sin(i * 1.7) * 2.2, Math.cos(i * 0.9) * 1.1]);
    pairs.push([-1.99991114, 0.99991115], [-2, 1], [0.5, 0], [0, 0.25]);
    const ref = python<number[]>(`import numpy as np\nout = [float(max(abs(np.roots([1, a1, a2])))) for a1, a2 in data]`, pairs);
    pairs.forEach(([a1, a2], i) => expect(sectionPoleRadius(a1, a2)).toBeCloseTo(ref[i] ?? NaN, 7));
  });

  it('reports quantised radius equal to the closed form of the quantised codes', () => {
    const q = quantizeSections([butterworth2(1000, 48000)], { ...fx18, coefficientFractionBits: 'auto' });
    const s = q.sections[0]!;
    // Complex poles: r = √a2 (a2 = r², OS3 Sec. 6.8).
    expect(s.poleRadius).toBeCloseTo(Math.sqrt(s.codes.a2 / 2 ** q.format.fractionBits), 14);
    expect(s.stability).toBe('stable');
  });
});
