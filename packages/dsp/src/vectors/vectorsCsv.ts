/**
 * CSV layout of the golden vectors (one header line, one row per sample, "\n" line ends, decimal
 * integers, two's-complement codes written as signed values):
 *   sample         sample index n from 0
 *   input_code     input sample x[n], dataBits signed, fraction dataBits − 1
 *   nco_phase      phase accumulator at n before it advances, unsigned, ncoAccumulatorBits wide
 *   table_address  sine-table address of the NCO output, (phase >> (N − P)) + 2^(P−2) mod 2^P
 *   nco_code       NCO output code, amplitudeBits signed
 *   detector_code  detector output u[n], dataBits signed
 *   filter_code    loop-filter output y[n] (last section), dataBits signed
 */
import type { GoldenVectors } from './goldenVectors.ts';
import { asciiString, putDecimal, putInt32, putText, putUint32 } from './asciiText.ts';

export const VECTOR_CSV_COLUMNS = ['sample', 'input_code', 'nco_phase', 'table_address', 'nco_code', 'detector_code', 'filter_code'] as const;
export type VectorCsvColumn = (typeof VECTOR_CSV_COLUMNS)[number];

/** hi·2^32 + lo is a safe integer (at most 2^53 − 1) exactly when hi is below 2^21. */
const SAFE_PHASE_HI = 0x200000;

/**
 * The accumulator value hi·2^32 + lo, exactly: a number while it is a safe integer, and past 2^53
 * (the upper half of a 64-bit accumulator) BigInt's decimal digits, which a double would round.
 */
function phaseValue(hi: number, lo: number): number | string {
  return hi < SAFE_PHASE_HI ? hi * 4294967296 + lo : ((BigInt(hi) << 32n) + BigInt(lo)).toString();
}

/** The accumulator value hi·2^32 + lo as a decimal string (exact for any width up to 64 bits). */
export function phaseDecimal(hi: number, lo: number): string {
  return String(phaseValue(hi, lo));
}

/** phaseDecimal's digits at `at`; returns the position after them. */
function putPhase(buf: Uint8Array, at: number, hi: number, lo: number): number {
  const v = phaseValue(hi, lo);
  return typeof v === 'number' ? putDecimal(buf, at, v) : putText(buf, at, v);
}

/** Bytes of a row at most: sample (10 digits), five signed 32-bit codes (11 each), the phase (20), 7 separators. */
const MAX_ROW_BYTES = 10 + 5 * 11 + 20 + 7;
const COMMA = 0x2c;
const NEWLINE = 0x0a;
const HEADER = `${VECTOR_CSV_COLUMNS.join(',')}\n`;

/**
 * The golden-vector CSV as its ASCII bytes, exactly as long as the text (a release stores them as
 * they are). `samples` keeps the first rows only (a simulation's first vectors); the default is the
 * whole record. Every field is a decimal integer, so there is nothing to quote or escape, and the
 * digits go straight into one buffer (asciiText.ts), with the bytes String(v) gives, because a string
 * per value was the cost: csv-stringify 6.9.0 (csv-parse's sibling) wrote the same bytes in 9.6–11.4 ms
 * per 4096-row file against 1.9 ms for a template string per row (median of 100 runs, 2-core machine),
 * and at 65 536 samples the template string took most of a release cut (packages/dsp/bench/bench.ts,
 * "goldenVectors").
 */
export function vectorsCsvBytes(v: GoldenVectors, samples = v.record.length): Uint8Array {
  const r = v.record;
  const rows = Math.max(0, Math.min(samples, r.length));
  const buf = new Uint8Array(HEADER.length + rows * MAX_ROW_BYTES);
  let at = putText(buf, 0, HEADER);
  const { inputCode, phaseHi, phaseLo, tableAddress, ncoCode, detectorCode, filterCode } = r;
  for (let n = 0; n < rows; n++) {
    at = putUint32(buf, at, n);
    buf[at++] = COMMA;
    at = putInt32(buf, at, inputCode[n] as number);
    buf[at++] = COMMA;
    at = putPhase(buf, at, phaseHi[n] as number, phaseLo[n] as number);
    buf[at++] = COMMA;
    at = putInt32(buf, at, tableAddress[n] as number);
    buf[at++] = COMMA;
    at = putInt32(buf, at, ncoCode[n] as number);
    buf[at++] = COMMA;
    at = putInt32(buf, at, detectorCode[n] as number);
    buf[at++] = COMMA;
    at = putInt32(buf, at, filterCode[n] as number);
    buf[at++] = NEWLINE;
  }
  return buf.slice(0, at);
}

/** The golden-vector CSV as text (vectorsCsvBytes decoded). */
export function formatVectorsCsv(v: GoldenVectors, samples = v.record.length): string {
  return asciiString(vectorsCsvBytes(v, samples));
}
