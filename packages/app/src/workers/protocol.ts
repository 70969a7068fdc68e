/**
 * Messages between the app and its DSP worker. The worker runs packages/dsp itself, so the
 * editor never asks the server while the user types (DESIGN.md "The flow", step 1).
 */
import type { LoopSpec } from '@loopwright/dsp';
import type { DspJobKind, DspJobInput, DspJobOutput } from './dspJobs.ts';

export type { DspJobKind, DspJobInput, DspJobOutput };

export type ToWorker =
  | { readonly type: 'run'; readonly id: number; readonly job: DspJobKind; readonly spec: LoopSpec; readonly input: unknown }
  | { readonly type: 'cancel'; readonly id: number }
  /** Analyse dsp's warm-up specs in the background and answer nothing (jobServer.ts). */
  | { readonly type: 'warmUp' };

export type FromWorker =
  | { readonly type: 'progress'; readonly id: number; readonly fraction: number; readonly label?: string }
  | { readonly type: 'done'; readonly id: number; readonly output: unknown; readonly elapsedMs: number }
  | { readonly type: 'failed'; readonly id: number; readonly message: string; readonly cancelled: boolean };
