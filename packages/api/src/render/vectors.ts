/**
 * Golden vectors of a release: dsp's bit-true record of its default scenario, in dsp's CSV layout
 * (packages/dsp/src/vectors/vectorsCsv.ts). The column meanings below are keyed by dsp's column list,
 * so a column added there fails the type check here until README.txt describes it.
 */
import { vectorsCsvBytes, VECTOR_CSV_COLUMNS, type GoldenVectors, type LoopSpec, type Scenario } from '@loopwright/dsp';
import { asBuffer } from './artifactFile.ts';
import { hexMemoryFiles, type HexMemoryFile } from './hexVectors.ts';

type VectorColumn = (typeof VECTOR_CSV_COLUMNS)[number];

const COLUMN_MEANINGS: Readonly<Record<VectorColumn, string>> = {
  sample: 'sample index n, from 0',
  input_code: 'input sample x[n], dataBits signed, dataBits - 1 fraction bits',
  nco_phase: 'NCO phase accumulator at n before it advances, unsigned, nco.accumulatorBits wide',
  table_address: 'sine-table address of the NCO output: (phase >> (N - P)) + 2^(P-2) mod 2^P',
  nco_code: 'NCO output code, nco.amplitudeBits signed',
  detector_code: 'detector output u[n], dataBits signed',
  filter_code: 'loop-filter output y[n] (last section), dataBits signed',
};

export const VECTOR_COLUMNS: readonly { name: VectorColumn; meaning: string }[] = VECTOR_CSV_COLUMNS.map((name) => ({
  name,
  meaning: COLUMN_MEANINGS[name],
}));

export interface ReleaseVectors {
  /** The CSV's bytes (ASCII), as the release stores them. */
  readonly csv: Buffer;
  readonly columns: readonly { name: string; meaning: string }[];
  /** The same vectors as $readmemh files, one per column. */
  readonly hex: readonly HexMemoryFile[];
  /** Scenario, sample count and checksum, recorded in the manifest's results. */
  readonly summary: { readonly scenario: Scenario; readonly samples: number; readonly checksum: number };
}

/** A plan's golden vectors in the release's CSV and hex files, with the summary the manifest records. */
export function releaseVectors({ spec, goldenVectors: v }: { readonly spec: LoopSpec; readonly goldenVectors: GoldenVectors }): ReleaseVectors {
  return {
    csv: asBuffer(vectorsCsvBytes(v)),
    columns: VECTOR_COLUMNS,
    hex: hexMemoryFiles(spec, v),
    summary: { scenario: v.scenario, samples: v.record.length, checksum: v.checksum },
  };
}

