/**
 * Representations of filters shared by every module of the library.
 * Polynomials are stored highest power first (the b/a convention of SciPy and OS3),
 * so an analog F(s) = (τ2·s + 1)/((τ1+τ2)·s + 1) is { num: [τ2, 1], den: [τ1+τ2, 1] }.
 */

/** Analog transfer function N(s)/D(s); coefficients in descending powers of s. */
export interface AnalogTf {
  readonly num: readonly number[];
  readonly den: readonly number[];
}

/**
 * Digital transfer function B(z)/A(z) in powers of z^-1: b[0] + b[1]z^-1 + …, with a[0] = 1.
 */
export interface DigitalTf {
  readonly b: readonly number[];
  readonly a: readonly number[];
}

/** One second-order section, b and a of length 3, a[0] = 1 (first-order sections pad with 0). */
export interface Sos {
  readonly b: readonly [number, number, number];
  readonly a: readonly [number, number, number];
}
