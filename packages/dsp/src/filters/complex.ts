/** Minimal complex arithmetic on plain objects: evaluating responses is the hot loop of the analysis. */
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
