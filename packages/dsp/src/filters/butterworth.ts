/**
 * Analog Butterworth low-pass prototypes (Bu30; OS3 App. B (memory); WT4 tables).
 *
 * |H(jΩ)|² = 1/(1 + (Ω/Ωc)^(2N)); the N poles lie on a circle of radius Ωc in the left half-plane at
 * p_k = Ωc·exp(jπ(2k + N + 1)/(2N)), k = 0…N−1. Unit DC gain. Returned as cascaded real sections of
 * order ≤ 2 (one first-order section when N is odd) so that the digital design never passes through a
 * high-order b/a (SciPy's filter-design docs make the same recommendation).
 */
import type { AnalogTf } from '../types/filter.ts';
import { polyMul } from './polynomial.ts';

/** Unit-DC-gain analog Butterworth sections at cutoff ωc = 2π·cutoffHz, each of order ≤ 2. */
export function analogButterworthSections(order: number, cutoffHz: number): AnalogTf[] {
  assertOrder(order);
  const wc = 2 * Math.PI * cutoffHz;
  const sections: AnalogTf[] = [];
  for (let k = 0; k < Math.floor(order / 2); k++) {
    // Conjugate pair at angle θ from the negative real axis: s² + 2·sin(φ)·Ωc·s + Ωc², φ = π(2k+1)/(2N).
    const damping2 = 2 * Math.sin((Math.PI * (2 * k + 1)) / (2 * order));
    sections.push({ num: [wc * wc], den: [1, damping2 * wc, wc * wc] });
  }
  if (order % 2 === 1) sections.push({ num: [wc], den: [1, wc] });
  return sections;
}

/** Normalised (Ωc = 1) Butterworth denominator polynomial, descending powers (WT4 table). */
export function normalisedButterworthPolynomial(order: number): number[] {
  return analogButterworthSections(order, 1 / (2 * Math.PI)).reduce<number[]>((acc, s) => polyMul(acc, s.den), [1]);
}

function assertOrder(order: number): void {
  if (!Number.isInteger(order) || order < 1 || order > 8) {
    throw new RangeError(`Butterworth order must be an integer 1..8, got ${order}`);
  }
}
