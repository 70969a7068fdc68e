/**
 * The loop's input, chunk by chunk: x[n] = A_in·sin(2π·φi[n]) + noise (DESIGN.md conventions), with
 * the input phase φi in cycles advanced by f_i[n]/fs per sample, f_i = centerHz + the scenario's
 * frequency offset. Phase is kept modulo 1 cycle so long runs lose no precision.
 */
import { sweepLegS, type Scenario } from '../spec/scenario.ts';
import { gaussianSource, type GaussianSource } from './prng.ts';

export const DEFAULT_SEED = 1;

export interface InputChunk {
  /** Input sample values (full scale 1.0). */
  readonly x: Float64Array;
  /** Input phase at each sample, cycles in [0, 1). */
  readonly phaseCycles: Float64Array;
  /** The scenario's frequency offset from centerHz at each sample (the FM message in Hz). */
  readonly offsetHz: Float64Array;
}

export interface InputGenerator {
  /** Fill the chunk with samples n0 … n0 + count − 1 (calls must be consecutive). */
  next(chunk: InputChunk, n0: number, count: number): void;
  /**
   * As `next` but for x: the chunk's phases and offsets, and noise[0..count) when the scenario has
   * noise (then true). x[i] is amplitude·sin(2π·phaseCycles[i]) + noise[i] (+ 0 without noise), the
   * caller's to compute (wasmTraced.ts does it in the WebAssembly module). With `recurrence` the
   * phases come from it, after the offsets are filled.
   */
  phases(chunk: InputChunk, n0: number, count: number, noise: Float64Array, recurrence?: PhaseRecurrence): boolean;
}

/** Modulating waveform of unit peak at phase p in cycles: sine, triangle (starts at 0 rising), square. */
export function modulationWaveform(kind: 'sine' | 'triangle' | 'square', p: number): number {
  const c = p - Math.floor(p);
  if (kind === 'sine') return Math.sin(2 * Math.PI * c);
  if (kind === 'square') return c < 0.5 ? 1 : -1;
  return c < 0.25 ? 4 * c : c < 0.75 ? 2 - 4 * c : 4 * c - 4;
}

/** A linear ramp from fromHz to toHz over legS, back over the next legS, then fromHz. */
function sweepOffsetHz(fromHz: number, toHz: number, legS: number, tS: number): number {
  const x = tS <= legS ? tS / legS : tS <= 2 * legS ? 2 - tS / legS : 0;
  return fromHz + (toHz - fromHz) * x;
}

/** The scenario's frequency offset (Hz) at time t, excluding phase steps. */
export function scenarioOffsetHz(s: Scenario, tS: number): number {
  switch (s.kind) {
    case 'tone':
      return s.offsetHz;
    case 'frequency-step':
      return tS >= s.atS ? s.stepHz : 0;
    case 'phase-step':
      return 0;
    case 'fm':
      return s.deviationHz * modulationWaveform(s.modulation, s.rateHz * tS);
    case 'sweep':
      return sweepOffsetHz(s.fromHz, s.toHz, sweepLegS(s), tS);
  }
}

/**
 * The input phase recurrence of advancePhases run elsewhere (wasmTraced.ts, in the WebAssembly
 * module) on a chunk whose offsets are filled: the same operations in the same order, from
 * `state.phase`; returns the phase after the chunk.
 */
export type PhaseRecurrence = (state: Readonly<PhaseState>, n0: number, count: number) => number;

/** What the per-sample loops read and advance, in one object: the engine boxes every double stored to a closure's variable. */
export interface PhaseState {
  readonly s: Scenario;
  readonly sampleRateHz: number;
  readonly centerHz: number;
  readonly offsetFnHz: ((tS: number) => number) | undefined;
  /** The sample the phase step lands on (−1: none) and its size in cycles. */
  readonly stepSample: number;
  readonly stepCycles: number;
  /** A tone's or phase step's one offset and its per-sample phase step; null for the other inputs. */
  readonly constantHz: number | null;
  readonly constantStep: number;
  phase: number;
}

