import { describe, expect, it } from 'vitest';
import { goldenVectors } from '../../src/planDesign.ts';
import { formatVectorsCsv, VECTOR_CSV_COLUMNS } from '../../src/vectors/vectorsCsv.ts';
import { compareVectors } from '../../src/vectors/compareVectors.ts';
import { ultrasonicSinglePoleSpec } from '../../src/spec/examples.ts';

/** A minimal header-keyed parse of our own CSV (the API uses a CSV library for uploads). */
function rowsOf(csv: string): Record<string, string>[] {
  const [head, ...lines] = csv.trimEnd().split('\n');
  const cols = (head ?? '').split(',');
  return lines.map((l) => Object.fromEntries(l.split(',').map((v, i) => [cols[i] ?? '', v])));
}

describe('compareVectors', () => {
  const golden = goldenVectors(ultrasonicSinglePoleSpec);
  const rows = rowsOf(formatVectorsCsv(golden));

  it('finds the golden CSV bit-exact with itself', () => {
    const r = compareVectors(golden, rows);
    expect(r.bitExact).toBe(true);
    expect(r.mismatchCount).toBe(0);
  });

  it('reports the first mismatching sample and column, expected and actual', () => {
    const changed = rows.map((r) => ({ ...r }));
    changed[100]!['filter_code'] = String(Number(changed[100]!['filter_code']) + 1);
    changed[200]!['nco_phase'] = String(BigInt(changed[200]!['nco_phase']!) + 1n);
    const r = compareVectors(golden, changed);
    expect(r.bitExact).toBe(false);
    expect(r.mismatchCount).toBe(2);
    expect(r.mismatches[0]).toMatchObject({ sample: 100, column: 'filter_code', expected: rows[100]!['filter_code'] });
  });

  it('treats missing rows, missing columns and non-integers as failures', () => {
    expect(compareVectors(golden, rows.slice(0, 10)).bitExact).toBe(false);
    const noCol = rows.map(({ detector_code: _d, ...rest }) => rest);
    expect(compareVectors(golden, noCol).missingColumns).toEqual(['detector_code']);
    const junk = rows.map((r) => ({ ...r }));
    junk[3]!['input_code'] = '1.5';
    expect(compareVectors(golden, junk).mismatches[0]).toMatchObject({ sample: 3, column: 'input_code', actual: '1.5' });
    // Leading '+' and zeros are the same integer.
    const padded = rows.map((r) => ({ ...r, sample: `+0${r['sample']}` }));
    expect(compareVectors(golden, padded).bitExact).toBe(true);
    expect(VECTOR_CSV_COLUMNS).toContain('nco_phase');
  });
});
