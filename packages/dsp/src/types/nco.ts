/** NCO types (src/nco): tuning word, sine table, spectral estimates, control scaling. */

export interface NcoTuning {
  readonly accumulatorBits: number;
  /** Tuning word M = round(f·2^N/fs) (TRG71), exactly, in decimal (any N ≤ 64). */
  readonly tuningWordDecimal: string;
  /** The same M as the hardware holds it, in 32-bit words: M = hi·2^32 + lo (hi = 0 when N ≤ 32). */
  readonly tuningWordHi: number;
  readonly tuningWordLo: number;
  readonly requestedHz: number;
  /** M·fs/2^N. */
  readonly actualHz: number;
  readonly errorHz: number;
  readonly errorPpm: number;
  /** fs/2^N. */
  readonly resolutionHz: number;
}

export interface NcoSpectralEstimates {
  /** Phase-truncation spur, about −6.02·P dBc (NS87). Null when no bits are truncated (P = N). */
  readonly phaseTruncationSpurDbc: number | null;
  /** Worst case −6.02·P + 3.92 dBc (NS87; exact analysis TW05). */
  readonly phaseTruncationSpurWorstDbc: number | null;
  /** 6.02·B + 1.76 dB, Be48's figure for a sine of peak 2^(B−1) LSB. */
  readonly amplitudeSnrDb: number;
  /** The same for this table, whose peak is 2^(B−1) − 1 rather than 2^(B−1) LSB (dB). */
  readonly amplitudeSnrTableDb: number;
}

/**
 * How a filter-output code becomes a tuning increment: Δ = roundShift(y·gainCode, gainShift), where
 * gainShift < 0 means a left shift by −gainShift. gainCode·2^−gainShift ≈ gainHzPerUnit·2^N/fs/2^(D−1).
 */
export interface NcoControlScaling {
  readonly gainCode: number;
  readonly gainShift: number;
  /** The exact scale gainHzPerUnit·2^N/(fs·2^(D−1)) (accumulator LSBs per filter-output LSB). */
  readonly idealScale: number;
  /** gainCode·2^−gainShift. */
  readonly quantizedScale: number;
  /** Realised NCO gain in Hz per unit of control, after quantising the scale. */
  readonly actualGainHzPerUnit: number;
}