/** Input phases (before each sample advances them) and offsets of samples n0 … n0 + count − 1. */
function advancePhases(st: PhaseState, chunk: InputChunk, n0: number, count: number): void {
  const { s, sampleRateHz, centerHz, offsetFnHz, stepSample, stepCycles, constantHz, constantStep } = st;
  const { phaseCycles, offsetHz } = chunk;
  let phase = st.phase;
  for (let i = 0; i < count; i++) {
    const n = n0 + i;
    if (n === stepSample) {
      phase += stepCycles;
      phase -= Math.floor(phase);
    }
    const off = constantHz !== null ? constantHz : offsetFnHz ? offsetFnHz(n / sampleRateHz) : scenarioOffsetHz(s, n / sampleRateHz);
    phaseCycles[i] = phase;
    offsetHz[i] = off;
    phase += constantHz !== null ? constantStep : (centerHz + off) / sampleRateHz;
    // phase − floor(phase) only off [0, 1) (it is the identity on (0, 1); +0 and −0 take it, as before).
    if (!(phase > 0 && phase < 1)) phase -= Math.floor(phase);
  }
  st.phase = phase;
}

/** The offsets of samples n0 … n0 + count − 1 alone (advancePhases's), for a PhaseRecurrence to read. */
function fillOffsets(st: PhaseState, chunk: InputChunk, n0: number, count: number): void {
  const { s, sampleRateHz, offsetFnHz, constantHz } = st;
  const offsetHz = chunk.offsetHz;
  if (constantHz !== null) {
    offsetHz.fill(constantHz, 0, count);
    return;
  }
  for (let i = 0; i < count; i++) {
    const n = n0 + i;
    offsetHz[i] = offsetFnHz ? offsetFnHz(n / sampleRateHz) : scenarioOffsetHz(s, n / sampleRateHz);
  }
}

/** x = amplitude·sin(2π·phase) + noise (+ 0 without noise) of the chunk's first `count` samples. */
function sineInput(chunk: InputChunk, count: number, amplitude: number, noise: Float64Array | null): void {
  const { x, phaseCycles } = chunk;
  for (let i = 0; i < count; i++) x[i] = amplitude * Math.sin(2 * Math.PI * (phaseCycles[i] as number)) + (noise ? (noise[i] as number) : 0);
}

/**
 * `offsetFnHz` replaces the scenario's frequency offset (used by the acquisition search for a
 * ramp-and-hold input); noise, seed and initial phase still come from the scenario.
 */
export function inputGenerator(
  s: Scenario,
  sampleRateHz: number,
  centerHz: number,
  amplitude: number,
  offsetFnHz?: (tS: number) => number,
): InputGenerator {
  const noise: GaussianSource | null = s.snrDb === undefined ? null : gaussianSource(s.seed ?? DEFAULT_SEED);
  // SNR = (A²/2)/σ² for a sine of peak A in white noise of variance σ².
  const sigma = s.snrDb === undefined ? 0 : Math.sqrt((amplitude * amplitude) / 2 / 10 ** (s.snrDb / 10));
  // A tone or a phase step has one frequency offset throughout: its per-sample step is computed once
  // (the same division, so the same double as per sample).
  const constantHz = offsetFnHz ? null : s.kind === 'tone' ? s.offsetHz : s.kind === 'phase-step' ? 0 : null;
  const initialCycles = (s.initialPhaseDeg ?? 0) / 360;
  const st: PhaseState = {
    s,
    sampleRateHz,
    centerHz,
    offsetFnHz,
    stepSample: s.kind === 'phase-step' ? Math.ceil(s.atS * sampleRateHz) : -1,
    stepCycles: s.kind === 'phase-step' ? s.stepDeg / 360 : 0,
    constantHz,
    constantStep: constantHz === null ? 0 : (centerHz + constantHz) / sampleRateHz,
    phase: initialCycles - Math.floor(initialCycles),
  };
  let noiseBuf = new Float64Array(0);
  return {
    next(chunk, n0, count) {
      if (noise && noiseBuf.length < count) noiseBuf = new Float64Array(count);
      if (noise) noise.fill(noiseBuf, count, sigma);
      advancePhases(st, chunk, n0, count);
      sineInput(chunk, count, amplitude, noise ? noiseBuf : null);
    },
    phases(chunk, n0, count, out, recurrence) {
      if (noise) noise.fill(out, count, sigma);
      if (recurrence) {
        fillOffsets(st, chunk, n0, count);
        st.phase = recurrence(st, n0, count);
      } else advancePhases(st, chunk, n0, count);
      return noise !== null;
    },
  };
}

export function allocInputChunk(size: number): InputChunk {
  return { x: new Float64Array(size), phaseCycles: new Float64Array(size), offsetHz: new Float64Array(size) };
}
