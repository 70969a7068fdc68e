/** Golden vectors of a release (placeholder until dsp's goldenVectors lands). */
import type { LoopSpec } from '@loopwright/dsp';

export interface ReleaseVectors {
  readonly csv: string;
  readonly columns: readonly { name: string; meaning: string }[];
  readonly summary: Record<string, unknown>;
}

export function goldenVectorsFor(_spec: LoopSpec): ReleaseVectors {
  return { csv: 'sample\n', columns: [{ name: 'sample', meaning: 'pending' }], summary: {} };
}
