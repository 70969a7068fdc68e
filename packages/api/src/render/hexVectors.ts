/**
 * The golden vectors as hex memory files, one per column (the sample index is the line number), in
 * the format Verilog's $readmemh reads: one word per line, exactly ceil(W/4) hex digits, two's
 * complement for signed columns, "\n" line ends. The testbenches of both languages read these files.
 */
import type { BitTrueRecord, GoldenVectors, LoopSpec, VECTOR_CSV_COLUMNS } from '@loopwright/dsp';

type HexColumn = Exclude<(typeof VECTOR_CSV_COLUMNS)[number], 'sample'>;

export interface HexMemoryFile {
  readonly column: HexColumn;
  readonly fileName: string;
  readonly widthBits: number;
  readonly signed: boolean;
  readonly digits: number;
  readonly text: string;
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

/** A W-bit word (W ≤ 32) as exactly `digits` hex digits, two's complement when negative. */
function hexWord(value: number, widthBits: number, digits: number): string {
  return (value < 0 ? value + 2 ** widthBits : value).toString(16).padStart(digits, '0');
}

function phaseWords(r: BitTrueRecord, widthBits: number, digits: number): string[] {
  const out = new Array<string>(r.length);
  for (let n = 0; n < r.length; n++) {
    const lo = r.phaseLo[n] as number;
    out[n] = widthBits <= 32
      ? hexWord(lo, widthBits, digits)
      : (r.phaseHi[n] as number).toString(16).padStart(digits - 8, '0') + lo.toString(16).padStart(8, '0');
  }
  return out;
}

export function hexMemoryFiles(spec: LoopSpec, golden: GoldenVectors): HexMemoryFile[] {
  const r = golden.record;
  return hexColumns(spec).map(({ column, widthBits, signed }) => {
    const digits = Math.ceil(widthBits / 4);
    let words: string[];
    if (column === 'nco_phase') words = phaseWords(r, widthBits, digits);
    else {
      const values = VALUES[column](r);
      words = Array.from({ length: r.length }, (_, n) => hexWord(values[n] as number, widthBits, digits));
    }
    return { column, fileName: hexFileName(spec.name, column), widthBits, signed, digits, text: `${words.join('\n')}\n` };
  });
}
