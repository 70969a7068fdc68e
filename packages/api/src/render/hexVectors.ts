/**
 * The golden vectors as hex memory files, one per column (the sample index is the line number), in
 * the format Verilog's $readmemh reads: one word per line, exactly ceil(W/4) hex digits, two's
 * complement for signed columns, "\n" line ends. The testbenches of both languages read these files.
 */
import { asBuffer } from './artifactFile.ts';
import { putHex, type BitTrueRecord, type GoldenVectors, type LoopSpec, type VECTOR_CSV_COLUMNS } from '@loopwright/dsp';

type HexColumn = Exclude<(typeof VECTOR_CSV_COLUMNS)[number], 'sample'>;

export interface HexMemoryFile {
  readonly column: HexColumn;
  readonly fileName: string;
  readonly widthBits: number;
  readonly signed: boolean;
  readonly digits: number;
  /** The file's bytes (ASCII). */
  readonly bytes: Buffer;
}

/** Width and signedness of every column but the sample index, in the CSV's column order. */
export function hexColumns(spec: LoopSpec): readonly { column: HexColumn; widthBits: number; signed: boolean }[] {
  const d = spec.fixedPoint.dataBits;
  return [
    { column: 'input_code', widthBits: d, signed: true },
    { column: 'nco_phase', widthBits: spec.nco.accumulatorBits, signed: false },
    { column: 'table_address', widthBits: spec.nco.phaseBits, signed: false },
    { column: 'nco_code', widthBits: spec.nco.amplitudeBits, signed: true },
    { column: 'detector_code', widthBits: d, signed: true },
    { column: 'filter_code', widthBits: d, signed: true },
  ];
}

export function hexFileName(name: string, column: HexColumn): string {
  return `${name}_${column}.hex`;
}

const VALUES: Readonly<Record<Exclude<HexColumn, 'nco_phase'>, (r: BitTrueRecord) => ArrayLike<number>>> = {
  input_code: (r) => r.inputCode,
  table_address: (r) => r.tableAddress,
  nco_code: (r) => r.ncoCode,
  detector_code: (r) => r.detectorCode,
  filter_code: (r) => r.filterCode,
};

const NEWLINE = 0x0a;

/**
 * One column as W-bit words (W ≤ 32), two's complement when negative, `digits` hex digits a line.
 * Digits go straight into one buffer of the file's exact size (dsp's putHex): a toString(16) and
 * padStart per word was 4–5 times slower at 65 536 samples, for the same bytes.
 */
function wordsBytes(values: ArrayLike<number>, length: number, widthBits: number, digits: number): Buffer {
  const buf = new Uint8Array(length * (digits + 1));
  const wrap = 2 ** widthBits;
  let at = 0;
  for (let n = 0; n < length; n++) {
    const v = values[n] as number;
    at = putHex(buf, at, v < 0 ? v + wrap : v, digits);
    buf[at++] = NEWLINE;
  }
  return asBuffer(buf);
}

/** The phase accumulator, hi·2^32 + lo: wider than 32 bits, the hi word's digits then lo's eight. */
function phaseBytes(r: BitTrueRecord, widthBits: number, digits: number): Buffer {
  if (widthBits <= 32) return wordsBytes(r.phaseLo, r.length, widthBits, digits);
  const buf = new Uint8Array(r.length * (digits + 1));
  let at = 0;
  for (let n = 0; n < r.length; n++) {
    at = putHex(buf, at, r.phaseHi[n] as number, digits - 8);
    at = putHex(buf, at, r.phaseLo[n] as number, 8);
    buf[at++] = NEWLINE;
  }
  return asBuffer(buf);
}

export function hexMemoryFiles(spec: LoopSpec, golden: GoldenVectors): HexMemoryFile[] {
  const r = golden.record;
  return hexColumns(spec).map(({ column, widthBits, signed }) => {
    const digits = Math.ceil(widthBits / 4);
    const bytes = column === 'nco_phase' ? phaseBytes(r, widthBits, digits) : wordsBytes(VALUES[column](r), r.length, widthBits, digits);
    return { column, fileName: hexFileName(spec.name, column), widthBits, signed, digits, bytes };
  });
}
