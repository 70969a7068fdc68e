/**
 * NCO sine table: 2^P entries of B-bit signed codes, entry k = round((2^(B−1) − 1)·sin(2πk/2^P)).
 * Full scale is 2^(B−1) − 1 so the table is symmetric (−FS is representable; −2^(B−1) would have no
 * positive twin). Only the first quarter is computed with sin; the rest is mirrored, which makes the
 * odd and half-wave symmetries exact (common practice, no source).
 */
import { requireWidth } from '../spec/limits.ts';
import { roundReal } from '../fixed/rounding.ts';

/** Largest code of the table, 2^(B−1) − 1. */
export function sineFullScale(amplitudeBits: number): number {
  return 2 ** (amplitudeBits - 1) - 1;
}

/** Tables already computed, by `${phaseBits}/${amplitudeBits}`; a few, since a session edits one design at a time. */
const TABLES = new Map<string, Int32Array>();
const TABLES_KEPT = 4;

/**
 * The sine table as Int32Array (phaseBits ≥ 2 so the quarter-wave offset of cos is a whole address).
 * Every call returns an array of its own, copied from one computed once per widths: a plan may hand its
 * table to a worker or a file, and no other plan may see that.
 */
export function sineTable(phaseBits: number, amplitudeBits: number): Int32Array {
  requireWidth('nco.phaseBits', phaseBits);
  requireWidth('nco.amplitudeBits', amplitudeBits);
  const key = `${phaseBits}/${amplitudeBits}`;
  let table = TABLES.get(key);
  if (!table) {
    table = computeSineTable(phaseBits, amplitudeBits);
    if (TABLES.size >= TABLES_KEPT) TABLES.delete(TABLES.keys().next().value as string);
    TABLES.set(key, table);
  }
  return table.slice();
}

function computeSineTable(phaseBits: number, amplitudeBits: number): Int32Array {
  const size = 2 ** phaseBits;
  const quarter = size / 4;
  const fullScale = sineFullScale(amplitudeBits);
  const table = new Int32Array(size);
  for (let k = 0; k <= quarter; k++) {
    const code = roundReal(fullScale * Math.sin((2 * Math.PI * k) / size), 'nearest');
    table[k] = code;
    table[2 * quarter - k] = code;
    if (k > 0) table[size - k] = -code;
    table[2 * quarter + k] = -code;
  }
  table[0] = 0;
  table[2 * quarter] = 0;
  return table;
}
