/**
 * Time-domain simulation of the loop, float and bit-true side by side on the same input samples.
 * Work is done in chunks; between chunks the run reports progress and checks the abort flag, and
 * `simulateAsync` yields to the event loop so a Web Worker can receive a cancel message.
 */
import type { Sos } from '../types/filter.ts';
import type { BitTrueKernelChoice, BitTruePlan, BitTrueRecord, BitTrueRun, SimOptions, SimResult, SimRun } from '../types/sim.ts';
import type { LoopSpec, SpecIssue } from '../spec/schema.ts';
import { scenarioRateIssue, sweepLegS, type Scenario } from '../spec/scenario.ts';
import { FieldError } from '../fixed/fieldError.ts';
import { allocInputChunk, inputGenerator } from './inputSignal.ts';
import { initialBitTrueState, quantizeInput, runBitTrueChunk, roundScaled, MODE, type BitTrueChunkOut, type BitTrueState } from './bitTrueKernel.ts';
import { releaseWasmBitTrueLoop, wasmBitTrueLoop, wasmKernelAvailable, WASM_CHUNK_SAMPLES } from './wasm/wasmKernel.ts';
import { initialFloatState, runFloatChunk } from './floatKernel.ts';
import { RunAccumulator, type RunSetup } from './runAccumulator.ts';
import { lockModel } from './lockMetric.ts';
import { rippleBoxcarSamples } from './rippleBoxcar.ts';
import { wasmTraced, type BitTrueScales, type WasmTraced } from './wasm/wasmTraced.ts';

/** Samples per chunk: progress and the abort flag between chunks; one call of the WebAssembly kernel each. */
export const CHUNK_SAMPLES = WASM_CHUNK_SAMPLES;

export const MAX_SIM_SAMPLES = 50_000_000;
export const MAX_RECORD_SAMPLES = 1 << 22;
export const DEFAULT_BUCKETS = 1000;
export const DEFAULT_LOCK_TOLERANCE_RAD = 0.1;

/** The spec fields a simulation reads as they are (a LoopSpec satisfies it). */
export type SimSpec = Pick<LoopSpec, 'sampleRateHz' | 'centerHz' | 'input' | 'nco'>;

/**
 * The loop a simulation runs, as planDesign derived it: the designed sections for the float loop and
 * the bit-true constants (null, with the reason, when the widths cannot represent the loop).
 */
export interface SimLoop {
  readonly spec: SimSpec;
  readonly sections: readonly Sos[];
  readonly bitTrue: BitTruePlan | null;
  readonly bitTrueIssue: SpecIssue | null;
}

export class SimulationAbortedError extends Error {
  constructor() {
    super('simulation aborted');
    this.name = 'AbortError';
  }
}

/** Simulate a planned loop: the float and/or the bit-true loop on the same input samples. */
export function simulateLoop(loop: SimLoop, scenario: Scenario, options: SimOptions = {}): SimResult {
  const steps = simulationSteps(loop, scenario, options);
  for (;;) {
    const r = steps.next();
    if (r.done) return r.value;
  }
}

/** As `simulateLoop`, yielding to the event loop between chunks (cancellable from a worker message). */
export async function simulateLoopAsync(loop: SimLoop, scenario: Scenario, options: SimOptions = {}): Promise<SimResult> {
  const steps = simulationSteps(loop, scenario, options);
  for (;;) {
    const r = steps.next();
    if (r.done) return r.value;
    await new Promise<void>((resolve) => setTimeout(resolve, 0));
  }
}

function sampleCount(spec: SimSpec, scenario: Scenario): number {
  const issue = scenarioRateIssue(spec, scenario);
  if (issue) throw new FieldError(issue.field, issue.message);
  const total = Math.round(scenario.durationS * spec.sampleRateHz);
  if (total < 1 || total > MAX_SIM_SAMPLES) {
    throw new FieldError('durationS', `durationS ${scenario.durationS} gives ${total} samples at ${spec.sampleRateHz} Hz; allowed 1 to ${MAX_SIM_SAMPLES}`);
  }
  return total;
}

function allocRecord(length: number): BitTrueRecord {
  return {
    length,
    inputCode: new Int32Array(length),
    phaseHi: new Uint32Array(length),
    phaseLo: new Uint32Array(length),
    tableAddress: new Int32Array(length),
    ncoCode: new Int32Array(length),
    detectorCode: new Int32Array(length),
    filterCode: new Int32Array(length),
  };
}

