/**
 * Poles of one second-order section A(z) = 1 + a1·z^−1 + a2·z^−2 (OS3 Sec. 6.8, memory).
 * With complex poles at r·e^±jθ, a1 = −2r·cos θ and a2 = r²; the section is stable exactly when
 * A(1) = 1 + a1 + a2 > 0, A(−1) = 1 − a1 + a2 > 0 and |a2| < 1 (the stability triangle).
 */
import type { SectionStability } from '../types/fixed.ts';

/** Largest |pole| of z² + a1·z + a2, by the closed-form quadratic in its cancellation-free form. */
export function sectionPoleRadius(a1: number, a2: number): number {
  const disc = a1 * a1 - 4 * a2;
  if (disc < 0) return Math.sqrt(a2);
  // q = −(a1 + sign(a1)·√disc)/2 avoids subtracting nearly equal numbers; the roots are q and a2/q.
  const q = -(a1 + (a1 >= 0 ? 1 : -1) * Math.sqrt(disc)) / 2;
  if (q === 0) return 0;
  return Math.max(Math.abs(q), Math.abs(a2 / q));
}

/**
 * Exact stability class from integer codes a1, a2 at F fraction bits (a0 = 2^F): the triangle test
 * in integers has no rounding, so a pole exactly on the circle is reported as such.
 * `integratorByDesign`: the unquantised section has A(1) = 0 (an intended pole at z = 1, as in PI).
 */
export function sectionStabilityFromCodes(
  a1Code: number,
  a2Code: number,
  fractionBits: number,
  integratorByDesign: boolean,
): SectionStability {
  const one = 2 ** fractionBits;
  const atOne = one + a1Code + a2Code;
  const atMinusOne = one - a1Code + a2Code;
  const a2Abs = Math.abs(a2Code);
  if (atOne < 0 || atMinusOne < 0 || a2Abs > one) return 'outside';
  if (atOne > 0 && atMinusOne > 0 && a2Abs < one) return 'stable';
  // On the boundary: only a single pole at z = 1 with the other inside is the intended integrator.
  const otherInside = atMinusOne > 0 && a2Abs < one;
  return integratorByDesign && atOne === 0 && otherInside ? 'integrator' : 'on-circle';
}

/** True when the real-valued section has a pole at z = 1 (A(1) = 0 up to rounding of its design). */
export function hasIntegratorPole(a1: number, a2: number): boolean {
  return Math.abs(1 + a1 + a2) <= 1e-12 * (1 + Math.abs(a1) + Math.abs(a2));
}
