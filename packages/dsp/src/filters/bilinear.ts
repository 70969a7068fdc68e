/**
 * Bilinear transform (OS3 Sec. 7.2 (memory); PM4 Sec. 10.3 (memory)):
 *   s = c·(1 − z⁻¹)/(1 + z⁻¹),  c = 2·fs,
 * and with prewarping at ωp = 2π·prewarpHz, c = ωp / tan(ωp/(2·fs)), so the analog and digital
 * responses agree exactly at prewarpHz (warping Ω = c·tan(ωT/2)). SciPy's digital `butter` prewarps its
 * cutoff the same way.
 *
 * A polynomial of degree ≤ n in s becomes, after multiplying through by (1 + z⁻¹)ⁿ, a polynomial of
 * degree n in z⁻¹; numerator and denominator share n = max(deg N, deg D). Results are normalised to
 * a[0] = 1.
 */
import type { AnalogTf, DigitalTf, Sos } from '../types/filter.ts';
import { polyMul, polyAddAscending, trimLeadingZeros } from './polynomial.ts';

/** The constant c of s = c(1 − z⁻¹)/(1 + z⁻¹), prewarped at prewarpHz when given. */
export function bilinearConstant(sampleRateHz: number, prewarpHz: number | null = null): number {
  if (prewarpHz === null) return 2 * sampleRateHz;
  const wp = 2 * Math.PI * prewarpHz;
  return wp / Math.tan(wp / (2 * sampleRateHz));
}

/** Binomial expansion of (1 − w)^i (1 + w)^(n−i) in ascending powers of w = z⁻¹. */
function bilinearBasis(i: number, n: number): number[] {
  let p = [1];
  for (let k = 0; k < i; k++) p = polyMul(p, [1, -1]);
  for (let k = i; k < n; k++) p = polyMul(p, [1, 1]);
  return p;
}

/** Map a descending-power s-polynomial of degree ≤ n to an ascending z⁻¹ polynomial of degree n. */
function mapPolynomial(p: readonly number[], n: number, c: number): number[] {
  const deg = p.length - 1;
  let out: number[] = new Array<number>(n + 1).fill(0);
  for (let j = 0; j <= deg; j++) {
    const power = deg - j; // coefficient p[j] multiplies s^power
    const term = bilinearBasis(power, n).map((x) => x * p[j]! * c ** power);
    out = polyAddAscending(out, term);
  }
  return out;
}

/** Bilinear transform of any analog transfer function (SciPy `bilinear` with fs = c/2). */
export function bilinearTf(tf: AnalogTf, sampleRateHz: number, prewarpHz: number | null = null): DigitalTf {
  const c = bilinearConstant(sampleRateHz, prewarpHz);
  const num = trimLeadingZeros(tf.num);
  const den = trimLeadingZeros(tf.den);
  const n = Math.max(num.length, den.length) - 1;
  const b = mapPolynomial(num, n, c);
  const a = mapPolynomial(den, n, c);
  const a0 = a[0]!;
  if (a0 === 0) throw new RangeError('bilinear: the analog denominator has a pole at s = c (a0 = 0)');
  return { b: b.map((x) => x / a0), a: a.map((x) => x / a0) };
}

/** Bilinear transform of one analog section of order ≤ 2 into a second-order section (zero-padded). */
export function bilinearSection(tf: AnalogTf, sampleRateHz: number, prewarpHz: number | null = null): Sos {
  const d = bilinearTf(tf, sampleRateHz, prewarpHz);
  if (d.a.length > 3 || d.b.length > 3) throw new RangeError('bilinearSection: section order exceeds 2');
  return { b: pad3(d.b), a: pad3(d.a) };
}

function pad3(p: readonly number[]): [number, number, number] {
  return [p[0] ?? 0, p[1] ?? 0, p[2] ?? 0];
}