function sliceRecord(r: BitTrueRecord, from: number, to: number): BitTrueRecord {
  return {
    length: to - from,
    inputCode: r.inputCode.subarray(from, to),
    phaseHi: r.phaseHi.subarray(from, to),
    phaseLo: r.phaseLo.subarray(from, to),
    tableAddress: r.tableAddress.subarray(from, to),
    ncoCode: r.ncoCode.subarray(from, to),
    detectorCode: r.detectorCode.subarray(from, to),
    filterCode: r.filterCode.subarray(from, to),
  };
}

/**
 * NCO frequency (Hz) of the bit-true loop as a function of the filter output code y:
 * (M + Δ(y))·fs/2^N with Δ rounded exactly as the kernel rounds it.
 */
export function bitTrueNcoHzOf(plan: BitTruePlan): (y: number) => number {
  const mode: number = MODE[plan.rounding];
  const { gainCode, gainShift } = plan.control;
  const gInv = 2 ** -gainShift;
  const hzPerLsb = plan.sampleRateHz / 2 ** plan.ncoAccumulatorBits;
  const centerHz = plan.tuning.actualHz;
  return (y) => {
    const t = y * gainCode * gInv;
    const d = gainShift <= 0 ? t : mode === 0 ? Math.floor(t) : roundScaled(t, mode);
    return centerHz + d * hzPerLsb;
  };
}

/** The bit-true constants, or the reason the loop has none (naming the field to change). */
function requireBitTrue(loop: SimLoop): BitTruePlan {
  if (loop.bitTrue) return loop.bitTrue;
  const issue = loop.bitTrueIssue ?? { field: 'fixedPoint', message: 'the loop has no bit-true form' };
  throw new FieldError(issue.field, issue.message);
}

type InputChunk = ReturnType<typeof allocInputChunk>;

/** One loop under simulation: consumes input chunks, then returns its run. */
interface LoopRunner<R> {
  chunk(input: InputChunk, n0: number, count: number): void;
  finish(): R;
}

function floatRunner(spec: SimSpec, sections: readonly Sos[], setup: RunSetup, traced: WasmTraced | null): LoopRunner<SimRun> {
  const cfg = { sampleRateHz: spec.sampleRateHz, centerHz: spec.centerHz, gainHzPerUnit: spec.nco.gainHzPerUnit, waveform: spec.nco.waveform, sections };
  if (traced) {
    const acc = new RunAccumulator(setup, CHUNK_SAMPLES, traced.core(0));
    const obs = traced.observations[0];
    traced.loadFloat(cfg);
    return {
      chunk(input, n0, count) {
        // The float loop runs inside the accumulator's core, sample by sample (wasmTraced.ts).
        acc.pushChunk(n0, count, { inPhase: input.phaseCycles, ncoPhase: obs.ncoPhase, x: input.x, y: obs.y, ncoHz: obs.ncoHz, offsetHz: input.offsetHz });
      },
      finish: () => acc.finish(),
    };
  }
  const acc = new RunAccumulator(setup, CHUNK_SAMPLES);
  const state = initialFloatState(cfg);
  const out = { ncoPhaseCycles: new Float64Array(CHUNK_SAMPLES), filterOutput: new Float64Array(CHUNK_SAMPLES) };
  const ncoHz = new Float64Array(CHUNK_SAMPLES);
  return {
    chunk(input, n0, count) {
      runFloatChunk(cfg, state, input.x, count, out);
      const y = out.filterOutput;
      for (let i = 0; i < count; i++) ncoHz[i] = cfg.centerHz + cfg.gainHzPerUnit * (y[i] as number);
      acc.pushChunk(n0, count, { inPhase: input.phaseCycles, ncoPhase: out.ncoPhaseCycles, x: input.x, y, ncoHz, offsetHz: input.offsetHz });
    },
    finish: () => acc.finish(),
  };
}

/** The doubles the bit-true outputs are scaled by: phase words to cycles, y to control units, Δ to Hz. */
function bitTrueScales(plan: BitTruePlan): BitTrueScales {
  const toCycles = 2 ** -plan.ncoAccumulatorBits;
  return {
    hiWeight: 2 ** 32 * toCycles,
    toCycles,
    yScale: 2 ** -(plan.dataBits - 1),
    centerHz: plan.tuning.actualHz,
    hzPerLsb: plan.sampleRateHz / 2 ** plan.ncoAccumulatorBits,
  };
}

