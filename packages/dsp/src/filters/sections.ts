/** Conversions between cascaded sections and single transfer functions (OS3 Sec. 6.3 (memory)). */
import type { AnalogTf, DigitalTf, Sos } from '../types/filter.ts';
import { polyMul } from './polynomial.ts';

/** Product of analog sections as one N(s)/D(s). */
export function cascadeAnalog(sections: readonly AnalogTf[]): AnalogTf {
  return sections.reduce<AnalogTf>((acc, s) => ({ num: polyMul(acc.num, s.num), den: polyMul(acc.den, s.den) }), {
    num: [1],
    den: [1],
  });
}

/** Product of second-order sections as one B(z)/A(z), trailing zero padding removed. */
export function sosToTf(sections: readonly Sos[]): DigitalTf {
  const tf = sections.reduce<{ b: number[]; a: number[] }>(
    (acc, s) => ({ b: polyMul(acc.b, s.b), a: polyMul(acc.a, s.a) }),
    { b: [1], a: [1] },
  );
  return { b: trimTrailingZeros(tf.b), a: trimTrailingZeros(tf.a) };
}

function trimTrailingZeros(p: readonly number[]): number[] {
  let n = p.length;
  while (n > 1 && p[n - 1] === 0) n--;
  return p.slice(0, n);
}

/** One section's numerator and denominator values at a frequency: N = nr + j·ni, D = dr + j·di. */
export interface SectionValue {
  nr: number;
  ni: number;
  dr: number;
  di: number;
}

/** cos and sin of ω and 2ω, computed once per frequency for every section. */
export interface UnitCirclePoint {
  readonly c1: number;
  readonly s1: number;
  readonly c2: number;
  readonly s2: number;
}

export function unitCirclePoint(omega: number): UnitCirclePoint {
  return { c1: Math.cos(omega), s1: Math.sin(omega), c2: Math.cos(2 * omega), s2: Math.sin(2 * omega) };
}

/**
 * The one evaluation of a digital section at e^{jω}: P(e^{−jω}) = p0 + p1·e^{−jω} + p2·e^{−j2ω} for its
 * numerator and denominator, written into `out` (a caller's reused scratch: this sits in the innermost
 * loop of every grid, where allocation would dominate). The analysis multiplies the quotients
 * (analysis/response.ts), the quantiser the squared magnitudes (fixed/sosResponse.ts).
 */
export function sectionOnUnitCircle({ b, a }: Sos, p: UnitCirclePoint, out: SectionValue): void {
  out.nr = b[0] + b[1] * p.c1 + b[2] * p.c2;
  out.ni = -(b[1] * p.s1 + b[2] * p.s2);
  out.dr = a[0] + a[1] * p.c1 + a[2] * p.c2;
  out.di = -(a[1] * p.s1 + a[2] * p.s2);
}

/** F(0) as a product over sections; null when a section has a pole at s = 0 (PI). */
export function analogDcGain(sections: readonly AnalogTf[]): number | null {
  let g = 1;
  for (const s of sections) {
    const d = s.den[s.den.length - 1]!;
    if (d === 0) return null;
    g *= s.num[s.num.length - 1]! / d;
  }
  return g;
}

