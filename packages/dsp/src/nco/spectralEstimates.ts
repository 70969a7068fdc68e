/** NCO spur and SNR estimates. */
import type { NcoSpectralEstimates } from '../types/nco.ts';

/**
 * P table-address bits of an N-bit accumulator (amplitude B bits):
 * phase-truncation spur ≈ −6.02·P dBc, worst case −6.02·P + 3.92 dBc (NS87; exact per tuning word: TW05);
 * amplitude quantisation SNR = 6.02·B + 1.76 dB for a full-scale sine (Be48).
 */
export function ncoSpectralEstimates(accumulatorBits: number, phaseBits: number, amplitudeBits: number): NcoSpectralEstimates {
  const truncated = accumulatorBits > phaseBits;
  return {
    phaseTruncationSpurDbc: truncated ? -6.02 * phaseBits : null,
    phaseTruncationSpurWorstDbc: truncated ? -6.02 * phaseBits + 3.92 : null,
    amplitudeSnrDb: 6.02 * amplitudeBits + 1.76,
  };
}
