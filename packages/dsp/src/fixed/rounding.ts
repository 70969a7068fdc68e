/**
 * Integer rounding and overflow of the bit-true arithmetic (packages/dsp/README.md, "Bit-true arithmetic").
 *
 * Rounding modes are IEEE754 cl. 4.3 rounding-direction attributes applied at an integer boundary:
 * - "nearest"   = roundTiesToAway (half away from zero),
 * - "half-even" = roundTiesToEven (convergent),
 * - "truncate"  = roundTowardNegative (two's-complement truncation: drop the low bits).
 *
 * All values are integers held in float64. Every operation here is exact while |value| < 2^53:
 * division by a power of two only changes the exponent, floor of such a quotient is exact, and the
 * remainder p − q·2^s is an integer below 2^s (IEEE754 arithmetic on representable integers).
 */
import type { OverflowMode, RoundingMode } from '../types/fixed.ts';

/** Round an integer p divided by 2^s (s ≥ 0) to an integer; s < 0 multiplies by 2^−s (exact). */
export function roundShift(p: number, s: number, mode: RoundingMode): number {
  if (s <= 0) return p * 2 ** -s;
  const scale = 2 ** s;
  const q = Math.floor(p / scale);
  if (mode === 'truncate') return q;
  return resolveTie(q, p - q * scale, scale / 2, p, mode);
}

/** Round a real value to an integer in the given mode (input quantisation, coefficient codes). */
export function roundReal(v: number, mode: RoundingMode): number {
  const q = Math.floor(v);
  if (mode === 'truncate') return q;
  // v − floor(v) is exact in binary floating point, so ties are detected exactly (no v + 0.5 rounding).
  return resolveTie(q, v - q, 0.5, v, mode);
}

/** q = floor(x), r = x − q in [0, 2·half): pick q or q + 1 by the mode's tie rule. */
function resolveTie(q: number, r: number, half: number, x: number, mode: RoundingMode): number {
  if (r > half) return q + 1;
  if (r < half) return q;
  if (mode === 'nearest') return x >= 0 ? q + 1 : q;
  return q % 2 === 0 ? q : q + 1;
}

/** Smallest and largest code of a signed two's-complement word of `bits` bits. */
export function wordRange(bits: number): { readonly min: number; readonly max: number } {
  return { min: -(2 ** (bits - 1)), max: 2 ** (bits - 1) - 1 };
}

/**
 * Reduce an integer to a signed `bits`-bit word: clamp ("saturate") or keep the low bits
 * ("wrap", two's-complement modular arithmetic). Exact for |v| < 2^53 and bits ≤ 53; for wider words
 * a float64-exact integer cannot overflow and is returned unchanged.
 */
export function applyOverflow(v: number, bits: number, mode: OverflowMode): number {
  if (bits > 53) return v;
  const { min, max } = wordRange(bits);
  if (v >= min && v <= max) return v;
  if (mode === 'saturate') return v > max ? max : min;
  const span = 2 ** bits;
  return v - Math.floor((v - min) / span) * span;
}

/** True when the integer v does not fit a signed `bits`-bit word. */
export function overflows(v: number, bits: number): boolean {
  if (bits > 53) return false;
  const { min, max } = wordRange(bits);
  return v < min || v > max;
}
