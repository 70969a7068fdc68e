/** NCO spur and SNR estimates. */
import type { NcoSpectralEstimates } from '../types/nco.ts';

/**
 * P table-address bits of an N-bit accumulator (amplitude B bits):
 * phase-truncation spur ≈ −6.02·P dBc, worst case −6.02·P + 3.92 dBc (NS87; exact per tuning word: TW05);
 * amplitude quantisation SNR = 6.02·B + 1.76 dB for a sine of peak 2^(B−1) LSB (Be48). The table's
 * full scale is 2^(B−1) − 1 (symmetric codes, README "Number formats"), so its own signal power is lower
 * by ((2^(B−1) − 1)/2^(B−1))²: amplitudeSnrTableDb adds 20·log10 of that ratio (−6.02 dB at B = 2,
 * −0.0003 dB at B = 16). Both are reported: the first is the published figure, the second the table's.
 */
export function ncoSpectralEstimates(accumulatorBits: number, phaseBits: number, amplitudeBits: number): NcoSpectralEstimates {
  const truncated = accumulatorBits > phaseBits;
  return {
    phaseTruncationSpurDbc: truncated ? -6.02 * phaseBits : null,
    phaseTruncationSpurWorstDbc: truncated ? -6.02 * phaseBits + 3.92 : null,
    amplitudeSnrDb: 6.02 * amplitudeBits + 1.76,
    amplitudeSnrTableDb: 6.02 * amplitudeBits + 1.76 + 20 * Math.log10(1 - 2 ** (1 - amplitudeBits)),
  };
}