function bitTrueRunner(
  plan: BitTruePlan,
  total: number,
  options: { readonly keepRecord: boolean; readonly kernel: BitTrueKernelChoice },
  setup: RunSetup,
  traced: WasmTraced | null,
): LoopRunner<BitTrueRun> {
  const record = options.keepRecord ? allocRecord(total) : null;
  const acc = new RunAccumulator(setup, CHUNK_SAMPLES, traced ? traced.core(1) : null);
  const wasm = traced ? traced.loop : options.kernel === 'wasm' ? wasmBitTrueLoop(plan) : null;
  const scratch = record || wasm ? null : allocRecord(CHUNK_SAMPLES);
  const state = wasm ? null : initialBitTrueState(plan);
  const scales = bitTrueScales(plan);
  const { toCycles, hiWeight, yScale, hzPerLsb, centerHz } = scales;
  traced?.loadBitTrue(plan, scales, record !== null);
  const ncoHzOf = bitTrueNcoHzOf(plan);
  const [ncoPhase, y, ncoHz] = traced
    ? [traced.observations[1].ncoPhase, traced.observations[1].y, traced.observations[1].ncoHz]
    : [new Float64Array(CHUNK_SAMPLES), new Float64Array(CHUNK_SAMPLES), new Float64Array(CHUNK_SAMPLES)];
  return {
    chunk(input, n0, count) {
      if (traced) {
        // Quantiser, kernel and conversion in one pass of the module, into the block the accumulator core reads.
        const { loop } = traced;
        traced.bitTrueChunk(count);
        if (record) {
          const slice = sliceRecord(record, n0, n0 + count);
          slice.inputCode.set(loop.input.subarray(0, count));
          copyChunk(loop.out, slice, count);
        }
      } else if (wasm) {
        // Without a record the codes are quantised straight into the kernel's input area.
        const slice = record ? sliceRecord(record, n0, n0 + count) : null;
        quantizeInput(plan, input.x, count, slice ? slice.inputCode : wasm.input);
        if (slice) wasm.run(slice.inputCode, count);
        else wasm.runInPlace(count);
        if (slice) copyChunk(wasm.out, slice, count);
        // (M + Δ)·fs/2^N with the kernel's own Δ: the number bitTrueNcoHzOf(plan)(y) gives.
        const { delta, phaseHi, phaseLo, filterCode } = wasm.out;
        for (let i = 0; i < count; i++) {
          ncoHz[i] = centerHz + (delta[i] as number) * hzPerLsb;
          ncoPhase[i] = (phaseHi[i] as number) * hiWeight + (phaseLo[i] as number) * toCycles;
          y[i] = (filterCode[i] as number) * yScale;
        }
      } else {
        const slice = record ? sliceRecord(record, n0, n0 + count) : (scratch as BitTrueRecord);
        quantizeInput(plan, input.x, count, slice.inputCode);
        runBitTrueChunk(plan, state as BitTrueState, slice.inputCode, count, slice);
        const { phaseHi, phaseLo, filterCode } = slice;
        for (let i = 0; i < count; i++) {
          ncoHz[i] = ncoHzOf(filterCode[i] as number);
          ncoPhase[i] = (phaseHi[i] as number) * hiWeight + (phaseLo[i] as number) * toCycles;
          y[i] = (filterCode[i] as number) * yScale;
        }
      }
      acc.pushChunk(n0, count, { inPhase: input.phaseCycles, ncoPhase, x: input.x, y, ncoHz, offsetHz: input.offsetHz });
    },
    finish: () => {
      const checksum = wasm ? wasm.checksum : (state as BitTrueState).checksum;
      // A traced run's instance is handed back by simulationSteps, after both loops.
      if (wasm && !traced) releaseWasmBitTrueLoop(wasm);
      return { ...acc.finish(), checksum, ...(record ? { record } : {}) };
    },
  };
}

/** Copy the first `count` samples of a kernel's outputs into a record slice. */
function copyChunk(from: BitTrueChunkOut, to: BitTrueChunkOut, count: number): void {
  to.phaseHi.set(from.phaseHi.subarray(0, count));
  to.phaseLo.set(from.phaseLo.subarray(0, count));
  to.tableAddress.set(from.tableAddress.subarray(0, count));
  to.ncoCode.set(from.ncoCode.subarray(0, count));
  to.detectorCode.set(from.detectorCode.subarray(0, count));
  to.filterCode.set(from.filterCode.subarray(0, count));
}

/**
 * The bit-true loop's per-sample record and checksum alone (golden vectors): the same input, kernel
 * and record as `simulateLoop` with keepRecord, without the traces and metrics nobody reads there,
 * which cost several times the kernel itself.
 */
