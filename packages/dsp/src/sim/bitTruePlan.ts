/**
 * Every integer constant of the bit-true loop, fixed once at set-up (packages/dsp/README.md,
 * "Bit-true arithmetic"): coefficient codes, tuning word, control scaling, sine table and widths.
 * Built from what the earlier steps derived (the quantised sections, the NCO's tuning word and
 * control scaling), never by deriving them again; the release renders these same numbers.
 */
import type { ValidSpec } from '../spec/schema.ts';
import type { QuantizedFilter } from '../types/fixed.ts';
import type { NcoControlScaling, NcoTuning } from '../types/nco.ts';
import type { BitTruePlan } from '../types/sim.ts';
import { sineFullScale, sineTable } from '../nco/sineTable.ts';

/** The spec fields the bit-true loop reads as they are (a ValidSpec satisfies it). */
export type BitTrueSpec = Pick<ValidSpec, 'sampleRateHz' | 'centerHz' | 'nco' | 'fixedPoint'>;

/** What the earlier steps of planDesign derived, which the bit-true loop takes as they are. */
export interface BitTrueParts {
  readonly quantized: QuantizedFilter;
  readonly tuning: NcoTuning;
  readonly control: NcoControlScaling;
}

/**
 * Fix the bit-true loop's constants. The widths are the spec's (checked by the schema, limits.ts,
 * including the exact-integer bounds of the MAC and the detector), so nothing is validated here.
 */
export function planBitTrue(spec: BitTrueSpec, { quantized, tuning, control }: BitTrueParts): BitTruePlan {
  const { nco, fixedPoint: fp } = spec;
  return {
    sampleRateHz: spec.sampleRateHz,
    centerHz: spec.centerHz,
    dataBits: fp.dataBits,
    coefficientBits: quantized.format.wordBits,
    coefficientFractionBits: quantized.format.fractionBits,
    accumulatorBits: fp.accumulatorBits,
    rounding: fp.rounding,
    overflow: fp.overflow,
    ncoAccumulatorBits: tuning.accumulatorBits,
    phaseBits: nco.phaseBits,
    amplitudeBits: nco.amplitudeBits,
    waveform: nco.waveform,
    gainHzPerUnit: nco.gainHzPerUnit,
    sectionCount: quantized.sections.length,
    coefficientCodes: quantized.sections.flatMap((s) => [s.codes.b0, s.codes.b1, s.codes.b2, s.codes.a1, s.codes.a2]),
    tuning,
    control,
    sineTable: sineTable(nco.phaseBits, nco.amplitudeBits),
    ncoFullScale: sineFullScale(nco.amplitudeBits),
  };
}

/** One signal of the bit-true data path: its word, fraction bits and signedness (README, "Number formats"). */
export interface SignalFormat {
  readonly signal: string;
  readonly wordBits: number;
  readonly fractionBits: number;
  readonly signed: boolean;
  readonly description: string;
}

/**
 * The Q format of every signal and constant of the bit-true loop, for release notes and generated
 * code comments. Word length and fraction bits are stated separately (Q notation is ambiguous).
 */
export function bitTrueFormats(plan: BitTruePlan): SignalFormat[] {
  const d = plan.dataBits;
  const fc = plan.coefficientFractionBits;
  return [
    { signal: 'input', wordBits: d, fractionBits: d - 1, signed: true, description: 'input sample x, full scale ±1' },
    { signal: 'nco_output', wordBits: plan.amplitudeBits, fractionBits: plan.amplitudeBits - 1, signed: true, description: `sine-table code c, peak ${plan.ncoFullScale}` },
    { signal: 'detector', wordBits: d, fractionBits: d - 1, signed: true, description: 'u = round(x·c / 2^(B−1))' },
    { signal: 'coefficient', wordBits: plan.coefficientBits, fractionBits: fc, signed: true, description: 'b0, b1, b2, a1, a2 of every section' },
    { signal: 'mac', wordBits: plan.accumulatorBits, fractionBits: fc + d - 1, signed: true, description: 'section sum of products before rounding by the coefficient fraction bits' },
    { signal: 'section_output', wordBits: d, fractionBits: d - 1, signed: true, description: 'each section output; the last is the filter output y' },
    { signal: 'gain', wordBits: plan.coefficientBits, fractionBits: plan.control.gainShift, signed: false, description: 'G: tuning increment Δ = round(y·G / 2^S)' },
    { signal: 'phase', wordBits: plan.ncoAccumulatorBits, fractionBits: plan.ncoAccumulatorBits, signed: false, description: 'phase register φ, one turn = 2^N' },
  ];
}
