/** Fixed-point types: coefficient quantisation of second-order sections (src/fixed). */
import type { Sos } from './filter.ts';

/** IEEE754 cl. 4.3: nearest = roundTiesToAway, half-even = roundTiesToEven, truncate = roundTowardNegative. */
export type RoundingMode = 'nearest' | 'half-even' | 'truncate';
export type OverflowMode = 'saturate' | 'wrap';

/** The coefficient part of `fixedPoint` in a loop spec (field names as DESIGN.md). */
export interface CoefficientFormat {
  readonly coefficientBits: number;
  readonly coefficientFractionBits: number | 'auto';
  readonly rounding: RoundingMode;
  readonly overflow: OverflowMode;
}

/** A Q format stated without ambiguity: word length and fraction bits (REFERENCES.md, Fixed point). */
export interface QFormat {
  readonly wordBits: number;
  readonly fractionBits: number;
  /** Value of one LSB, 2^−fractionBits. */
  readonly lsb: number;
  /** Representable range [−2^(W−F−1), 2^(W−F−1) − 2^−F]. */
  readonly minValue: number;
  readonly maxValue: number;
}

export type CoefficientName = 'b0' | 'b1' | 'b2' | 'a1' | 'a2';

export interface QuantizedCoefficient {
  readonly name: CoefficientName;
  /** The unquantised value. */
  readonly value: number;
  /** Integer code (a plain number; exact, words are ≤ 52 bits). */
  readonly code: number;
  /** code · 2^−fractionBits. */
  readonly quantizedValue: number;
  /** True when the rounded code did not fit the word and the overflow mode changed it. */
  readonly overflowed: boolean;
}

/**
 * Stability class of one quantised section's poles, decided exactly on the integer codes:
 * stable (inside the unit circle), integrator (a pole at z = 1 that the unquantised design also had,
 * as in a PI filter, kept exactly), on-circle, outside.
 */
export type SectionStability = 'stable' | 'integrator' | 'on-circle' | 'outside';

export interface QuantizedSection {
  readonly index: number;
  readonly codes: Readonly<Record<CoefficientName, number>>;
  readonly coefficients: readonly QuantizedCoefficient[];
  /** The quantised coefficients as a section (a[0] = 1) for analysis. */
  readonly quantized: Sos;
  readonly reference: Sos;
  /** Largest pole magnitude of the quantised and of the unquantised section. */
  readonly poleRadius: number;
  readonly referencePoleRadius: number;
  readonly stability: SectionStability;
  readonly numeratorZero: boolean;
}

export type QuantizationTrapKind = 'numerator-zero' | 'pole-on-circle' | 'pole-outside-circle' | 'coefficient-overflow';

export interface QuantizationTrap {
  readonly kind: QuantizationTrapKind;
  readonly section: number;
  readonly coefficient?: CoefficientName;
  /** A plain sentence for the designer. */
  readonly message: string;
}

export interface QuantizedFilter {
  readonly format: QFormat;
  /** True when coefficientFractionBits was "auto" (format.fractionBits is then the chosen value). */
  readonly fractionBitsAuto: boolean;
  readonly rounding: RoundingMode;
  readonly overflow: OverflowMode;
  readonly sections: readonly QuantizedSection[];
  /**
   * Largest |20·log10|Hq/H|| in dB over a log grid from 1e-6·fs/2 to fs/2, counted where the
   * unquantised response is within `deviationBandDb` of its peak; null when the quantised response
   * is identically zero there (a zero numerator).
   */
  readonly maxDeviationDb: number | null;
  readonly deviationBandDb: number;
  /** Every section stable or an intended integrator. */
  readonly stable: boolean;
  readonly traps: readonly QuantizationTrap[];
}
