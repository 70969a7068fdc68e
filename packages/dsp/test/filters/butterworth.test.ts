/**
 * Butterworth prototypes against the normalised polynomial table (WT4; values from memory, they are the
 * standard ones) and the defining properties (Bu30): −3.01 dB and −45°·N at the cutoff for every
 * order, also for the prewarped digital design (OS3: prewarping makes the bilinear map exact at fc).
 */
import { describe, expect, it } from 'vitest';
import { analogButterworthSections, normalisedButterworthPolynomial } from '../../src/filters/butterworth.ts';
import { bilinearSection } from '../../src/filters/bilinear.ts';
import { analogResponse, digitalResponse, toDb } from '../../src/analysis/response.ts';

// WT4 normalised Butterworth denominators, descending powers (memory).
const TABLE: Record<number, number[]> = {
  1: [1, 1],
  2: [1, 1.4142, 1],
  3: [1, 2, 2, 1],
  4: [1, 2.6131, 3.4142, 2.6131, 1],
};

const unwrappedPhaseDeg = (values: { re: number; im: number }[]) =>
  values.reduce<number[]>((acc, v, i) => {
    const p = (Math.atan2(v.im, v.re) * 180) / Math.PI;
    if (i === 0) return [p];
    const prev = acc[i - 1]!;
    return [...acc, p + 360 * Math.round((prev - p) / 360)];
  }, []);

describe('normalised Butterworth polynomials (WT4 table)', () => {
  it.each([1, 2, 3, 4])('order %i matches the table to its 4 decimals', (n) => {
    const p = normalisedButterworthPolynomial(n);
    expect(p).toHaveLength(n + 1);
    p.forEach((c, i) => expect(c).toBeCloseTo(TABLE[n]![i]!, 4));
  });
});

describe('Butterworth at the cutoff (Bu30)', () => {
  const MINUS_3_01 = 10 * Math.log10(0.5); // |H|² = 1/2 exactly: −3.0103 dB

  it.each([1, 2, 3, 4])('analog order %i: −3.01 dB and −45°·N at 1 kHz', (n) => {
    const sections = analogButterworthSections(n, 1000);
    expect(toDb(analogResponse(sections, 1000))).toBeCloseTo(MINUS_3_01, 10);
    // Phase followed continuously from DC to the cutoff.
    const path = Array.from({ length: 200 }, (_, i) => analogResponse(sections, (1000 * i) / 199));
    expect(unwrappedPhaseDeg(path).at(-1)!).toBeCloseTo(-45 * n, 8);
  });

  it.each([
    [1, 48_000, 2_000],
    [2, 48_000, 9_000],
    [3, 1e6, 240_000],
    [4, 10_000, 50],
  ])('digital order %i at fs %f Hz, prewarped at fc %f Hz: −3.01 dB and −45°·N exactly at fc', (n, fs, fc) => {
    const sections = analogButterworthSections(n, fc).map((s) => bilinearSection(s, fs, fc));
    expect(toDb(digitalResponse(sections, fc, fs))).toBeCloseTo(MINUS_3_01, 9);
    const path = Array.from({ length: 400 }, (_, i) => digitalResponse(sections, (fc * i) / 399, fs));
    expect(unwrappedPhaseDeg(path).at(-1)!).toBeCloseTo(-45 * n, 7);
  });

  it('without prewarp the digital cutoff moves (warping Ω = 2fs·tan(ωT/2), OS3 Sec. 7.2)', () => {
    const fs = 48_000;
    const fc = 9_000;
    const sections = analogButterworthSections(2, fc).map((s) => bilinearSection(s, fs, null));
    // The digital −3 dB point is where 2fs·tan(πf/fs) = 2π·fc.
    const fWarped = (fs / Math.PI) * Math.atan((2 * Math.PI * fc) / (2 * fs));
    expect(toDb(digitalResponse(sections, fWarped, fs))).toBeCloseTo(MINUS_3_01, 9);
    expect(Math.abs(toDb(digitalResponse(sections, fc, fs)) - MINUS_3_01)).toBeGreaterThan(0.5);
  });

  it.each([1, 2, 3, 4])('order %i has unit DC gain and poles on the circle of radius ωc', (n) => {
    const fc = 123;
    const wc = 2 * Math.PI * fc;
    const sections = analogButterworthSections(n, fc);
    expect(toDb(analogResponse(sections, 0))).toBeCloseTo(0, 12);
    for (const s of sections) {
      // s² + a1·s + a0 has |p|² = a0; s + a0 has |p| = a0.
      const radius = s.den.length === 3 ? Math.sqrt(s.den[2]!) : s.den[1]!;
      expect(radius / wc).toBeCloseTo(1, 12);
    }
  });
});
