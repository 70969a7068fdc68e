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

