/**
 * Real polynomials as coefficient arrays. Convolution does not care about the ordering; evaluation
 * and addition do: analog polynomials are stored in descending powers of s, digital ones in ascending
 * powers of z^-1 (see types/filter.ts).
 */
import type { Complex } from './complex.ts';

/** Product of two polynomials (convolution of their coefficients; either ordering). */
export function polyMul(p: readonly number[], q: readonly number[]): number[] {
  const out = new Array<number>(p.length + q.length - 1).fill(0);
  for (let i = 0; i < p.length; i++) for (let j = 0; j < q.length; j++) out[i + j]! += p[i]! * q[j]!;
  return out;
}

/** Sum of two polynomials stored in descending powers (aligned at the constant term, the end). */
export function polyAddDescending(p: readonly number[], q: readonly number[]): number[] {
  const n = Math.max(p.length, q.length);
  const out = new Array<number>(n).fill(0);
  for (let i = 0; i < p.length; i++) out[n - p.length + i]! += p[i]!;
  for (let i = 0; i < q.length; i++) out[n - q.length + i]! += q[i]!;
  return out;
}

/** Sum of two polynomials stored in ascending powers (aligned at index 0). */
export function polyAddAscending(p: readonly number[], q: readonly number[]): number[] {
  const out = new Array<number>(Math.max(p.length, q.length)).fill(0);
  p.forEach((c, i) => (out[i]! += c));
  q.forEach((c, i) => (out[i]! += c));
  return out;
}

/** Evaluation of an ascending-power polynomial c0 + c1·w + c2·w² + … at the complex point w. */
export function polyvalAscending(p: readonly number[], w: Complex): Complex {
  let re = 0;
  let im = 0;
  for (let i = p.length - 1; i >= 0; i--) {
    const r = re * w.re - im * w.im + p[i]!;
    im = re * w.im + im * w.re;
    re = r;
  }
  return { re, im };
}

/** Drop leading zero coefficients of a descending-power polynomial (keeps at least one). */
export function trimLeadingZeros(p: readonly number[]): number[] {
  let i = 0;
  while (i < p.length - 1 && p[i] === 0) i++;
  return p.slice(i);
}
