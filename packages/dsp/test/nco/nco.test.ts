import { describe, expect, it } from 'vitest';
import { ncoTuning } from '../../src/nco/tuningWord.ts';
import { sineTable, sineFullScale } from '../../src/nco/sineTable.ts';
import { ncoSpectralEstimates } from '../../src/nco/spectralEstimates.ts';
import { ncoControlScaling } from '../../src/nco/controlScaling.ts';

describe('ncoTuning (TRG71: M = round(f·2^N/fs), f = M·fs/2^N)', () => {
  it('works 10.7 MHz at 100 MHz with a 32-bit accumulator as by hand', () => {
    // f·2^N/fs = 10.7e6 · 4294967296 / 1e8 = 0.107 · 4294967296 = 459561500.672 → M = 459561501.
    // actual = 459561501 · 1e8 / 2^32 = 10700000.0076 Hz; error = 0.328 LSB · 0.02328 Hz = 0.00764 Hz.
    // resolution = 1e8 / 2^32 = 0.023283064365386963 Hz.
    const t = ncoTuning(10.7e6, 100e6, 32);
    expect(t.tuningWordDecimal).toBe('459561501');
    expect(t.tuningWordLo).toBe(459561501);
    expect(t.tuningWordHi).toBe(0);
    expect(t.resolutionHz).toBeCloseTo(0.023283064365386963, 15);
    expect(t.errorHz).toBeCloseTo((459561501 - 459561500.672) * (1e8 / 2 ** 32), 6);
    expect(t.actualHz).toBeCloseTo(10.7e6 + t.errorHz, 6);
    expect(t.errorPpm).toBeCloseTo((t.errorHz / 10.7e6) * 1e6, 9);
  });

  it('is exact for 48- and 64-bit accumulators (checked with BigInt)', () => {
    for (const [f, fs, n] of [[10.7e6, 100e6, 48], [10.7e6, 100e6, 64], [50, 10e3, 64], [40e3, 1e6, 56]] as const) {
      const t = ncoTuning(f, fs, n);
      // f and fs here are integers, so M = round(f·2^N/fs) is integer division with a half-up rule.
      const num = BigInt(f) * (1n << BigInt(n));
      const den = BigInt(fs);
      const m = (2n * num + den) / (2n * den);
      expect(t.tuningWordDecimal).toBe(m.toString());
      expect(BigInt(t.tuningWordHi) * 2n ** 32n + BigInt(t.tuningWordLo)).toBe(m);
      // error = (M·fs − f·2^N)/2^N, exact rational → compare with 1e-9 relative.
      const errHz = Number(m * den - num) / 2 ** n;
      expect(t.errorHz).toBeCloseTo(errHz, 15);
      expect(Math.abs(t.errorHz)).toBeLessThanOrEqual(t.resolutionHz / 2);
    }
  });

  it('gives the exact error −f when the word rounds to 0, and refuses a frequency whose error has no double', () => {
    // M = round(1e-10·2^32/1) = 0: the accumulator stands still, so the error is exactly −f (by hand).
    const still = ncoTuning(1e-10, 1, 32);
    expect(still.tuningWordDecimal).toBe('0');
    expect(still.errorHz).toBe(-1e-10);
    // At 1e-300 Hz the word is 0 again and the error is −1e-300 exactly, but as a reduced fraction its
    // denominator is 2^1049 (Python: Fraction(1e-300)), past the largest double: an error, not a number.
    expect(() => ncoTuning(1e-300, 1, 64)).toThrow(/centerHz/);
  });

  it('rejects a centre frequency at or above Nyquist, naming the field', () => {
    expect(() => ncoTuning(60e6, 100e6, 32)).toThrow(/centerHz/);
    expect(() => ncoTuning(1e6, 100e6, 65)).toThrow(/nco.accumulatorBits/);
  });
});

