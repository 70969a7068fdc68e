/**
 * Plain-JSON form of a simulation result for the API and CLI: typed arrays become number arrays
 * (JSON.stringify would turn a Float64Array into an object keyed "0", "1", …), non-finite values
 * become null, and the per-sample record and sine table are left out (they have their own outputs:
 * golden vectors CSV, release artifacts).
 */
import type { DecimatedTrace, SimResult, SimRun, SimTraces } from '../types/sim.ts';

export interface JsonTrace {
  readonly bucketStartS: readonly (number | null)[];
  readonly min: readonly (number | null)[];
  readonly max: readonly (number | null)[];
}

export interface JsonSimRun {
  readonly traces: Readonly<Record<Exclude<keyof SimTraces, 'inputFrequencyHz'>, JsonTrace>> & { readonly inputFrequencyHz?: JsonTrace };
  readonly metrics: SimRun['metrics'];
  readonly checksum?: number;
}

export interface JsonSimResult {
  readonly sampleCount: number;
  readonly sampleRateHz: number;
  readonly durationS: number;
  readonly float?: JsonSimRun;
  readonly bitTrue?: JsonSimRun;
  readonly warnings?: SimResult['warnings'];
}

const finite = (v: number): number | null => (Number.isFinite(v) ? v : null);

function trace(t: DecimatedTrace): JsonTrace {
  return { bucketStartS: Array.from(t.bucketStartS, finite), min: Array.from(t.min, finite), max: Array.from(t.max, finite) };
}

function run(r: SimRun, checksum?: number): JsonSimRun {
  const t = r.traces;
  const traces = {
    phaseErrorRad: trace(t.phaseErrorRad),
    filterOutput: trace(t.filterOutput),
    ncoFrequencyHz: trace(t.ncoFrequencyHz),
    lockIndicator: trace(t.lockIndicator),
    ...(t.inputFrequencyHz ? { inputFrequencyHz: trace(t.inputFrequencyHz) } : {}),
  };
  return checksum === undefined ? { traces, metrics: r.metrics } : { traces, metrics: r.metrics, checksum };
}

export function simResultToJson(r: SimResult): JsonSimResult {
  return {
    sampleCount: r.sampleCount,
    sampleRateHz: r.sampleRateHz,
    durationS: r.durationS,
    ...(r.float ? { float: run(r.float) } : {}),
    ...(r.bitTrue ? { bitTrue: run(r.bitTrue, r.bitTrue.checksum) } : {}),
    ...(r.warnings ? { warnings: r.warnings } : {}),
  };
}
