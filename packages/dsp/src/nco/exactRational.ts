/**
 * Exact rational arithmetic on binary64 values, for set-up computations whose result needs more than
 * 53 bits (tuning words of 48- and 64-bit accumulators): fraction.js, the BigInt fraction type that
 * mathjs's Fraction is. Taken from fraction.js itself because mathjs loads whole in Node: importing
 * this package went from about 0.2 s and 95 MB to 0.6–0.8 s and 145 MB with mathjs (each API compute
 * thread, terminal command and test worker pays it), against 1 ms for fraction.js.
 * BigInt is used at set-up only, never per sample.
 */
import Fraction from 'fraction.js';

export { Fraction };

/**
 * The exact value of a finite double as a Fraction (its denominator a power of two). Kept by hand
 * because `new Fraction(x)` reads a number by continued fractions (0.1 becomes 1/10, not the double's
 * 3602879701896397/2^55): on 19,696 seeded random (f, fs, N) that changed 19,687 tuning errors and
 * some tuning words (819270799 became 819270800), measured against this function's exact values.
 */
export function exactFraction(x: number): Fraction {
  if (!Number.isFinite(x)) throw new RangeError(`not a finite number: ${x}`);
  let den = 1n;
  let m = x;
  // Doubling is exact; at most 1074 steps reach an integer for any finite double.
  while (!Number.isInteger(m)) {
    m *= 2;
    den *= 2n;
  }
  return new Fraction(BigInt(m), den);
}
