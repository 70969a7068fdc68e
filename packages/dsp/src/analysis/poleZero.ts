/**
 * Poles and zeros of one second-order section H(z) = (b0 + b1·z⁻¹ + b2·z⁻²)/(1 + a1·z⁻¹ + a2·z⁻²),
 * for the z-plane plot: the roots of b0·z² + b1·z + b2 and of z² + a1·z + a2 (OS3 Sec. 6.8, memory).
 * A first-order section padded with b2 = a2 = 0 has one pole and one zero; the padding's pair at
 * z = 0 cancels and is not reported.
 */
import type { Complex } from '../filters/complex.ts';
import type { Sos } from '../types/filter.ts';

export interface SectionPolesZeros {
  readonly poles: readonly Complex[];
  readonly zeros: readonly Complex[];
}

/** Roots of c0·x² + c1·x + c2 (real coefficients), with the cancellation-free form of the quadratic formula. */
export function quadraticRoots(c0: number, c1: number, c2: number): Complex[] {
  if (c0 === 0) return c1 === 0 ? [] : [{ re: -c2 / c1, im: 0 }];
  const disc = c1 * c1 - 4 * c0 * c2;
  if (disc < 0) {
    const re = c1 === 0 ? 0 : -c1 / (2 * c0);
    const im = Math.sqrt(-disc) / (2 * Math.abs(c0));
    return [
      { re, im },
      { re, im: -im },
    ];
  }
  // q = −(c1 + sign(c1)·√disc)/2; the roots are q/c0 and c2/q (OS3's sectionPoleRadius uses the same form).
  const q = -(c1 + (c1 >= 0 ? 1 : -1) * Math.sqrt(disc)) / 2;
  if (q === 0) return [{ re: 0, im: 0 }, { re: 0, im: 0 }];
  return [
    { re: q / c0, im: 0 },
    { re: c2 / q, im: 0 },
  ];
}

export function sectionPolesZeros(sos: Sos): SectionPolesZeros {
  const [b0, b1, b2] = sos.b;
  const [, a1, a2] = sos.a;
  if (b2 === 0 && a2 === 0) return { poles: quadraticRoots(0, 1, a1), zeros: quadraticRoots(0, b0, b1) };
  return { poles: quadraticRoots(1, a1, a2), zeros: quadraticRoots(b0, b1, b2) };
}
