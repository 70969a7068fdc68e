/**
 * Control word to tuning increment. The filter output y (a dataBits code, fraction D − 1, so its value
 * is y·2^−(D−1) units) asks for a frequency change gainHzPerUnit·y_value; at the loop rate fs that is
 * gainHzPerUnit·y_value·2^N/fs accumulator LSBs per sample (TRG71). The scale
 *   K = gainHzPerUnit·2^N / (fs·2^(D−1))
 * is held as an integer gainCode in a coefficientBits word with gainShift fraction bits, the most that
 * fit (gainShift may be negative: then it is a left shift), and Δ = roundShift(y·gainCode, gainShift).
 */
import type { LoopSpec } from '../spec/schema.ts';
import type { RoundingMode } from '../types/fixed.ts';
import type { NcoControlScaling } from '../types/nco.ts';
import { FieldError } from '../fixed/fieldError.ts';
import { roundReal } from '../fixed/rounding.ts';

export interface ControlScalingInput {
  readonly gainHzPerUnit: number;
  readonly sampleRateHz: number;
  readonly accumulatorBits: number;
  readonly dataBits: number;
  readonly coefficientBits: number;
  readonly rounding: RoundingMode;
}

export function ncoControlScaling(p: ControlScalingInput): NcoControlScaling {
  if (!(p.gainHzPerUnit > 0) || !Number.isFinite(p.gainHzPerUnit)) {
    throw new FieldError('nco.gainHzPerUnit', `nco.gainHzPerUnit must be a positive finite number, got ${p.gainHzPerUnit}`);
  }
  const idealScale = (p.gainHzPerUnit * 2 ** p.accumulatorBits) / (p.sampleRateHz * 2 ** (p.dataBits - 1));
  const maxCode = 2 ** (p.coefficientBits - 1) - 1;
  let gainShift = p.coefficientBits - 1 - Math.floor(Math.log2(idealScale));
  while (roundReal(idealScale * 2 ** gainShift, p.rounding) > maxCode) gainShift--;
  gainShift = Math.min(gainShift, 62);
  const gainCode = roundReal(idealScale * 2 ** gainShift, p.rounding);
  if (gainCode <= 0) {
    throw new FieldError('nco.gainHzPerUnit', `nco.gainHzPerUnit ${p.gainHzPerUnit} is too small to reach one accumulator LSB per sample`);
  }
  const quantizedScale = gainCode * 2 ** -gainShift;
  return {
    gainCode,
    gainShift,
    idealScale,
    quantizedScale,
    actualGainHzPerUnit: (quantizedScale * p.sampleRateHz * 2 ** (p.dataBits - 1)) / 2 ** p.accumulatorBits,
  };
}

/** The control scaling of a spec's NCO and fixed-point widths (the NCO runs at sampleRateHz, DESIGN.md). */
export function specControlScaling(spec: Pick<LoopSpec, 'sampleRateHz' | 'nco' | 'fixedPoint'>): NcoControlScaling {
  const { nco, fixedPoint: fp } = spec;
  return ncoControlScaling({
    gainHzPerUnit: nco.gainHzPerUnit,
    sampleRateHz: spec.sampleRateHz,
    accumulatorBits: nco.accumulatorBits,
    dataBits: fp.dataBits,
    coefficientBits: fp.coefficientBits,
    rounding: fp.rounding,
  });
}
