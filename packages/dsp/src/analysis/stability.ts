/**
 * Stability of closed-loop characteristic polynomials without root finding.
 * - Discrete: Schur–Cohn test by the Levinson step-down recursion — all roots of A(z⁻¹) = 1 + a1 z⁻¹ + …
 *   lie inside the unit circle iff every reflection coefficient has |k_m| < 1 (PM4 Sec. 3.6.7 and
 *   Sec. 9.3 (memory)).
 * - Analog: the bilinear transform maps the open left half-plane onto the open unit disc (OS3 Sec. 7.2
 *   (memory)), so a polynomial in s is Hurwitz iff its bilinear image passes the Schur–Cohn test.
 */
import { bilinearTf } from '../filters/bilinear.ts';

/** True when every root of the ascending z⁻¹ polynomial a (a[0] ≠ 0) is strictly inside |z| = 1. */
export function schurCohnStable(a: readonly number[]): boolean {
  let p = trimTrailing(a).map((x) => x / a[0]!);
  while (p.length > 1) {
    const m = p.length - 1;
    const k = p[m]!;
    if (!(Math.abs(k) < 1)) return false;
    const d = 1 - k * k;
    const next = new Array<number>(m);
    for (let i = 0; i < m; i++) next[i] = (p[i]! - k * p[m - i]!) / d;
    p = next;
  }
  return true;
}

/** True when every root of the descending s polynomial p has a negative real part. */
export function hurwitzStable(p: readonly number[], scaleRadPerS: number): boolean {
  // bilinear with c = 2·fs; choosing c near the loop's own frequencies keeps the mapping well conditioned.
  const d = bilinearTf({ num: [1], den: p }, scaleRadPerS / 2, null);
  return schurCohnStable(d.a);
}

function trimTrailing(p: readonly number[]): number[] {
  let n = p.length;
  while (n > 1 && p[n - 1] === 0) n--;
  return p.slice(0, n);
}
