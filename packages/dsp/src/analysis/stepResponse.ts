/**
 * Closed-loop step responses of the linearised loop for plotting: the phase error θi − θo after a
 * 1 rad phase step and after a 1 Hz frequency step (input phase 2π·t), both at t = 0.
 * When the plot spans at most MAX_SAMPLES loop samples, the discrete loop runs sample by sample as
 * firmware does — e = θi − θo, u = F(z)·e through the second-order sections, θo ← θo + K·T·u (the NCO
 * accumulator with its sample of delay, DESIGN.md) — which stays exact where a closed-loop b/a would
 * lose digits. Longer spans use the analog prototype's E(s) = 1/(1 + L(s)), discretised by the
 * bilinear transform at a rate giving MAX_SAMPLES samples (source: "analog").
 */
import type { AnalogTf, Sos } from '../types/filter.ts';
import type { StepResponses } from '../types/analysis.ts';
import { bilinearTf } from '../filters/bilinear.ts';
import { runFilter } from './filterRun.ts';
import { type KernelStepJob, kernelDiscreteSteps } from './wasm/analysisKernel.ts';

export const MAX_SAMPLES = 20_000;
export const PLOT_POINTS = 400;
/** Phase errors beyond this (rad) end the traces of an unstable loop (flagged `diverged`). */
export const DIVERGED_RAD = 1e6;

/** The traces being kept (every stride-th sample: `kept` of them so far) and whether the loop diverged before their end. */
export interface Traces {
  readonly timeS: number[];
  readonly phaseStepErrorRad: number[];
  readonly frequencyStepErrorRad: number[];
  kept: number;
  diverged: boolean;
}

/**
 * Room for `length` kept samples, as arrays of doubles from the start: the first kept values (t = 0,
 * errors 1 and 0) are integers, and arrays that began as small integers took the loop's optimised code
 * out twice per call in the first analyses when the doubles came (a wrong map, a lost precision).
 */
function doubles(length: number): number[] {
  return new Array<number>(length).fill(0.5);
}

/** The discrete loop's constants: its sections' coefficients (b0 b1 b2 a1 a2 each), K·T, T and 2π·T. */
export interface StepLoop {
  readonly coef: Float64Array;
  readonly kt: number;
  readonly t: number;
  readonly twoPiT: number;
}

export function stepLoop(sections: readonly Sos[], kRadPerS: number, sampleRateHz: number): StepLoop {
  const t = 1 / sampleRateHz;
  const coef = new Float64Array(5 * sections.length);
  for (let j = 0; j < sections.length; j++) {
    const { b, a } = sections[j]!;
    coef.set([b[0], b[1], b[2], a[1], a[2]], 5 * j);
  }
  return { coef, kt: kRadPerS / sampleRateHz, t, twoPiT: 2 * Math.PI * t };
}

/**
 * The discrete steps in the analysis's WebAssembly module (wasm/analysisKernel.ts, the same doubles as
 * runDiscreteSteps), copied into `out`; false when the module cannot run them.
 */
export function kernelSteps(loop: StepLoop, n: number, stride: number, out: Traces): boolean {
  const run = kernelDiscreteSteps(loop.coef, loop.kt, loop.t, loop.twoPiT, n, stride, DIVERGED_RAD);
  if (!run) return false;
  for (let i = 0; i < run.kept; i++) {
    out.timeS[i] = run.timeS[i]!;
    out.phaseStepErrorRad[i] = run.phaseStepErrorRad[i]!;
    out.frequencyStepErrorRad[i] = run.frequencyStepErrorRad[i]!;
  }
  out.kept = run.kept;
  out.diverged = run.diverged;
  return true;
}

/**
 * The discrete loop for a 1 rad phase step (DF2T sections), n samples, keeping every stride-th sample's
 * errors in `out` as it runs (no array of every sample, no second pass over one). The loop is linear and
 * the 1 Hz step's input phase 2π·i·T is a sum of i steps of 2π·T, so its error is 2π·T times the running
 * sum of the phase-step error over the earlier samples. The coefficients are read once into a typed
 * array (this loop runs up to MAX_SAMPLES times per section). Nothing follows the loop but the return:
 * code after a hot loop runs in the loop's on-stack-replaced compile without type feedback.
 */
