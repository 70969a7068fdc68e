/**
 * The jobs the DSP worker runs: each plans the spec with packages/dsp (planDesign, the same code the
 * server runs at release time) and reads from that one result; nothing is re-implemented here.
 * Outputs are plain data so they cross postMessage.
 */
import {
  analyzeDesign,
  measurePlanAcquisition,
  planDesign,
  requireValidSpec,
  simulatePlanAsync,
  wordLengthSearch,
  type AcquisitionComparison,
  type AnalysisResult,
  type LoopSpec,
  type Scenario,
  type SimOptions,
  type SimResult,
  type WordLengthResult,
} from '@loopwright/dsp';
import { decimateMinMax } from '../charts/decimate.ts';

/** What the editor shows of a design: its analysis (the NCO figures are its `nco`). */
export interface DesignAnalysis {
  readonly analysis: AnalysisResult;
}

export interface SimulationOutput {
  /** The run without its per-sample traces (only the decimated ones cross to the page). */
  readonly result: SimResult;
  /**
   * The scenario's input frequency offset (the modulating signal) as [t, Hz] pairs, min/max
   * decimated; null for runs too long to keep every sample.
   */
  readonly offsetHz: readonly [number, number][] | null;
}

/** One loop of a 'both' simulation, for a worker of its own (splitSimulation.ts). */
export interface SimulationHalfInput {
  readonly scenario: Scenario;
  readonly mode: 'float' | 'bit-true';
}

interface Jobs {
  analyze: { input: null; output: DesignAnalysis };
  simulate: { input: Scenario; output: SimulationOutput };
  simulateHalf: { input: SimulationHalfInput; output: SimulationOutput };
  wordLength: { input: WordLengthInput; output: WordLengthResult };
  acquire: { input: null; output: AcquisitionComparison };
}

/** What the word-length panel lets the user set (the rest are the search's defaults). */
export interface WordLengthInput {
  readonly minCoefficientBits: number;
  readonly maxCoefficientBits: number;
  readonly searchData: boolean;
}

export type DspJobKind = keyof Jobs;
export type DspJobInput<K extends DspJobKind> = Jobs[K]['input'];
export type DspJobOutput<K extends DspJobKind> = Jobs[K]['output'];

export interface JobContext {
  readonly signal: AbortSignal;
  readonly onProgress: (fraction: number, label?: string) => void;
}

/**
 * The page sends a spec it validated with the same schema (form/specValidation.ts); the brand does not
 * survive postMessage, so analyzeDesign parses it once more as it enters dsp. It plans what the analysis
 * reads and no more: the job returns the analysis alone, never the bit-true constants.
 */
export function analyzeJob(spec: LoopSpec): DesignAnalysis {
  return { analysis: analyzeDesign(spec) };
}

/** Runs up to this many samples also return every sample, so the modulating signal can be drawn. */
export const FULL_TRACE_LIMIT = 1 << 19;
const OFFSET_POINTS = 2000;

/**
 * Both loops (default) or one: the two halves of a split run are the 'both' run (mergeSimResults).
 * The offset trace is the input's, which the float half draws for the pair (splitSimulation.ts), so a
 * bit-true half keeps no per-sample traces: they would be written per sample only to be dropped.
 */
export async function simulateJob(spec: LoopSpec, scenario: Scenario, ctx: JobContext, mode: SimOptions['mode'] = 'both'): Promise<SimulationOutput> {
  const samples = Math.ceil(scenario.durationS * spec.sampleRateHz);
  const fullTraces = mode !== 'bit-true' && samples <= FULL_TRACE_LIMIT;
  const run = await simulatePlanAsync(planDesign(requireValidSpec(spec)), scenario, { signal: ctx.signal, onProgress: (f) => ctx.onProgress(f), fullTraces, mode });
  const full = run.float?.full ?? run.bitTrue?.full;
  const offsetHz = full ? decimateMinMax(timeAxis(full.offsetHz.length, spec.sampleRateHz), full.offsetHz, OFFSET_POINTS) : null;
  return { result: withoutFullTraces(run), offsetHz };
}

function timeAxis(length: number, sampleRateHz: number): Float64Array {
  const t = new Float64Array(length);
  for (let i = 0; i < length; i++) t[i] = i / sampleRateHz;
  return t;
}

function withoutFullTraces(run: SimResult): SimResult {
  const strip = <T extends { full?: unknown }>(r: T | undefined): T | undefined => {
    if (!r) return r;
    const { full: _full, ...rest } = r;
    return rest as T;
  };
  const float = strip(run.float);
  const bitTrue = strip(run.bitTrue);
  const { float: _f, bitTrue: _b, ...rest } = run;
  return { ...rest, ...(float ? { float } : {}), ...(bitTrue ? { bitTrue } : {}) };
}

/** Synchronous in packages/dsp: progress still reaches the page; cancelling restarts the worker. */
export function wordLengthJob(spec: LoopSpec, input: WordLengthInput, ctx: JobContext): WordLengthResult {
  return wordLengthSearch(spec, {
    minCoefficientBits: input.minCoefficientBits,
    maxCoefficientBits: input.maxCoefficientBits,
    data: input.searchData,
    onProgress: (fraction, stage) => ctx.onProgress(fraction, stage),
  });
}

/**
 * Each acquisition figure estimated and measured (the same dsp calls as the server's and the CLI's).
 * Synchronous in packages/dsp, like the word-length search: progress reaches the page, cancelling
 * restarts the worker.
 */
export function acquireJob(spec: LoopSpec, ctx: JobContext): AcquisitionComparison {
  return measurePlanAcquisition(planDesign(requireValidSpec(spec)), { onProgress: (f) => ctx.onProgress(f) });
}

export async function runDspJob(kind: DspJobKind, spec: LoopSpec, input: unknown, ctx: JobContext): Promise<unknown> {
  switch (kind) {
    case 'analyze':
      return analyzeJob(spec);
    case 'simulate':
      return simulateJob(spec, input as Scenario, ctx);
    case 'simulateHalf': {
      const half = input as SimulationHalfInput;
      return simulateJob(spec, half.scenario, ctx, half.mode);
    }
    case 'wordLength':
      return wordLengthJob(spec, input as WordLengthInput, ctx);
    case 'acquire':
      return acquireJob(spec, ctx);
  }
}

/**
 * Jobs whose output is made fresh for the page and nothing in the worker keeps: their typed arrays
 * may move to the page instead of being copied (a plan's sine table is its own copy, sineTable.ts).
 */
export const MOVABLE_OUTPUT_JOBS: ReadonlySet<DspJobKind> = new Set<DspJobKind>(['simulate', 'simulateHalf']);
