/**
 * Minimal complex arithmetic on plain objects: evaluating responses is the hot loop of the analysis.
 * Kept by hand rather than mathjs's Complex (complex.js): with these four functions backed by it,
 * analyzeDesign's median over 400 runs per demo spec (packages/dsp/bench, 2-core machine) went from
 * 1.0–1.2 ms to 2.8–3.9 ms, and 48,526 of the 277,162 numbers it returns for the demo and audit specs
 * changed (complex.js divides by Smith's method, which rounds differently), moving the oracle figures.
 */
export interface Complex {
  readonly re: number;
  readonly im: number;
}

export const cmul = (a: Complex, b: Complex): Complex => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
export function cdiv(a: Complex, b: Complex): Complex {
  const d = b.re * b.re + b.im * b.im;
  return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
}
export const cscale = (a: Complex, k: number): Complex => ({ re: a.re * k, im: a.im * k });
export const cexpj = (theta: number): Complex => ({ re: Math.cos(theta), im: Math.sin(theta) });