export function runDiscreteSteps(loop: StepLoop, n: number, stride: number, out: Traces): void {
  const { coef, kt, t, twoPiT } = loop;
  const k = coef.length / 5;
  const state = new Float64Array(2 * k);
  let thetaO = 0;
  let before = 0;
  for (let i = 0, untilKept = 0; i < n; i++, untilKept--) {
    const e = 1 - thetaO;
    const f = twoPiT * before;
    before += e;
    if (!(Math.abs(f) < DIVERGED_RAD && Math.abs(e) < DIVERGED_RAD)) {
      out.diverged = true; // an unstable loop: the linear model means nothing past here
      return;
    }
    if (untilKept === 0) {
      untilKept = stride; // every stride-th sample, as i % stride === 0
      out.timeS[out.kept] = i * t;
      out.phaseStepErrorRad[out.kept] = e;
      out.frequencyStepErrorRad[out.kept] = f;
      out.kept++;
    }
    let x = e;
    for (let j = 0; j < k; j++) {
      const o = 5 * j;
      const y = coef[o]! * x + state[2 * j]!;
      state[2 * j] = coef[o + 1]! * x - coef[o + 3]! * y + state[2 * j + 1]!;
      state[2 * j + 1] = coef[o + 2]! * x - coef[o + 4]! * y;
      x = y;
    }
    thetaO += kt * x;
  }
}

/** The same traces from every sample's phase-step error of the analog prototype's E(z) at rateHz (see runDiscreteSteps). */
function analogSteps(phase: readonly number[], rateHz: number, stride: number, out: Traces): void {
  const t = 1 / rateHz;
  const twoPiT = 2 * Math.PI * t;
  let before = 0;
  for (let i = 0; i < phase.length; i++) {
    const p = phase[i]!;
    const f = twoPiT * before;
    before += p;
    if (!(Math.abs(f) < DIVERGED_RAD && Math.abs(p) < DIVERGED_RAD)) {
      out.diverged = true;
      return;
    }
    if (i % stride !== 0) continue;
    out.timeS[out.kept] = i * t;
    out.phaseStepErrorRad[out.kept] = p;
    out.frequencyStepErrorRad[out.kept] = f;
    out.kept++;
  }
}

/** Step responses over durationS seconds: the discrete loop with `sections`, or E(s) for long spans. */
export function stepResponses(
  sections: readonly Sos[],
  analogE: AnalogTf,
  kRadPerS: number,
  sampleRateHz: number,
  durationS: number,
): StepResponses {
  return finishStepResponses(stepResponsesJob(sections, analogE, kRadPerS, sampleRateHz, durationS));
}

/** stepResponses in two parts: what to run (and, for the discrete loop, a run the analysis module may make beside another: kernel), then finishStepResponses. */
export interface StepResponsesJob {
  readonly source: 'discrete' | 'analog';
  readonly n: number;
  readonly stride: number;
  readonly traces: Traces;
  readonly analogE: AnalogTf;
  readonly durationS: number;
  readonly loop: StepLoop | null;
  readonly kernel: KernelStepJob | null;
}

export function stepResponsesJob(sections: readonly Sos[], analogE: AnalogTf, kRadPerS: number, sampleRateHz: number, durationS: number): StepResponsesJob {
  const loopSamples = Math.ceil(durationS * sampleRateHz);
  const useDiscrete = loopSamples <= MAX_SAMPLES;
  const n = useDiscrete ? loopSamples : MAX_SAMPLES;
  const stride = Math.max(1, Math.floor(n / PLOT_POINTS));
  const room = Math.ceil(n / stride);
  const traces: Traces = { timeS: doubles(room), phaseStepErrorRad: doubles(room), frequencyStepErrorRad: doubles(room), kept: 0, diverged: false };
  const loop = useDiscrete ? stepLoop(sections, kRadPerS, sampleRateHz) : null;
  const kernel: KernelStepJob | null = loop ? { coef: loop.coef, kt: loop.kt, t: loop.t, twoPiT: loop.twoPiT, n, stride, divergedRad: DIVERGED_RAD, out: traces, ran: false } : null;
  return { source: useDiscrete ? 'discrete' : 'analog', n, stride, traces, analogE, durationS, loop, kernel };
}

/** The step responses of a job: its discrete run as the analysis module made it, or run now. */
export function finishStepResponses(job: StepResponsesJob): StepResponses {
  const { n, stride, traces, loop } = job;
  if (loop) {
    if (!job.kernel?.ran && !kernelSteps(loop, n, stride, traces)) runDiscreteSteps(loop, n, stride, traces);
  }
  else {
    const rateHz = MAX_SAMPLES / job.durationS;
    analogSteps(runFilter(bilinearTf(job.analogE, rateHz, null), n, () => 1, 1), rateHz, stride, traces);
  }
  const { timeS, phaseStepErrorRad, frequencyStepErrorRad, kept, diverged } = traces;
  timeS.length = kept;
  phaseStepErrorRad.length = kept;
  frequencyStepErrorRad.length = kept;
  return { source: job.source, timeS, phaseStepErrorRad, frequencyStepErrorRad, diverged };
}
