/**
 * Conformance: an uploaded capture in the golden-vector CSV layout (dsp's VECTOR_CSV_COLUMNS, one
 * header line, one row of decimal integers per sample) compared value by value with the release's
 * golden vectors. Parsing is csv-parse's (its synchronous API, in the compute pool), and a malformed
 * file is refused with the line that is wrong: a binary file before any parsing (it is not text, and
 * the parser's view of it means nothing to a reader), a file with more or fewer samples than the
 * golden vectors as having the wrong length; the comparison is dsp's compareVectors against the
 * release's stored golden CSV. Both run in the compute pool (workers/handoffTasks.ts), never on the
 * event loop.
 */
import { parse as parseSync } from 'csv-parse/sync';
import { compareVectors, VECTOR_CSV_COLUMNS, type GoldenVectors } from '@loopwright/dsp';
import { HIDDEN_TEXT_CHARACTERS } from '@loopwright/contract';
import { countText } from '../render/countText.ts';

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

/** A capture refused before comparison; `line` is null when no one line is at fault (the file's length). */
export class MalformedCapture extends Error {
  override readonly name = 'MalformedCapture';
  constructor(
    readonly line: number | null,
    message: string,
  ) {
    super(line === null ? message : `line ${line}: ${message}`);
  }
}

/** Control and direction characters shown as \u escapes, so a message quoting the file shows what is there and nothing hides. */
function printable(text: string, max = 80): string {
  const cut = text.length > max ? `${text.slice(0, max)}…` : text;
  return cut.replace(new RegExp(HIDDEN_TEXT_CHARACTERS.source, 'g'), (c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`);
}

/**
 * Refuse a file that is not text: a NUL or another control byte (tab, CR and LF aside) in the first
 * 64 KiB, or bytes that are not UTF-8 (common practice, no source: how tools tell text from binary).
 */
function refuseBinary(bytes: Uint8Array): void {
  const head = bytes.subarray(0, 65536);
  const at = head.findIndex((b) => b < 0x20 && b !== 0x09 && b !== 0x0a && b !== 0x0d);
  if (at >= 0) {
    const line = 1 + head.subarray(0, at).filter((b) => b === 0x0a).length;
    throw new MalformedCapture(line, `this is not a CSV text file (byte 0x${(head[at] as number).toString(16).padStart(2, '0')} at byte offset ${countText(at)}: binary data, such as a waveform database or an archive); export the run as CSV text`);
  }
  try {
    new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new MalformedCapture(null, 'this is not a CSV text file (it is not valid UTF-8 or ASCII text); export the run as CSV text');
  }
}

const INTEGER = /^-?[0-9]+$/;

const PARSE_OPTIONS = { skip_empty_lines: true, trim: true, bom: true, relax_column_count: true } as const;

/**
 * The line of the file record `index` (0: the header) starts on, for a message: csv-parse again with
 * `info`, up to that record. Only a refused file pays for it; line info on every record made the
 * parse of a 65 536-row capture twice as slow (440–490 against 220–300 ms CPU here).
 */
function lineOfRecord(buffer: Buffer, index: number): number {
  const records = parseSync(buffer, { ...PARSE_OPTIONS, info: true, to: index + 1 }) as unknown as { info: { lines: number } }[];
  return records[records.length - 1]?.info.lines ?? 1;
}

/**
 * Rows of integer strings, after checking the header and every cell (csv-parse), stopped at the first
 * row past `maxRows`: a capture longer than the release's vectors is refused there, without reading
 * the rest. Synchronous: it runs in the compute pool (workers/handoffTasks.ts), not on the event loop.
 */
export function readVectorCsv(bytes: Uint8Array, maxRows = Number.POSITIVE_INFINITY): string[][] {
  const want = VECTOR_CSV_COLUMNS.join(',');
  refuseBinary(bytes);
  const buffer = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  let records: string[][];
  try {
    records = parseSync(buffer, { ...PARSE_OPTIONS, ...(Number.isFinite(maxRows) ? { to: maxRows + 2 } : {}) }) as string[][];
  } catch (err) {
    const e = err as { lines?: number; message: string };
    throw new MalformedCapture(e.lines ?? 1, `not readable as CSV (${printable(e.message, 160)})`);
  }
  const [header, ...rows] = records;
  if (!header) throw new MalformedCapture(1, `the file is empty; expected the header ${want}`);
  if (header.join(',') !== want) throw new MalformedCapture(lineOfRecord(buffer, 0), `the header must be "${want}", got "${printable(header.join(','))}"`);
  if (rows.length > maxRows) {
    throw new MalformedCapture(lineOfRecord(buffer, maxRows + 1), `the file has the wrong length: the release's golden vectors hold ${countText(maxRows)} samples, and this file has more rows; compare the first ${countText(maxRows)} samples of the run`);
  }
  rows.forEach((row, i) => checkedRow(row, () => lineOfRecord(buffer, i + 1)));
  return rows;
}

function checkedRow(record: string[], line: () => number): string[] {
  if (record.length !== VECTOR_CSV_COLUMNS.length) throw new MalformedCapture(line(), `expected ${VECTOR_CSV_COLUMNS.length} values, got ${record.length}`);
  record.forEach((cell, i) => {
    if (!INTEGER.test(cell)) throw new MalformedCapture(line(), `column ${VECTOR_CSV_COLUMNS[i]}: "${printable(cell, 40)}" is not a decimal integer`);
  });
  return record;
}

/**
 * Rows of a release's stored golden CSV. The server wrote these bytes itself (dsp's formatVectorsCsv:
 * one header, "\n" line ends, plain decimal integers, nothing quoted), so a split reads them; csv-parse
 * took 610–700 ms CPU of a 65 536-row file here (load 15), most of a compare. Anything else is refused
 * as a damaged store, not read on.
 */
function storedGoldenRows(golden: Uint8Array): string[][] {
  const [header, ...lines] = Buffer.from(golden.buffer, golden.byteOffset, golden.byteLength).toString('utf8').split('\n');
  if (header !== VECTOR_CSV_COLUMNS.join(',') || lines.pop() !== '') throw new Error('the stored golden vectors are not in the release CSV layout');
  return lines.map((line, i) => {
    const cells = line.split(',');
    if (cells.length !== VECTOR_CSV_COLUMNS.length || !cells.every((c) => INTEGER.test(c))) throw new Error(`the stored golden vectors are damaged at line ${i + 2}`);
    return cells;
  });
}

/** A capture against a release's stored golden CSV, capped at the golden rows (run in the compute pool). */
export function compareCapture(golden: Uint8Array, capture: Uint8Array, scenario: GoldenVectors['scenario'], ncoAccumulatorBits: number): Comparison {
  const goldenRows = storedGoldenRows(golden);
  const rows = readVectorCsv(capture, goldenRows.length);
  // A short file (a header alone, a run cut off) is the wrong file or an unfinished run, not a list of
  // mismatching values: say so, with both counts.
  if (rows.length !== goldenRows.length) {
    const found = rows.length === 0 ? 'found none (the file holds the header only)' : `found ${countText(rows.length)}`;
    throw new MalformedCapture(null, `the file has the wrong length: expected ${countText(goldenRows.length)} samples (one row each after the header, as in the release's golden vectors), ${found}`);
  }
  return compareWithGolden(goldenFromRows(goldenRows, scenario, ncoAccumulatorBits), rows);
}

/** The stored golden CSV of a release as dsp's GoldenVectors (the stored bytes are the reference, not a recomputation). */
export function goldenFromRows(rows: readonly string[][], scenario: GoldenVectors['scenario'], ncoAccumulatorBits: number): GoldenVectors {
  const n = rows.length;
  const record = {
    length: n,
    inputCode: new Int32Array(n),
    phaseHi: new Uint32Array(n),
    phaseLo: new Uint32Array(n),
    tableAddress: new Int32Array(n),
    ncoCode: new Int32Array(n),
    detectorCode: new Int32Array(n),
    filterCode: new Int32Array(n),
  };
  rows.forEach((r, i) => {
    const phase = BigInt(r[2] ?? '0');
    record.inputCode[i] = Number(r[1]);
    record.phaseHi[i] = Number(phase >> 32n);
    record.phaseLo[i] = Number(phase & 0xffffffffn);
    record.tableAddress[i] = Number(r[3]);
    record.ncoCode[i] = Number(r[4]);
    record.detectorCode[i] = Number(r[5]);
    record.filterCode[i] = Number(r[6]);
  });
  return { scenario, ncoAccumulatorBits, record, checksum: 0 };
}

/**
 * dsp's compareVectors on the parsed rows; a missing or extra sample counts as one more mismatch
 * (dsp reports the row counts apart), listed in column "sample" when there is room.
 */
export function compareWithGolden(golden: GoldenVectors, got: readonly string[][]): Comparison {
  const rows = got.map((r) => Object.fromEntries(VECTOR_CSV_COLUMNS.map((c, i) => [c, r[i]])));
  const r = compareVectors(golden, rows, MAX_REPORTED_MISMATCHES);
  const mismatches: Mismatch[] = r.mismatches.map((m) => ({ sampleIndex: m.sample, column: m.column, expected: m.expected, got: m.actual }));
  const rowDifference = Math.abs(r.uploadedSamples - r.expectedSamples);
  for (let i = Math.min(r.uploadedSamples, r.expectedSamples); i < Math.max(r.uploadedSamples, r.expectedSamples) && mismatches.length < MAX_REPORTED_MISMATCHES; i++) {
    mismatches.push(i < r.expectedSamples ? { sampleIndex: i, column: 'sample', expected: String(i), got: '(missing)' } : { sampleIndex: i, column: 'sample', expected: '(no sample)', got: got[i]?.[0] ?? '' });
  }
  return {
    verdict: r.bitExact ? 'bit-exact' : 'mismatch',
    samplesCompared: Math.min(r.uploadedSamples, r.expectedSamples),
    mismatchCount: r.mismatchCount + rowDifference,
    firstMismatches: mismatches,
  };
}
