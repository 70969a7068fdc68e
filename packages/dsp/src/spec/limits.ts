/**
 * Every limit on a spec's word widths, in one place. The schema (./schema.ts) enforces them and names
 * the field; the inner functions that take widths (sine table, tuning word, quantiser) assert their
 * preconditions with these same numbers, never with numbers of their own.
 */
import { FieldError } from '../fixed/fieldError.ts';

/**
 * float64 holds every integer below 2^53 exactly (IEEE754): the bit-true loop keeps its products in
 * plain numbers, so the MAC's five products (dataBits + coefficientBits + 1 bits, summed) and the
 * detector product (dataBits + amplitudeBits) must fit.
 */
export const EXACT_INTEGER_BITS = 53;

/** Inclusive [min, max] of each width field, by its dot path in the spec. */
export const WIDTH_LIMITS = {
  'nco.accumulatorBits': [4, 64],
  /**
   * 2 or more so the quarter-turn offset of cos is a whole table address; at most 16, a 65,536-entry
   * table. Firmware NCO tables are rarely larger (beyond that the phase-truncation spur, −6.02·P dBc,
   * is below what the amplitude quantisation allows; common practice, no source), and every release
   * file holds the whole table (at 16 bits and 32-bit codes the largest file is about 3.6 MB).
   */
  'nco.phaseBits': [2, 16],
  'nco.amplitudeBits': [2, 32],
  'fixedPoint.coefficientBits': [2, 32],
  'fixedPoint.coefficientFractionBits': [0, 64],
  'fixedPoint.dataBits': [2, 32],
  'fixedPoint.accumulatorBits': [2, 64],
  'filter.order': [1, 4],
} as const satisfies Record<string, readonly [number, number]>;

export type WidthField = keyof typeof WIDTH_LIMITS;

/** Address bits of the largest sine table a spec may ask for (WIDTH_LIMITS['nco.phaseBits']). */
export const MAX_PHASE_BITS = WIDTH_LIMITS['nco.phaseBits'][1];

/** Why a limit is where it is, said with the schema's message when a value passes it. */
export const WIDTH_LIMIT_REASONS: Readonly<Partial<Record<WidthField, string>>> = {
  'nco.phaseBits': `must be at most ${MAX_PHASE_BITS} address bits (a ${2 ** MAX_PHASE_BITS}-entry sine table, the largest a release holds)`,
};

/** Asserts that `value` is an integer within the spec's limit for `field` (a FieldError naming it otherwise). */
export function requireWidth(field: WidthField, value: number): void {
  const [min, max] = WIDTH_LIMITS[field];
  if (!Number.isInteger(value) || value < min || value > max) {
    throw new FieldError(field, `${field} must be an integer in [${min}, ${max}], got ${String(value)}`);
  }
}
