/**
 * Statistics of the error one rounding point adds, in LSBs of its result (the additive white-noise
 * model of quantisation: WK08 Ch. 4–5, OS3 Sec. 6.9 (memory)). The model holds when the dropped bits
 * are busy (a noisy or fast-moving signal); a constant or slowly moving input gives correlated errors
 * (dead bands, limit cycles) that no variance describes.
 *
 * Dropping s ≥ 1 bits of an integer leaves 2^s equally likely remainders, so the error is a discrete
 * uniform variable with step δ = 2^−s LSB, not a continuous one:
 * - truncation (floor): error −r·δ, r = 0 … 2^s − 1: mean −(1 − 2^−s)/2, variance (1 − 4^−s)/12;
 * - rounding to nearest (ties away or ties to even): errors spread symmetrically about 0 with the tie
 *   at ±1/2, mean 0 for a signal symmetric about 0, variance (1 + 2·4^−s)/12.
 * Both tend to the continuous q²/12 as s grows (WK08). A real value quantised once (s = ∞, the
 * simulation's input) has the continuous statistics; s = 0 drops nothing and adds no error.
 */
import type { RoundingMode } from '../types/fixed.ts';

export interface RoundoffStatistics {
  /** Mean of the error, LSB. */
  readonly meanLsb: number;
  /** Variance of the error, LSB². */
  readonly varianceLsb2: number;
  /** Mean square (variance + mean²), LSB². */
  readonly powerLsb2: number;
}

/** Error statistics of dropping `droppedBits` bits in `mode`; `null` for a real value quantised once. */
export function roundoffStatistics(mode: RoundingMode, droppedBits: number | null): RoundoffStatistics {
  if (droppedBits !== null && droppedBits <= 0) return { meanLsb: 0, varianceLsb2: 0, powerLsb2: 0 };
  const fine = droppedBits === null ? 0 : 4 ** -droppedBits;
  const meanLsb = mode === 'truncate' ? -(1 - Math.sqrt(fine)) / 2 : 0;
  const varianceLsb2 = mode === 'truncate' ? (1 - fine) / 12 : (1 + 2 * fine) / 12;
  return { meanLsb, varianceLsb2, powerLsb2: varianceLsb2 + meanLsb * meanLsb };
}
