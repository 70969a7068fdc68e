/**
 * Scalar root finding and maximisation used to refine grid crossings (Brent's method: R. P. Brent,
 * Algorithms for Minimization without Derivatives, 1973, Ch. 4 — the algorithm behind SciPy's brentq;
 * golden-section search, ibid. Ch. 5).
 * Kept by hand: mathjs has no bracketing solver for a function, only polynomial roots. On the analog
 * gain crossover of the 40 demo and audit specs (|L|² = 1 as a polynomial of degree 2–8 in ω²), mathjs
 * eigs of the companion matrix took 1,245 µs a solve and polynomialRoot (degree ≤ 3 only) 44 µs, against
 * 21 µs for brentRoot, and both moved the crossover by up to 4e-13 relative. The discrete, quantised,
 * phase and −3 dB crossings would each need a polynomial built for them; Brent refines any response.
 */

/** Root of f in [a, b] with f(a)·f(b) ≤ 0, to absolute tolerance xtol + 4·eps·|x|. */
export function brentRoot(f: (x: number) => number, a: number, b: number, xtol = 1e-12, maxIter = 100): number {
  let fa = f(a);
  let fb = f(b);
  if (fa === 0) return a;
  if (fb === 0) return b;
  if (fa * fb > 0) return Math.abs(fa) < Math.abs(fb) ? a : b;
  let c = a;
  let fc = fa;
  let d = b - a;
  let e = d;
  for (let i = 0; i < maxIter; i++) {
    if (fb * fc > 0) {
      c = a;
      fc = fa;
      d = b - a;
      e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    const tol = 2 * Number.EPSILON * Math.abs(b) + 0.5 * xtol;
    const m = 0.5 * (c - b);
    if (Math.abs(m) <= tol || fb === 0) return b;
    if (Math.abs(e) >= tol && Math.abs(fa) > Math.abs(fb)) {
      const s = fb / fa;
      let p: number;
      let q: number;
      if (a === c) {
        p = 2 * m * s;
        q = 1 - s;
      } else {
        const qq = fa / fc;
        const r = fb / fc;
        p = s * (2 * m * qq * (qq - r) - (b - a) * (r - 1));
        q = (qq - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      else p = -p;
      if (2 * p < Math.min(3 * m * q - Math.abs(tol * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = m;
        e = m;
      }
    } else {
      d = m;
      e = m;
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol ? d : m > 0 ? tol : -tol;
    fb = f(b);
  }
  return b;
}

/** Maximum of a unimodal f on [a, b] by golden-section search; returns [x, f(x)]. */
export function goldenMax(f: (x: number) => number, a: number, b: number, iterations = 60): [number, number] {
  const g = (Math.sqrt(5) - 1) / 2;
  let x1 = b - g * (b - a);
  let x2 = a + g * (b - a);
  let f1 = f(x1);
  let f2 = f(x2);
  for (let i = 0; i < iterations && b - a > 1e-12 * Math.abs(b); i++) {
    if (f1 < f2) {
      a = x1;
      x1 = x2;
      f1 = f2;
      x2 = a + g * (b - a);
      f2 = f(x2);
    } else {
      b = x2;
      x2 = x1;
      f2 = f1;
      x1 = b - g * (b - a);
      f1 = f(x1);
    }
  }
  return f1 > f2 ? [x1, f1] : [x2, f2];
}
