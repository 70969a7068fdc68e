/**
 * Conformance check: rows of an uploaded vector CSV (already parsed, one object per row keyed by the
 * header names of VECTOR_CSV_COLUMNS) against the golden vectors. Values are compared as exact
 * integers (BigInt parse of the decimal text, so "+12", "012" and "12" agree and 64-bit phases are exact).
 */
import type { GoldenVectors } from './goldenVectors.ts';
import { VECTOR_CSV_COLUMNS, phaseDecimal, type VectorCsvColumn } from './vectorsCsv.ts';

export interface VectorMismatch {
  readonly sample: number;
  readonly column: VectorCsvColumn;
  readonly expected: string;
  readonly actual: string;
}

export interface VectorComparison {
  /** Every row present, every value equal, no row missing or extra. */
  readonly bitExact: boolean;
  readonly expectedSamples: number;
  readonly uploadedSamples: number;
  readonly missingColumns: readonly VectorCsvColumn[];
  /** Total mismatching values (all of them are counted; only the first few are listed). */
  readonly mismatchCount: number;
  readonly mismatches: readonly VectorMismatch[];
}

type Row = Readonly<Record<string, string | number | bigint | null | undefined>>;

function expectedValues(v: GoldenVectors, n: number): Record<VectorCsvColumn, string> {
  const r = v.record;
  return {
    sample: String(n),
    input_code: String(r.inputCode[n]),
    nco_phase: phaseDecimal(r.phaseHi[n] as number, r.phaseLo[n] as number),
    table_address: String(r.tableAddress[n]),
    nco_code: String(r.ncoCode[n]),
    detector_code: String(r.detectorCode[n]),
    filter_code: String(r.filterCode[n]),
  };
}

/** The canonical integer text of a cell, or null when it is not a plain decimal integer. */
function canonical(cell: Row[string]): string | null {
  if (cell === null || cell === undefined) return null;
  const text = String(cell).trim();
  if (!/^[+-]?\d+$/.test(text)) return null;
  return BigInt(text).toString();
}

export function compareVectors(golden: GoldenVectors, rows: readonly Row[], maxListed = 20): VectorComparison {
  const first = rows[0] ?? {};
  const missingColumns = VECTOR_CSV_COLUMNS.filter((c) => !(c in first));
  const expectedSamples = golden.record.length;
  const mismatches: VectorMismatch[] = [];
  let mismatchCount = 0;
  const compared = Math.min(rows.length, expectedSamples);
  for (let n = 0; n < compared && missingColumns.length === 0; n++) {
    const want = expectedValues(golden, n);
    const row = rows[n] as Row;
    for (const column of VECTOR_CSV_COLUMNS) {
      // A cell already in canonical form (what a capture mostly holds) needs no BigInt round trip.
      if (row[column] === want[column]) continue;
      const got = canonical(row[column]);
      if (got === want[column]) continue;
      mismatchCount++;
      if (mismatches.length < maxListed) mismatches.push({ sample: n, column, expected: want[column], actual: String(row[column] ?? '') });
    }
  }
  return {
    bitExact: missingColumns.length === 0 && mismatchCount === 0 && rows.length === expectedSamples,
    expectedSamples,
    uploadedSamples: rows.length,
    missingColumns,
    mismatchCount,
    mismatches,
  };
}
