/**
 * Exact rational arithmetic on binary64 values, for set-up computations whose result needs more than
 * 53 bits (tuning words of 48- and 64-bit accumulators). BigInt is used at set-up only, never per sample.
 */

export interface Rational {
  readonly num: bigint;
  readonly den: bigint;
}

/** The exact value of a finite double as num/den with den a power of two. */
export function doubleToRational(x: number): Rational {
  if (!Number.isFinite(x)) throw new RangeError(`not a finite number: ${x}`);
  if (Number.isInteger(x)) return { num: BigInt(x), den: 1n };
  let den = 1n;
  let m = x;
  // Doubling is exact; at most 1074 steps reach an integer for any finite double.
  while (!Number.isInteger(m)) {
    m *= 2;
    den *= 2n;
  }
  return { num: BigInt(m), den };
}

/** round(num/den), half away from zero, den > 0. */
export function roundRational(num: bigint, den: bigint): bigint {
  const neg = num < 0n;
  const a = neg ? -num : num;
  const q = (2n * a + den) / (2n * den);
  return neg ? -q : q;
}

/** num/den as the nearest-ish double (each BigInt converts with relative error ≤ 2^−53). */
export function rationalToNumber(num: bigint, den: bigint): number {
  // Scale both down together so Number() never overflows to Infinity.
  let n = num;
  let d = den;
  const limit = 1n << 1000n;
  while (d > limit || n > limit || -n > limit) {
    n >>= 64n;
    d >>= 64n;
  }
  return Number(n) / Number(d);
}
