/**
 * Closed-loop stability without root finding, robust for narrow-band loops whose poles crowd z = 1.
 *
 * - Analog: Routh–Hurwitz test on the characteristic polynomial (Og5 Sec. 5-6 (memory)), after scaling
 *   s by the geometric mean root magnitude so that the array stays well inside the floating range.
 * - Discrete: a high-order b/a polynomial cannot be tested reliably — its roots near z = 1 move by
 *   ε^(1/n) under rounding ε, more than their distance from the unit circle (the trap REFERENCES.md
 *   names for coefficients, OS3 Sec. 6.8). So the characteristic polynomial is built section by section
 *   in u = z − 1 (where the roots are small numbers held to full relative precision), mapped by
 *   s = u/(u + 2) = (z − 1)/(z + 1) — which takes |z| < 1 onto Re s < 0 (the bilinear map, OS3 Sec. 7.2
 *   (memory)) — and tested by Routh–Hurwitz.
 */
import type { Sos } from '../types/filter.ts';
import { polyAddDescending, polyMul } from '../filters/polynomial.ts';

/** First-column entries below this fraction of the row's scale count as zero (marginal = not stable). */
const ZERO_TOL = 1e-13;

/**
 * True when every root of the descending s polynomial p has a strictly negative real part. The Routh
 * rows are small typed arrays filled by loops: as JavaScript arrays built by map, filter and push, their
 * element kinds (small integers or doubles, depending on the coefficients) changed from call to call, and
 * the optimised code of this function was thrown away four times in the first 600 analyses.
 */
export function routhHurwitzStable(p: readonly number[]): boolean {
  const q = trimLeading(p);
  const n = q.length - 1;
  if (n < 1) return true;
  if (q[n] === 0) return false; // a root at s = 0
  // Scale s = ρ·s̃ with ρ = |q_n/q_0|^(1/n): the roots of q̃ have geometric-mean magnitude 1.
  const rho = Math.abs(q[n]! / q[0]!) ** (1 / n);
  const lead = q[0]! * rho ** n > 0 ? 1 : -1;
  let row0 = new Float64Array(Math.floor(n / 2) + 1);
  let row1 = new Float64Array(Math.floor((n + 1) / 2));
  for (let i = 0; i <= n; i++) {
    const c = q[i]! * rho ** (n - i) * lead;
    if (i % 2 === 0) row0[i / 2] = c;
    else row1[(i - 1) / 2] = c;
  }
  for (let r = 1; r <= n; r++) {
    let scale = -Infinity;
    for (let k = 0; k < row1.length; k++) scale = Math.max(scale, Math.abs(row1[k]!));
    for (let k = 0; k < row0.length; k++) scale = Math.max(scale, Math.abs(row0[k]!));
    const pivot = row1[0] ?? 0;
    if (!(pivot > ZERO_TOL * scale)) return false;
    const next = new Float64Array(Math.max(0, row0.length - 1));
    for (let k = 0; k < next.length; k++) next[k] = (pivot * (row0[k + 1] ?? 0) - row0[0]! * (row1[k + 1] ?? 0)) / pivot;
    row0 = row1;
    row1 = next;
  }
  return true;
}

/** Section polynomial z² + c1·z + c2 rewritten in u = z − 1, descending powers of u. */
function inU(c0: number, c1: number, c2: number): number[] {
  return [c0, 2 * c0 + c1, c0 + c1 + c2];
}

/**
 * Stability of the discrete loop L(z) = k·T·F(z)/(z − 1), F given as sections:
 * char(u) = u·Π A_i(u) + k·T·Π B_i(u).
 */
export function discreteLoopStable(sections: readonly Sos[], kRadPerS: number, sampleRateHz: number): boolean {
  let a: number[] = [1];
  let b: number[] = [kRadPerS / sampleRateHz];
  for (const s of sections) {
    a = polyMul(a, inU(s.a[0], s.a[1], s.a[2]));
    b = polyMul(b, inU(s.b[0], s.b[1], s.b[2]));
  }
  const charU = polyAddDescending(polyMul(a, [1, 0]), b);
  return routhHurwitzStable(uToS(trimLeading(charU)));
}

/** P(u) with u = 2s/(1 − s), times (1 − s)^n: Σ c_k (2s)^k (1 − s)^(n−k), descending in s. */
function uToS(p: readonly number[]): number[] {
  const n = p.length - 1;
  let out: number[] = [0];
  for (let i = 0; i <= n; i++) {
    const k = n - i; // p[i] multiplies u^k
    let term = [p[i]! * 2 ** k];
    for (let j = 0; j < k; j++) term = polyMul(term, [1, 0]);
    for (let j = 0; j < n - k; j++) term = polyMul(term, [-1, 1]);
    out = polyAddDescending(out, term);
  }
  return out;
}

function trimLeading(p: readonly number[]): number[] {
  let i = 0;
  while (i < p.length - 1 && p[i] === 0) i++;
  return p.slice(i);
}

/**
 * Schur–Cohn test by the Levinson step-down recursion (PM4 Sec. 3.6.7 (memory)): every root of the
 * ascending z⁻¹ polynomial a lies strictly inside |z| = 1 iff every reflection coefficient has |k| < 1.
 * Only for a b/a given as such; unreliable when roots crowd z = 1 (see above) — prefer sections.
 */
export function schurCohnStable(a: readonly number[]): boolean {
  let n = a.length;
  while (n > 1 && a[n - 1] === 0) n--;
  let p = a.slice(0, n).map((x) => x / a[0]!);
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
