/**
 * Butterworth designs and the bilinear transform against SciPy, live (test/reference/scipy_reference.py):
 * scipy.signal.butter (analog, and digital with fs — which prewarps at the cutoff), bilinear with and
 * without prewarp (fs_eff = c/2), freqz. Seeded random cases.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { analogButterworthSections } from '../../src/filters/butterworth.ts';
import { bilinearSection, bilinearTf } from '../../src/filters/bilinear.ts';
import { cascadeAnalog, sosToTf } from '../../src/filters/sections.ts';
import { digitalResponse, toDb } from '../../src/analysis/response.ts';
import { runScipyReference } from '../reference/scipy.ts';
import { logUniform, mulberry32, uniform } from '../reference/random.ts';

interface ButterCase {
  order: number;
  cutoffHz: number;
  sampleRateHz: number;
  freqHz: number[];
}
interface BilinearCase {
  num: number[];
  den: number[];
  sampleRateHz: number;
  prewarpHz: number | null;
}
interface ButterRef {
  analogNum: number[];
  analogDen: number[];
  b: number[];
  a: number[];
  magDb: number[];
  phaseDeg: number[];
  cutoffDb: number;
}

const rnd = mulberry32(7031);
const butterCases: ButterCase[] = Array.from({ length: 80 }, () => {
  const sampleRateHz = logUniform(rnd, 1e3, 1e8);
  const cutoffHz = sampleRateHz * logUniform(rnd, 1e-3, 0.3);
  return {
    order: 1 + Math.floor(rnd() * 4),
    cutoffHz,
    sampleRateHz,
    freqHz: [cutoffHz / 7, cutoffHz / 2, cutoffHz * 1.3, Math.min(cutoffHz * 3, sampleRateHz * 0.49)],
  };
});
const bilinearCases: BilinearCase[] = Array.from({ length: 80 }, () => {
  const sampleRateHz = logUniform(rnd, 1e3, 1e7);
  const w = 2 * Math.PI * sampleRateHz * logUniform(rnd, 1e-3, 0.1);
  const degDen = 1 + Math.floor(rnd() * 3);
  const degNum = Math.floor(rnd() * (degDen + 1));
  // Random stable-looking polynomials with roots near w: coefficients scaled by powers of 1/w.
  const poly = (deg: number) => Array.from({ length: deg + 1 }, (_, i) => uniform(rnd, 0.2, 2) / w ** (deg - i));
  return { num: poly(degNum), den: poly(degDen), sampleRateHz, prewarpHz: rnd() < 0.5 ? null : sampleRateHz * logUniform(rnd, 1e-3, 0.3) };
});

let ref: { butter: ButterRef[]; bilinear: { b: number[]; a: number[] }[] };
beforeAll(() => {
  ref = runScipyReference({ butter: butterCases, bilinear: bilinearCases });
}, 60_000);

/** Coefficient-wise agreement relative to the largest coefficient of the reference. */
function expectCoefficientsClose(actual: readonly number[], expected: readonly number[], rel: number, what: string): void {
  expect(actual.length, `${what} length`).toBe(expected.length);
  const scale = Math.max(...expected.map(Math.abs));
  actual.forEach((x, i) => expect(Math.abs(x - expected[i]!) / scale, `${what}[${i}]: ${x} vs ${expected[i]}`).toBeLessThan(rel));
}

describe('analog Butterworth matches scipy.signal.butter(analog=True)', () => {
  it.each(butterCases.map((c, i) => [i, c.order, c.cutoffHz] as const))('case %i: order %i at %f Hz', (i) => {
    const c = butterCases[i]!;
    const tf = cascadeAnalog(analogButterworthSections(c.order, c.cutoffHz));
    const r = ref.butter[i]!;
    expectCoefficientsClose(tf.den, r.analogDen, 1e-12, 'den');
    expectCoefficientsClose(tf.num, r.analogNum, 1e-12, 'num');
  });
});

describe('digital Butterworth (bilinear per section, prewarped at the cutoff) matches scipy.signal.butter(fs=…)', () => {
  it.each(butterCases.map((c, i) => [i, c.order, c.cutoffHz, c.sampleRateHz] as const))(
    'case %i: order %i at %f Hz, fs %f Hz',
    (i) => {
      const c = butterCases[i]!;
      const sections = analogButterworthSections(c.order, c.cutoffHz).map((s) => bilinearSection(s, c.sampleRateHz, c.cutoffHz));
      const r = ref.butter[i]!;
      // Normalised b/a: the product of sections against SciPy's zpk→tf (both a[0] = 1).
      const tf = sosToTf(sections);
      // b/a of a narrow design is ill-conditioned on both sides (poles crowd z = 1): 1e-8 of the largest.
      expectCoefficientsClose(tf.a, r.a, 1e-8, 'a');
      expectCoefficientsClose(tf.b, r.b, 1e-8, 'b');
      c.freqHz.forEach((f, j) => {
        const h = digitalResponse(sections, f, c.sampleRateHz);
        expect(Math.abs(toDb(h) - r.magDb[j]!), `dB at ${f}`).toBeLessThan(1e-8);
      });
      // Bu30/OS3: a prewarped digital Butterworth is −3.01 dB exactly at the cutoff.
      expect(Math.abs(toDb(digitalResponse(sections, c.cutoffHz, c.sampleRateHz)) - r.cutoffDb)).toBeLessThan(1e-9);
    },
  );
});

describe('bilinear transform matches scipy.signal.bilinear (prewarp as fs_eff = c/2)', () => {
  it.each(bilinearCases.map((c, i) => [i, c.den.length - 1, c.prewarpHz === null ? 'no prewarp' : 'prewarp'] as const))(
    'case %i: order %i, %s',
    (i) => {
      const c = bilinearCases[i]!;
      const d = bilinearTf({ num: c.num, den: c.den }, c.sampleRateHz, c.prewarpHz);
      const r = ref.bilinear[i]!;
      expectCoefficientsClose(d.a, r.a, 1e-10, 'a');
      expectCoefficientsClose(d.b, r.b.length < d.b.length ? [...r.b, ...new Array(d.b.length - r.b.length).fill(0)] : r.b, 1e-10, 'b');
    },
  );
});
