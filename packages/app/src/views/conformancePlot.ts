/**
 * What the conformance page plots around a capture's first mismatch: the golden column from the
 * release's stored vectors and the uploaded values as far as the stored run knows them. The run keeps
 * the first mismatches only (not the capture), so the uploaded value of a sample is the golden one
 * unless listed, up to the last listed mismatch when more were found than listed, and unknown after.
 */
import type { ConformanceRecord } from '@loopwright/contract';

export interface MismatchWindow {
  readonly column: string;
  readonly firstSample: number;
  readonly samples: readonly number[];
  readonly golden: readonly number[];
  /** null where the stored run cannot say what the capture held. */
  readonly uploaded: readonly (number | null)[];
  readonly mismatchSamples: readonly number[];
}

/** Samples either side of the first mismatch. */
export const WINDOW_HALF_WIDTH = 24;

/** Rows of the golden-vector CSV (our own file: a header, then decimal integers separated by commas). */
function goldenRows(csv: string): { header: string[]; rows: string[][] } {
  const lines = csv.split(/\r?\n/).filter((l) => l.trim() !== '');
  return { header: (lines[0] ?? '').split(','), rows: lines.slice(1).map((l) => l.split(',')) };
}

export function mismatchWindow(goldenCsv: string, run: Pick<ConformanceRecord, 'firstMismatches' | 'mismatchCount'>, halfWidth = WINDOW_HALF_WIDTH): MismatchWindow | null {
  const first = run.firstMismatches.find((m) => m.column !== 'sample');
  if (!first) return null;
  const { header, rows } = goldenRows(goldenCsv);
  const column = header.indexOf(first.column);
  if (column < 0 || rows.length === 0) return null;
  const listed = new Map(run.firstMismatches.filter((m) => m.column === first.column).map((m) => [m.sampleIndex, Number(m.got)]));
  const lastListed = Math.max(...run.firstMismatches.map((m) => m.sampleIndex));
  const knownUntil = run.mismatchCount > run.firstMismatches.length ? lastListed : Number.POSITIVE_INFINITY;
  const start = Math.max(0, first.sampleIndex - halfWidth);
  const end = Math.min(rows.length - 1, first.sampleIndex + halfWidth);
  const samples: number[] = [];
  const golden: number[] = [];
  const uploaded: (number | null)[] = [];
  for (let s = start; s <= end; s++) {
    const g = Number(rows[s]?.[column]);
    samples.push(s);
    golden.push(g);
    uploaded.push(listed.get(s) ?? (s <= knownUntil ? g : null));
  }
  return { column: first.column, firstSample: first.sampleIndex, samples, golden, uploaded, mismatchSamples: [...listed.keys()].filter((s) => s >= start && s <= end) };
}
