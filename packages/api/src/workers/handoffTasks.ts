/**
 * The hand-off's CPU-heavy steps, run in the compute pool (workers/compute.ts) so a request never holds
 * the event loop: a release cut's computation and rendering (seconds for a 65,536-entry sine table),
 * and a conformance upload's parsing and comparison (megabytes of CSV). Plain data in and out; input
 * errors are returned, because an Error crossing the thread boundary keeps only its message.
 */
import { createHash } from 'node:crypto';
import type { GoldenVectors } from '@loopwright/dsp';
import { renderArtifacts, type RenderedRelease } from '../render/artifacts.ts';
import { computeRelease, RenderInputError } from '../render/compute.ts';
import { compareCapture, MalformedCapture, type Comparison } from '../releases/vectorCompare.ts';

export interface ReleaseRenderTask {
  readonly kind: 'release';
  readonly spec: unknown;
}

export interface ConformanceTask {
  readonly kind: 'conformance';
  /** The release's stored golden-vector CSV. */
  readonly golden: Uint8Array;
  /** The uploaded capture. */
  readonly capture: Uint8Array;
  readonly scenario: GoldenVectors['scenario'];
  /** nco.accumulatorBits of the release's spec. */
  readonly ncoAccumulatorBits: number;
}

export type HandoffTask = ReleaseRenderTask | ConformanceTask;

/** A field-named refusal: `field` is a spec path for a release, "" (the file) for a capture. */
export type HandoffFailure = { readonly ok: false; readonly issues: readonly { field: string; message: string }[]; readonly prefix: 'spec' | 'file' };

export type HandoffOutcome =
  | { readonly ok: true; readonly kind: 'release'; readonly rendered: RenderedRelease }
  | { readonly ok: true; readonly kind: 'conformance'; readonly comparison: Comparison; readonly sha256: string }
  | HandoffFailure;

export function runHandoffTask(task: HandoffTask): HandoffOutcome {
  if (task.kind === 'release') {
    const computed = computeRelease(task.spec);
    if (!computed.ok) return { ok: false, issues: computed.issues, prefix: 'spec' };
    try {
      return { ok: true, kind: 'release', rendered: renderArtifacts(computed.release) };
    } catch (err) {
      if (err instanceof RenderInputError) return { ok: false, issues: [{ field: err.field, message: err.message }], prefix: 'spec' };
      throw err;
    }
  }
  try {
    const comparison = compareCapture(task.golden, task.capture, task.scenario, task.ncoAccumulatorBits);
    return { ok: true, kind: 'conformance', comparison, sha256: createHash('sha256').update(task.capture).digest('hex') };
  } catch (err) {
    if (err instanceof MalformedCapture) return { ok: false, issues: [{ field: '', message: err.message }], prefix: 'file' };
    throw err;
  }
}