describe('sineTable', () => {
  it('has 2^P entries, max code 2^(B−1) − 1, exact odd and half-wave symmetry', () => {
    const p = 10;
    const b = 14;
    const t = sineTable(p, b);
    const n = 2 ** p;
    expect(t.length).toBe(n);
    expect(Math.max(...t)).toBe(2 ** (b - 1) - 1);
    expect(Math.min(...t)).toBe(-(2 ** (b - 1) - 1));
    expect(t[n / 4]).toBe(sineFullScale(b));
    for (let k = 1; k < n; k++) {
      expect(t[n - k]! + 0).toBe(0 - t[k]!); // sin(−x) = −sin(x)
      expect(t[(k + n / 2) % n]! + 0).toBe(0 - t[k]!); // sin(x + π) = −sin(x)
    }
    // Each code within half an LSB of the ideal (nearest rounding).
    for (let k = 0; k < n; k++) expect(Math.abs(t[k]! - 8191 * Math.sin((2 * Math.PI * k) / n))).toBeLessThanOrEqual(0.5);
  });

  it('gives every caller an array of its own: writing one changes no later table of the same widths', () => {
    // Tables are kept per widths and copied out; a plan may hand its table on (common practice, no source).
    const first = sineTable(8, 12);
    const codes = Array.from(first);
    first.fill(0);
    const second = sineTable(8, 12);
    expect(second).not.toBe(first);
    // Same rule as above: each code within half an LSB of 2047·sin(2πk/256).
    second.forEach((c, k) => expect(Math.abs(c - 2047 * Math.sin((2 * Math.PI * k) / 256))).toBeLessThanOrEqual(0.5));
    expect(Array.from(second)).toEqual(codes);
  });
});

describe('ncoSpectralEstimates', () => {
  it('gives the NS87 spur and Be48 SNR numbers', () => {
    // NS87: 12 address bits → −6.02·12 = −72.24 dBc, worst case −72.24 + 3.92 = −68.32 dBc.
    // Be48: 16-bit amplitude → 6.02·16 + 1.76 = 98.08 dB.
    const e = ncoSpectralEstimates(32, 12, 16);
    expect(e.phaseTruncationSpurDbc).toBeCloseTo(-72.24, 10);
    expect(e.phaseTruncationSpurWorstDbc).toBeCloseTo(-68.32, 10);
    expect(e.amplitudeSnrDb).toBeCloseTo(98.08, 10);
    expect(ncoSpectralEstimates(12, 12, 16).phaseTruncationSpurDbc).toBeNull();
  });
});

describe('ncoControlScaling', () => {
  it('scales a filter-output code to accumulator LSBs per sample within the gain word precision', () => {
    // 2000 Hz/unit at 1 MHz, N = 32, D = 16: K = 2000·2^32/(1e6·2^15) = 262.144 LSB per output LSB.
    const s = ncoControlScaling({ gainHzPerUnit: 2000, sampleRateHz: 1e6, accumulatorBits: 32, dataBits: 16, coefficientBits: 18, rounding: 'nearest' });
    expect(s.idealScale).toBeCloseTo(262.144, 9);
    expect(s.gainCode).toBeLessThanOrEqual(2 ** 17 - 1);
    expect(s.gainCode).toBeGreaterThanOrEqual(2 ** 16);
    expect(Math.abs(s.quantizedScale - s.idealScale)).toBeLessThanOrEqual(2 ** -s.gainShift / 2);
    expect(s.actualGainHzPerUnit).toBeCloseTo(2000, 1);
  });

  it('uses a left shift for very large scales (64-bit accumulator)', () => {
    const s = ncoControlScaling({ gainHzPerUnit: 1e5, sampleRateHz: 100e6, accumulatorBits: 64, dataBits: 16, coefficientBits: 18, rounding: 'nearest' });
    expect(s.gainShift).toBeLessThan(0);
    expect(s.quantizedScale / s.idealScale).toBeCloseTo(1, 4);
  });
});