export function bitTrueRecordOf(loop: SimLoop, scenario: Scenario, kernel?: BitTrueKernelChoice): { readonly record: BitTrueRecord; readonly checksum: number } {
  const { spec } = loop;
  const total = sampleCount(spec, scenario);
  if (total > MAX_RECORD_SAMPLES) {
    throw new FieldError('durationS', `a per-sample record is limited to ${MAX_RECORD_SAMPLES} samples, the scenario has ${total}`);
  }
  const plan = requireBitTrue(loop);
  const record = allocRecord(total);
  const wasm = (kernel ?? defaultKernel()) === 'wasm' ? wasmBitTrueLoop(plan) : null;
  const state = wasm ? null : initialBitTrueState(plan);
  const gen = inputGenerator(scenario, spec.sampleRateHz, spec.centerHz, spec.input.amplitude);
  const input = allocInputChunk(Math.min(CHUNK_SAMPLES, total));
  for (let n0 = 0; n0 < total; n0 += CHUNK_SAMPLES) {
    const count = Math.min(CHUNK_SAMPLES, total - n0);
    gen.next(input, n0, count);
    const slice = sliceRecord(record, n0, n0 + count);
    quantizeInput(plan, input.x, count, slice.inputCode);
    if (wasm) {
      wasm.run(slice.inputCode, count);
      copyChunk(wasm.out, slice, count);
    } else {
      runBitTrueChunk(plan, state as BitTrueState, slice.inputCode, count, slice);
    }
  }
  const checksum = wasm ? wasm.checksum : (state as BitTrueState).checksum;
  if (wasm) releaseWasmBitTrueLoop(wasm);
  return { record, checksum };
}

function defaultKernel(): BitTrueKernelChoice {
  return wasmKernelAvailable() ? 'wasm' : 'typescript';
}

function runSetup(loop: SimLoop, scenario: Scenario, options: SimOptions, total: number): RunSetup {
  const { spec } = loop;
  return {
    total,
    buckets: options.buckets ?? DEFAULT_BUCKETS,
    sampleRateHz: spec.sampleRateHz,
    centerHz: spec.centerHz,
    gainHzPerUnit: spec.nco.gainHzPerUnit,
    amplitude: spec.input.amplitude,
    lockToleranceRad: options.lockToleranceRad ?? DEFAULT_LOCK_TOLERANCE_RAD,
    deviationHz: scenario.kind === 'fm' ? scenario.deviationHz : null,
    lockModel: lockModel(loop, scenario),
    fullTraces: options.fullTraces === true,
    sweepTurnSample: scenario.kind === 'sweep' ? Math.ceil(sweepLegS(scenario) * spec.sampleRateHz) : null,
  };
}

/** The chunked simulation as a generator: yields the fraction done after each chunk. */
export function* simulationSteps(loop: SimLoop, scenario: Scenario, options: SimOptions): Generator<number, SimResult, void> {
  const { spec, sections } = loop;
  const total = sampleCount(spec, scenario);
  const mode = options.mode ?? 'both';
  const keep = mode !== 'float' && options.keepRecord === true;
  if (keep && total > MAX_RECORD_SAMPLES) {
    throw new FieldError('durationS', `a per-sample record is limited to ${MAX_RECORD_SAMPLES} samples, the scenario has ${total}`);
  }
  const plan = mode !== 'float' ? requireBitTrue(loop) : undefined;
  const setup = runSetup(loop, scenario, options, total);
  const kernel = options.bitTrueKernel ?? defaultKernel();
  // With the WebAssembly kernel the whole traced run is the module's (wasmTraced.ts); the TypeScript path otherwise.
  const traced = kernel === 'wasm' ? wasmTraced(plan, sections.length, rippleBoxcarSamples(spec.sampleRateHz, spec.centerHz, total)) : null;
  const floatLoop = mode !== 'bit-true' ? floatRunner(spec, sections, setup, traced) : null;
  const bitLoop = plan ? bitTrueRunner(plan, total, { keepRecord: keep, kernel }, setup, traced) : null;
  const gen = inputGenerator(scenario, spec.sampleRateHz, spec.centerHz, spec.input.amplitude);
  const input = traced ? traced.input : allocInputChunk(CHUNK_SAMPLES);
  for (let n0 = 0; n0 < total; n0 += CHUNK_SAMPLES) {
    if (options.signal?.aborted) throw new SimulationAbortedError();
    const count = Math.min(CHUNK_SAMPLES, total - n0);
    if (traced) traced.generate(gen, n0, count, spec.input.amplitude);
    else gen.next(input, n0, count);
    floatLoop?.chunk(input, n0, count);
    bitLoop?.chunk(input, n0, count);
    const fraction = (n0 + count) / total;
    options.onProgress?.(fraction);
    yield fraction;
  }
  const floatRun = floatLoop?.finish();
  const bitRun = bitLoop?.finish();
  traced?.release();
  return {
    sampleCount: total,
    sampleRateHz: spec.sampleRateHz,
    durationS: total / spec.sampleRateHz,
    ...(floatRun ? { float: floatRun } : {}),
    ...(bitRun ? { bitTrue: bitRun } : {}),
    ...(plan ? { plan } : {}),
  };
}
