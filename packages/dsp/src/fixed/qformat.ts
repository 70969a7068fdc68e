/** Q formats and quantisation of one value (REFERENCES.md, Fixed point; rounding modes IEEE754 cl. 4.3). */
import type { OverflowMode, QFormat, RoundingMode } from '../types/fixed.ts';
import { applyOverflow, overflows, roundReal, wordRange } from './rounding.ts';

/** The Q format of a signed `wordBits` word with `fractionBits` fraction bits. */
export function qFormat(wordBits: number, fractionBits: number): QFormat {
  const lsb = 2 ** -fractionBits;
  const { min, max } = wordRange(wordBits);
  return { wordBits, fractionBits, lsb, minValue: min * lsb, maxValue: max * lsb };
}

export interface QuantizedValue {
  readonly code: number;
  readonly quantizedValue: number;
  readonly overflowed: boolean;
}

/** Quantise a real value: code = overflow(round(value·2^F)), value = code·2^−F. */
export function quantizeValue(
  value: number,
  wordBits: number,
  fractionBits: number,
  rounding: RoundingMode,
  overflow: OverflowMode,
): QuantizedValue {
  const rounded = roundReal(value * 2 ** fractionBits, rounding);
  const code = applyOverflow(rounded, wordBits, overflow);
  return { code, quantizedValue: code * 2 ** -fractionBits, overflowed: overflows(rounded, wordBits) };
}

/**
 * "auto" fraction bits: the most fraction bits F (0 ≤ F ≤ maxFractionBits) for which every value
 * rounds to a code inside the word. Returns null when even F = 0 overflows.
 */
export function autoFractionBits(
  values: readonly number[],
  wordBits: number,
  rounding: RoundingMode,
  maxFractionBits = 62,
): number | null {
  const maxAbs = values.reduce((m, v) => Math.max(m, Math.abs(v)), 0);
  // Start just above the estimate W − 1 − ceil(log2 max|c|) and walk down; rounding can push a code over.
  let f = maxAbs === 0 ? maxFractionBits : Math.min(maxFractionBits, wordBits - 1 - Math.floor(Math.log2(maxAbs)) + 1);
  for (; f >= 0; f--) if (fitsWord(values, f, wordBits, rounding)) return f;
  return null;
}

/** Every value rounds to a code inside the word at f fraction bits (a module function, not a named closure per call). */
function fitsWord(values: readonly number[], f: number, wordBits: number, rounding: RoundingMode): boolean {
  for (const v of values) if (overflows(roundReal(v * 2 ** f, rounding), wordBits)) return false;
  return true;
}
