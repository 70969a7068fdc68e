/**
 * Golden vectors: the bit-true per-sample record a release ships as CSV and conformance uploads are
 * compared with (packages/dsp/README.md, "Golden vectors"). Deterministic: a fixed scenario and seed.
 */
import type { LoopSpec } from '../spec/schema.ts';
import type { Scenario } from '../spec/scenario.ts';
import type { BitTrueRecord } from '../types/sim.ts';
import { simulate } from '../sim/simulate.ts';

/** Samples in a release's golden vectors. */
export const GOLDEN_VECTOR_SAMPLES = 4096;

/**
 * The release's default scenario: a tone 1 % of the NCO pull range (0.01·gainHzPerUnit) off centre,
 * 30° initial phase, 40 dB SNR noise from seed 1, GOLDEN_VECTOR_SAMPLES samples. Acquisition, noise
 * and the 2·f ripple all exercise the arithmetic, so a firmware that gets any step wrong diverges.
 */
export function defaultGoldenScenario(spec: Pick<LoopSpec, 'sampleRateHz' | 'nco'>): Scenario {
  return {
    kind: 'tone',
    offsetHz: 0.01 * spec.nco.gainHzPerUnit,
    durationS: GOLDEN_VECTOR_SAMPLES / spec.sampleRateHz,
    snrDb: 40,
    seed: 1,
    initialPhaseDeg: 30,
  };
}

export interface GoldenVectors {
  readonly scenario: Scenario;
  readonly accumulatorBits: number;
  readonly record: BitTrueRecord;
  /** FNV-1a over the record (src/sim/checksum.ts). */
  readonly checksum: number;
}

/** Run the bit-true loop on the scenario (default: defaultGoldenScenario) and keep every sample. */
export function goldenVectors(spec: LoopSpec, scenario: Scenario = defaultGoldenScenario(spec)): GoldenVectors {
  const r = simulate(spec, scenario, { mode: 'bit-true', keepRecord: true });
  const bit = r.bitTrue;
  if (!bit?.record) throw new Error('bit-true run kept no record');
  return { scenario, accumulatorBits: spec.nco.accumulatorBits, record: bit.record, checksum: bit.checksum };
}
