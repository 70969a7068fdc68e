/**
 * Closed-loop polynomials of the loop (DESIGN.md conventions).
 * Analog: L = K·N(s)/(s·D(s)) ⇒ H = K·N/(s·D + K·N), E = s·D/(s·D + K·N).
 * Discrete: L = K·T·z⁻¹·B(z⁻¹)/((1 − z⁻¹)·A(z⁻¹)) ⇒ H = K·T·z⁻¹·B/char, E = (1 − z⁻¹)·A/char,
 * char = (1 − z⁻¹)·A + K·T·z⁻¹·B.
 */
import type { AnalogTf, DigitalTf } from '../types/filter.ts';
import { polyAddAscending, polyAddDescending, polyMul } from '../filters/polynomial.ts';

/** Closed-loop H(s) and E(s) of the analog loop with filter F(s) and loop gain K (1/s). */
export function analogClosedLoop(f: AnalogTf, kRadPerS: number): { h: AnalogTf; e: AnalogTf } {
  const sD = polyMul(f.den, [1, 0]);
  const kN = f.num.map((x) => x * kRadPerS);
  const den = polyAddDescending(sD, kN);
  return { h: { num: kN, den }, e: { num: sD, den } };
}

/** Closed-loop H(z) and E(z) (b/a, a[0] = 1) of the discrete loop with filter F(z) at sampleRateHz. */
export function discreteClosedLoop(f: DigitalTf, kRadPerS: number, sampleRateHz: number): { h: DigitalTf; e: DigitalTf } {
  const kt = kRadPerS / sampleRateHz;
  const eNum = polyMul([1, -1], f.a);
  const hNum = [0, ...f.b.map((x) => x * kt)];
  const char = polyAddAscending(eNum, hNum);
  const a0 = char[0]!;
  const norm = (p: readonly number[]) => p.map((x) => x / a0);
  return { h: { b: norm(hNum), a: norm(char) }, e: { b: norm(eNum), a: norm(char) } };
}
