/**
 * A 'both' simulation from its two halves. The float and the bit-true loop share only their input
 * samples (each run's traces and metrics are its own; nothing compares the two), so a mode 'float'
 * run and a mode 'bit-true' run of the same plan and scenario are the two halves of the mode 'both'
 * run, and the halves can run on two cores. The merge gives the members in the order simulateLoop
 * and simulatePlan write them, so JSON.stringify of the merge is byte for byte that of the run.
 */
import type { SpecWarning } from '../spec/schema.ts';
import type { BitTrueRun, SimResult, SimRun } from '../types/sim.ts';

/**
 * A simulation result whose runs and plan may be held in another form (e.g. already encoded as
 * JSON by the thread that ran them); SimResult is its form with the runs themselves.
 */
export interface SimResultParts<F, B, P> {
  readonly sampleCount: number;
  readonly sampleRateHz: number;
  readonly durationS: number;
  readonly float?: F;
  readonly bitTrue?: B;
  readonly plan?: P;
  readonly warnings?: readonly SpecWarning[];
}

/** The 'both' result of a mode 'float' and a mode 'bit-true' result of one plan and scenario. */
export function mergeSimResults(floatPart: SimResult, bitTruePart: SimResult): SimResult;
export function mergeSimResults<F, B, P>(floatPart: SimResultParts<F, B, P>, bitTruePart: SimResultParts<F, B, P>): SimResultParts<F, B, P>;
export function mergeSimResults<F = SimRun, B = BitTrueRun, P = unknown>(floatPart: SimResultParts<F, B, P>, bitTruePart: SimResultParts<F, B, P>): SimResultParts<F, B, P> {
  const { float } = floatPart;
  const { bitTrue, plan } = bitTruePart;
  if (float === undefined || floatPart.bitTrue !== undefined) throw new Error('mergeSimResults: the first part must be a float-only run');
  if (bitTrue === undefined || bitTruePart.float !== undefined) throw new Error('mergeSimResults: the second part must be a bit-true-only run');
  const { sampleCount, sampleRateHz, durationS, warnings } = floatPart;
  if (sampleCount !== bitTruePart.sampleCount || sampleRateHz !== bitTruePart.sampleRateHz || durationS !== bitTruePart.durationS) {
    throw new Error(`mergeSimResults: the parts are of different runs (${sampleCount} and ${bitTruePart.sampleCount} samples)`);
  }
  // The warnings are the plan's and the scenario's (simulatePlan), so both parts carry the same.
  if (JSON.stringify(warnings) !== JSON.stringify(bitTruePart.warnings)) throw new Error('mergeSimResults: the parts carry different warnings');
  return {
    sampleCount,
    sampleRateHz,
    durationS,
    float,
    bitTrue,
    ...(plan !== undefined ? { plan } : {}),
    ...(warnings !== undefined ? { warnings } : {}),
  };
}
