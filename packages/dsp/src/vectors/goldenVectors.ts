/**
 * Golden vectors: the bit-true per-sample record a release ships as CSV and conformance uploads are
 * compared with (packages/dsp/README.md, "Golden vectors"). Deterministic: a fixed scenario and seed.
 */
import type { LoopSpec } from '../spec/schema.ts';
import { scenarioRateIssue, type Scenario } from '../spec/scenario.ts';
import { FieldError } from '../fixed/fieldError.ts';
import type { BitTrueRecord } from '../types/sim.ts';
import { bitTrueRecordOf, type SimLoop } from '../sim/simulate.ts';

/**
 * Samples in a release's golden vectors: 2^16. The demo loops lock after 112–900 samples of the
 * default scenario (bit-true lock time); the rest is settled tracking, where a firmware's slow
 * integrator drift or a rare overflow under noise shows long after the first few thousand samples.
 * packages/api/bench/release-bench.ts measures what it costs a cut. The reference RTL testbenches
 * replay a prefix of it (packages/api/src/render/rtl.ts, RTL_REPLAY_SAMPLES).
 */
export const GOLDEN_VECTOR_SAMPLES = 65_536;

/**
 * The release's default scenario: a tone 1 % of the NCO pull range (0.01·gainHzPerUnit) off centre,
 * 30° initial phase, 40 dB SNR noise from seed 1, GOLDEN_VECTOR_SAMPLES samples. Acquisition, noise
 * and the 2·f ripple all exercise the arithmetic, so a firmware that gets any step wrong diverges.
 * The first samples of a longer record are those of a shorter one (same seed, same loop).
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
  /** N, the NCO's phase accumulator (nco.accumulatorBits): the width of the nco_phase column. */
  readonly ncoAccumulatorBits: number;
  readonly record: BitTrueRecord;
  /** FNV-1a over the record (src/sim/checksum.ts). */
  readonly checksum: number;
}

/**
 * The default scenario is the server's, not the designer's: when the spec cannot run it (its tone,
 * 0.01·gainHzPerUnit above centerHz, lands at or past sampleRateHz/2), the spec field that sets the
 * offset is the one to change, so that is the field named.
 */
function checkDefaultScenario(spec: SimLoop['spec'], scenario: Scenario): void {
  const issue = scenarioRateIssue(spec, scenario);
  if (!issue || scenario.kind !== 'tone') return;
  const inputHz = spec.centerHz + scenario.offsetHz;
  throw new FieldError(
    'nco.gainHzPerUnit',
    `nco.gainHzPerUnit ${spec.nco.gainHzPerUnit}: the golden-vector scenario is a tone 0.01·nco.gainHzPerUnit = ${scenario.offsetHz} Hz above centerHz ${spec.centerHz} Hz, at ${inputHz} Hz, which is not below sampleRateHz/2 = ${spec.sampleRateHz / 2} Hz; lower nco.gainHzPerUnit or centerHz`,
  );
}

/** A release's golden vectors: the planned loop on its default scenario (defaultGoldenScenario). */
export function releaseGoldenVectors(loop: SimLoop): GoldenVectors {
  const scenario = defaultGoldenScenario(loop.spec);
  checkDefaultScenario(loop.spec, scenario);
  return goldenVectorsOf(loop, scenario);
}

/**
 * Run a planned loop's bit-true constants (planDesign's `bitTrue`, the ones the release renders) on
 * the scenario and keep every sample (the record alone: traces and metrics are not part of vectors).
 */
export function goldenVectorsOf(loop: SimLoop, scenario: Scenario): GoldenVectors {
  const { record, checksum } = bitTrueRecordOf(loop, scenario);
  return { scenario, ncoAccumulatorBits: loop.spec.nco.accumulatorBits, record, checksum };
}
