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

/** The accumulator value hi·2^32 + lo as a decimal string (exact for any width up to 64 bits). */
export function phaseDecimal(hi: number, lo: number): string {
  if (hi === 0) return String(lo);
  const v = hi * 4294967296 + lo;
  return Number.isSafeInteger(v) ? String(v) : ((BigInt(hi) << 32n) + BigInt(lo)).toString();
}

/** Bytes of a row at most: sample (10 digits), five signed 32-bit codes (11 each), the phase (20), 7 separators. */
const MAX_ROW_BYTES = 10 + 5 * 11 + 20 + 7;
const COMMA = 0x2c;
const NEWLINE = 0x0a;
const HEADER = `${VECTOR_CSV_COLUMNS.join(',')}\n`;

/**
 * Kept by hand rather than csv-stringify (csv-parse's sibling): every field is a decimal integer, so
 * there is nothing to quote or escape, and csv-stringify 6.9.0 wrote the same bytes for the four demo
 * specs (SHA-256 equal) in 9.6–11.4 ms per 4096-row file against 1.9 ms for a template string per
 * row (median of 100 runs, 2-core machine). The digits are now written straight into one buffer
 * (asciiText.ts), with the same bytes as that template string: at 65 536 samples the template string
 * took most of a release cut (packages/dsp/bench/bench.ts, "goldenVectors", for the figures).
 * `samples` keeps the first rows only (a simulation's first vectors); the default is the whole record.
 * The bytes, ASCII, exactly as long as the text (a release stores them as they are).
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
    // Up to 2^53 the phase is a safe integer; a wider one (a 64-bit accumulator) takes BigInt's digits.
    const hi = phaseHi[n] as number;
    if (hi === 0) at = putUint32(buf, at, phaseLo[n] as number);
    else if (hi < 0x200000) at = putDecimal(buf, at, hi * 4294967296 + (phaseLo[n] as number));
    else at = putText(buf, at, phaseDecimal(hi, phaseLo[n] as number));
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
