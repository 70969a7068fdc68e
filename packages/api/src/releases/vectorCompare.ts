/**
 * Conformance: an uploaded capture in the golden-vector CSV layout (dsp's VECTOR_CSV_COLUMNS, one
 * header line, one row of decimal integers per sample) compared value by value with the release's
 * golden vectors. Parsing is csv-parse's; a malformed file is refused with the line that is wrong.
 */
import { parse } from 'csv-parse/sync';
import { VECTOR_CSV_COLUMNS } from '@loopwright/dsp';

export const MAX_REPORTED_MISMATCHES = 10;

export interface Mismatch {
  readonly sampleIndex: number;
  readonly column: string;
  readonly expected: string;
  readonly got: string;
}

export interface Comparison {
  readonly verdict: 'bit-exact' | 'mismatch';
  readonly samplesCompared: number;
  readonly mismatchCount: number;
  readonly firstMismatches: readonly Mismatch[];
}

export class MalformedCapture extends Error {
  override readonly name = 'MalformedCapture';
  constructor(
    readonly line: number,
    message: string,
  ) {
    super(`line ${line}: ${message}`);
  }
}

const INTEGER = /^-?[0-9]+$/;

/** Rows of integer strings, after checking the header and every cell. */
export function parseVectorCsv(text: string): string[][] {
  if (text.trim() === '') throw new MalformedCapture(1, 'the file is empty; expected the header ' + VECTOR_CSV_COLUMNS.join(','));
  let rows: { record: string[]; info: { lines: number } }[];
  try {
    rows = parse(text, { skip_empty_lines: true, trim: true, info: true, bom: true, relax_column_count: true }) as unknown as { record: string[]; info: { lines: number } }[];
  } catch (err) {
    const e = err as { lines?: number; message: string };
    throw new MalformedCapture(e.lines ?? 1, `not readable as CSV (${e.message})`);
  }
  const [header, ...body] = rows;
  if (!header) throw new MalformedCapture(1, 'no header line');
  const want = VECTOR_CSV_COLUMNS.join(',');
  if (header.record.join(',') !== want) {
    throw new MalformedCapture(header.info.lines, `the header must be "${want}", got "${header.record.join(',')}"`);
  }
  return body.map(({ record, info }) => {
    if (record.length !== VECTOR_CSV_COLUMNS.length) {
      throw new MalformedCapture(info.lines, `expected ${VECTOR_CSV_COLUMNS.length} values, got ${record.length}`);
    }
    record.forEach((cell, i) => {
      if (!INTEGER.test(cell)) throw new MalformedCapture(info.lines, `column ${VECTOR_CSV_COLUMNS[i]}: "${cell.slice(0, 40)}" is not a decimal integer`);
    });
    return record;
  });
}

/** Integers compared as text after normalising (-0, leading zeros), so 64-bit values stay exact. */
function normal(v: string): string {
  const n = BigInt(v);
  return n.toString();
}

export function compareVectors(golden: readonly string[][], got: readonly string[][]): Comparison {
  const mismatches: Mismatch[] = [];
  let count = 0;
  const add = (m: Mismatch) => {
    count++;
    if (mismatches.length < MAX_REPORTED_MISMATCHES) mismatches.push(m);
  };
  const n = Math.max(golden.length, got.length);
  for (let i = 0; i < n; i++) {
    const e = golden[i];
    const g = got[i];
    if (!e) {
      add({ sampleIndex: i, column: 'sample', expected: '(no sample)', got: g?.[0] ?? '' });
      continue;
    }
    if (!g) {
      add({ sampleIndex: i, column: 'sample', expected: e[0] ?? String(i), got: '(missing)' });
      continue;
    }
    VECTOR_CSV_COLUMNS.forEach((column, c) => {
      const ev = e[c] ?? '';
      const gv = g[c] ?? '';
      if (normal(ev) !== normal(gv)) add({ sampleIndex: i, column, expected: ev, got: gv });
    });
  }
  return {
    verdict: count === 0 ? 'bit-exact' : 'mismatch',
    samplesCompared: Math.min(golden.length, got.length),
    mismatchCount: count,
    firstMismatches: mismatches,
  };
}
