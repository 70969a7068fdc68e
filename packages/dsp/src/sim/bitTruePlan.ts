/**
 * Every integer constant of the bit-true loop, fixed once at set-up (packages/dsp/README.md,
 * "Bit-true arithmetic"): coefficient codes, tuning word, control scaling, sine table and widths.
 * The release renders these same numbers into VHDL, Verilog and C.
 */
import type { LoopSpec } from '../spec/schema.ts';
import type { QuantizedFilter } from '../types/fixed.ts';
import type { BitTruePlan } from '../types/sim.ts';
import { FieldError, requireIntIn } from '../fixed/fieldError.ts';
import { ncoTuning } from '../nco/tuningWord.ts';
import { specControlScaling } from '../nco/controlScaling.ts';
import { MAX_PHASE_BITS, sineFullScale, sineTable } from '../nco/sineTable.ts';

/** The spec fields the bit-true loop reads (a LoopSpec satisfies it). */
export type BitTrueSpec = Pick<LoopSpec, 'sampleRateHz' | 'centerHz' | 'input' | 'nco' | 'fixedPoint'>;

/** float64 holds integers exactly below 2^53; the MAC sums five products of D + Wc − 2 bits. */
const MAX_EXACT_BITS = 53;

export function validateBitTrueWidths(spec: BitTrueSpec): void {
  const { nco, fixedPoint: fp } = spec;
  requireIntIn('fixedPoint.dataBits', fp.dataBits, 2, 32);
  requireIntIn('fixedPoint.coefficientBits', fp.coefficientBits, 2, 32);
  requireIntIn('fixedPoint.accumulatorBits', fp.accumulatorBits, 2, 64);
  requireIntIn('nco.amplitudeBits', nco.amplitudeBits, 2, 32);
  requireIntIn('nco.accumulatorBits', nco.accumulatorBits, 4, 64);
  requireIntIn('nco.phaseBits', nco.phaseBits, 2, Math.min(MAX_PHASE_BITS, nco.accumulatorBits));
  if (fp.dataBits + fp.coefficientBits + 1 > MAX_EXACT_BITS) {
    throw new FieldError('fixedPoint.dataBits', `fixedPoint.dataBits + coefficientBits must be at most ${MAX_EXACT_BITS - 1} for the bit-true MAC, got ${fp.dataBits} + ${fp.coefficientBits}`);
  }
  if (fp.dataBits + nco.amplitudeBits > MAX_EXACT_BITS) {
    throw new FieldError('nco.amplitudeBits', `fixedPoint.dataBits + nco.amplitudeBits must be at most ${MAX_EXACT_BITS} for the detector product, got ${fp.dataBits} + ${nco.amplitudeBits}`);
  }
}

/** Fix the bit-true loop's constants from a spec and its quantised loop filter. */
export function planBitTrue(spec: BitTrueSpec, quantized: QuantizedFilter): BitTruePlan {
  validateBitTrueWidths(spec);
  const { nco, fixedPoint: fp } = spec;
  return {
    sampleRateHz: spec.sampleRateHz,
    centerHz: spec.centerHz,
    dataBits: fp.dataBits,
    coefficientBits: fp.coefficientBits,
    coefficientFractionBits: quantized.format.fractionBits,
    macBits: fp.accumulatorBits,
    rounding: fp.rounding,
    overflow: fp.overflow,
    ncoAccumulatorBits: nco.accumulatorBits,
    phaseBits: nco.phaseBits,
    amplitudeBits: nco.amplitudeBits,
    waveform: nco.waveform,
    gainHzPerUnit: nco.gainHzPerUnit,
    sectionCount: quantized.sections.length,
    coefficientCodes: quantized.sections.flatMap((s) => [s.codes.b0, s.codes.b1, s.codes.b2, s.codes.a1, s.codes.a2]),
    tuning: ncoTuning(spec.centerHz, spec.sampleRateHz, nco.accumulatorBits),
    control: specControlScaling(spec),
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
    { signal: 'mac', wordBits: plan.macBits, fractionBits: fc + d - 1, signed: true, description: 'section sum of products before rounding by the coefficient fraction bits' },
    { signal: 'section_output', wordBits: d, fractionBits: d - 1, signed: true, description: 'each section output; the last is the filter output y' },
    { signal: 'gain', wordBits: plan.coefficientBits, fractionBits: plan.control.gainShift, signed: false, description: 'G: tuning increment Δ = round(y·G / 2^S)' },
    { signal: 'phase', wordBits: plan.ncoAccumulatorBits, fractionBits: plan.ncoAccumulatorBits, signed: false, description: 'phase register φ, one turn = 2^N' },
  ];
}
