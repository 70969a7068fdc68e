/**
 * The traced simulation in the WebAssembly module (bitTrueKernel.wat): the float loop, the input
 * quantiser, the bit-true kernel, the conversion of its outputs and the per-sample part of both trace
 * and metric accumulators run in one instance, on one input chunk in its memory, with no copies between them and none of
 * the JIT's deoptimisations of long TypeScript loops. Each function is the same double operations in
 * the same order as its TypeScript twin (floatKernel.ts, simulate.ts, inputSignal.ts, runAccumulator.ts,
 * lockMetric.ts), and its sines are the engine's: the module's port of the engine's algorithm (FD93)
 * where the engine's Math.sin gives the same doubles on the probes below, the imported Math.sin and
 * Math.cos otherwise; so every code, trace and metric is the same; test/sim/fastPaths.test.ts
 * compares the two paths bit for bit.
 */
import type { FloatLoopConfig } from '../floatKernel.ts';
import type { InputChunk, InputGenerator, PhaseRecurrence } from '../inputSignal.ts';
import type { AccumulatorCore } from '../runAccumulator.ts';
import type { LockKernel } from '../lockMetric.ts';
import type { BitTruePlan } from '../../types/sim.ts';
import { MODE } from '../bitTrueKernel.ts';
import { MAX_SECTIONS, WASM_CHUNK_SAMPLES, releaseWasmBitTrueLoop, wasmBitTrueLoop, wasmInstanceLoop, type WasmBitTrueLoop, type WasmExports } from './wasmKernel.ts';

/**
 * Byte offsets of the traced areas (the layout comment of bitTrueKernel.wat); those named after an
 * area (blockY, stateInts, floatWaveform …) are offsets within it.
 */
const TRACED = {
  inputX: 589824,
  inputPhase: 655360,
  inputOffset: 720896,
  block: 786432,
  blockBytes: 327680,
  /** Within a block, after the NCO phase at 0: filter output, NCO frequency, smoothed unwrapped and wrapped phase error. */
  blockY: 65536,
  blockNcoHz: 131072,
  blockSmooth: 196608,
  blockPhaseErr: 262144,
  state: 1441792,
  stateBytes: 512,
  /** A state's i32 after its 20 doubles: boxcar index, fill, length and address. */
  stateInts: 160,
  convert: 1442496,
  /** The quantiser's scale, minimum and maximum (f64) and rounding mode (i32), after the conversion's constants. */
  quantizer: 1442536,
  float: 1442816,
  /** The float loop's waveform (1 square) and section count, i32 each, after its constants and phase. */
  floatWaveform: 40,
  floatSectionCount: 44,
  floatSections: 1442880,
  floatCoefficients: 1443136,
  boxcars: 1507328,
  lockSlots: 1769600,
  lockSlotBytes: 56,
  /** The min, max and end (f64 columns of lockClosedMax each) of the buckets the last bands call closed. */
  lockClosed: 559104,
  lockClosedMax: 1280,
  lockScratch: 1835008,
  noise: 1966080,
  bitTrueSine: 2031616,
} as const;

/**
 * Phases p whose sin(2πp) the module's sine and a correctly rounded one give differently (found with
 * mpmath at 200 bits), then an even spread: an engine whose Math.sin or Math.cos is not the module's
 * algorithm differs on some of them (a correctly rounded one on about 3 % of arguments), and its
 * traced runs call the engine's functions instead.
 */
const SINE_PROBES = [
  0.6298827202168019, 0.6539225335338404, 0.6155627045785708, 0.36878537037226267, 0.14034718714561778, 0.017894197067565343,
  0.6257335582373686, 0.8728290543523024, 0.8073849109462133, 0.839976442440497, 0.5729890800837248, 0.12696758910775785,
  0.09524642363025815, 0.8048214000641909, 0.8965450698875688, 0.597536583754638,
  ...Array.from({ length: 496 }, (_, i) => (i * 0.6180339887498949) % 1),
];

let ownSine: boolean | undefined;

/**
 * sin(2π·p) (or cos) of each p (at most WASM_CHUNK_SAMPLES) by the module's port of the engine's
 * sine (FD93), through an instance's noise and sine areas (which a run rewrites before it reads them).
 */
export function moduleSine(exports: WasmExports, phases: ArrayLike<number>, cosine = false): Float64Array {
  const f64 = new Float64Array(exports.memory.buffer);
  f64.set(phases, TRACED.noise / 8);
  exports.sine(phases.length, TRACED.noise, TRACED.bitTrueSine, 0, 1, 0, 1, cosine ? 1 : 0);
  return f64.slice(TRACED.bitTrueSine / 8, TRACED.bitTrueSine / 8 + phases.length);
}

/** sin(2π·p) of each p (at most WASM_CHUNK_SAMPLES) by the module's two-lane sine (sinePairs), as a traced run computes its quadrature arm. */
export function moduleSinePairs(exports: WasmExports, phases: ArrayLike<number>): Float64Array {
  const f64 = new Float64Array(exports.memory.buffer);
  f64.set(phases, TRACED.noise / 8);
  exports.sinePairs(phases.length, TRACED.noise, TRACED.bitTrueSine, 0, 1, 0, 1);
  return f64.slice(TRACED.bitTrueSine / 8, TRACED.bitTrueSine / 8 + phases.length);
}

/** Whether the module's sine and cosine give the engine's Math.sin and Math.cos on every probe (checked once per engine). */
function checkOwnSine(exports: WasmExports): boolean {
  if (ownSine === undefined) {
    const sin = moduleSine(exports, SINE_PROBES);
    const cos = moduleSine(exports, SINE_PROBES, true);
    ownSine = SINE_PROBES.every((p, i) => Object.is(sin[i], Math.sin(2 * Math.PI * p)) && Object.is(cos[i], Math.cos(2 * Math.PI * p)));
  }
  return ownSine;
}

/** Boxcar samples the memory holds per loop; a longer ripple period runs the TypeScript accumulator. */
const MAX_WASM_BOXCAR = 16384;

/** The doubles the bit-true outputs are scaled by (simulate.ts computes them once for both paths). */
export interface BitTrueScales {
  /** Cycles of the high and low phase words. */
  readonly hiWeight: number;
  readonly toCycles: number;
  /** Filter output code to control units. */
  readonly yScale: number;
  /** NCO frequency M·fs/2^N and Hz per LSB of Δ. */
  readonly centerHz: number;
  readonly hzPerLsb: number;
}

/** One loop's per-sample observations in the instance's memory. */
interface TracedObservations {
  readonly ncoPhase: Float64Array;
  readonly y: Float64Array;
  readonly ncoHz: Float64Array;
}

export class WasmTraced {
  /** The input chunk, in the instance's memory (the generator writes it, both loops read it). */
  readonly input: InputChunk;
  /** Observation block 0 (the float loop) and 1 (the bit-true loop). */
  readonly observations: readonly [TracedObservations, TracedObservations];
  private readonly f64: Float64Array;
  private readonly i32: Int32Array;
  private readonly noise: Float64Array;
  /** 1 when the module's sine is the engine's (checkOwnSine), else 0: the module then calls Math.sin. */
  private readonly own: number;
  /** Whether the noise area may hold another run's noise (a spare instance). */
  private noiseDirty = true;
  /** Set by loadFloat: the float loop's accumulate computes each input sample (the first to read it). */
  private floatMakesInput = false;
  private inputAmplitude = 0;
  /** Whether the kernel writes its per-sample outputs and input codes (a run that keeps its record). */
  private recording = false;
  /** inputSignal.ts's phase recurrence in the module. */
  private readonly recurrence: PhaseRecurrence;

  constructor(readonly loop: WasmBitTrueLoop) {
    const buffer = loop.exports.memory.buffer;
    const view = (offset: number) => new Float64Array(buffer, offset, WASM_CHUNK_SAMPLES);
    this.input = { x: view(TRACED.inputX), phaseCycles: view(TRACED.inputPhase), offsetHz: view(TRACED.inputOffset) };
    const block = (k: number): TracedObservations => {
      const at = TRACED.block + k * TRACED.blockBytes;
      return { ncoPhase: view(at), y: view(at + TRACED.blockY), ncoHz: view(at + TRACED.blockNcoHz) };
    };
    this.observations = [block(0), block(1)];
    this.f64 = new Float64Array(buffer);
    this.i32 = new Int32Array(buffer);
    this.noise = view(TRACED.noise);
    this.own = checkOwnSine(loop.exports) ? 1 : 0;
    const phases = loop.exports.phases;
    this.recurrence = (st, n0, count) =>
      phases(count, n0, st.phase, st.constantHz !== null ? 1 : 0, st.constantStep, st.centerHz, st.sampleRateHz, st.stepSample, st.stepCycles);
  }

  /**
   * Samples n0 … n0 + count − 1 of the input into `input`: phases, offsets and noise from the
   * generator, x = amplitude·sin(2π·phase) + noise in the module (inputSignal.ts's expression).
   */
  generate(gen: InputGenerator, n0: number, count: number, amplitude: number): void {
    if (gen.phases(this.input, n0, count, this.noise, this.recurrence)) this.noiseDirty = true;
    else if (this.noiseDirty) {
      this.noise.fill(0);
      this.noiseDirty = false;
    }
    // With the float loop its accumulate makes x, sample by sample, in the time its feedback chain leaves idle.
    this.inputAmplitude = amplitude;
    if (!this.floatMakesInput) this.loop.exports.sinePairs(count, TRACED.inputPhase, TRACED.inputX, 1, amplitude, TRACED.noise, this.own);
  }

  /** Load the float loop's constants and start it from phase 0 and zero section states. */
  loadFloat(cfg: FloatLoopConfig): void {
    this.floatMakesInput = true;
    const f = this.f64;
    const at = TRACED.float / 8;
    // The expressions of runFloatChunk and floatRunner.
    f[at] = cfg.centerHz / cfg.sampleRateHz;
    f[at + 1] = cfg.gainHzPerUnit / cfg.sampleRateHz;
    f[at + 2] = cfg.centerHz;
    f[at + 3] = cfg.gainHzPerUnit;
    f[at + 4] = 0;
    this.i32[(TRACED.float + TRACED.floatWaveform) / 4] = cfg.waveform === 'square' ? 1 : 0;
    this.i32[(TRACED.float + TRACED.floatSectionCount) / 4] = cfg.sections.length;
    f.fill(0, TRACED.floatSections / 8, TRACED.floatSections / 8 + 4 * MAX_SECTIONS);
    f.set(
      cfg.sections.flatMap((s) => [s.b[0], s.b[1], s.b[2], s.a[1], s.a[2]]),
      TRACED.floatCoefficients / 8,
    );
  }

  /** The bit-true loop's conversion and quantiser constants (the kernel's own are WasmBitTrueLoop.load's); with `record`, the kernel writes the record. */
  loadBitTrue(plan: BitTruePlan, scales: BitTrueScales, record: boolean): void {
    this.f64.set([scales.hiWeight, scales.toCycles, scales.yScale, scales.centerHz, scales.hzPerLsb], TRACED.convert / 8);
    // quantizeInput's scale and saturation limits.
    const scale = 2 ** (plan.dataBits - 1);
    this.f64.set([scale, -scale, scale - 1], TRACED.quantizer / 8);
    this.i32[(TRACED.quantizer + 24) / 4] = MODE[plan.rounding];
    this.recording = record;
  }

  /**
   * The chunk's first `count` input samples through the bit-true loop in one pass: input codes
   * (quantizeInput's), the kernel, its outputs as doubles in observation block 1, and the sine of its
   * NCO phase for the quadrature arm; with a record also the codes and outputs in the kernel's areas.
   */
  bitTrueChunk(count: number): void {
    this.loop.exports.run(count, 1, this.recording ? 1 : 0, this.own);
  }

  /** Accumulator k's core (k = 0 float, 1 bit-true); the float core runs the float loop itself, a sample ahead of its accumulation. */
  core(k: 0 | 1): AccumulatorCore {
    const buffer = this.loop.exports.memory.buffer;
    const stateAt = TRACED.state + k * TRACED.stateBytes;
    const state = new Float64Array(buffer, stateAt, 20);
    const ints = new Int32Array(buffer, stateAt + TRACED.stateInts, 4);
    const blockAt = TRACED.block + k * TRACED.blockBytes;
    const boxAt = TRACED.boxcars + k * MAX_WASM_BOXCAR * 8;
    const f64 = this.f64;
    const { bands, sum } = this.loop.exports;
    // The bit-true accumulator's own copy, without the float loop's block (wasmKernel.ts accumulateBitTrue).
    const { accumulate, accumulateFloat, accumulateBitTrue } = this.loop.exports;
    const own = this.own;
    const traced = this;
    const slotAt = TRACED.lockSlots + k * TRACED.lockSlotBytes;
    const lock: LockKernel = {
      scratch: new Float64Array(buffer, TRACED.lockScratch + k * WASM_CHUNK_SAMPLES * 8, WASM_CHUNK_SAMPLES),
      slots: new Float64Array(buffer, slotAt, 7),
      closedMin: new Float64Array(buffer, TRACED.lockClosed, TRACED.lockClosedMax),
      closedMax: new Float64Array(buffer, TRACED.lockClosed + 8 * TRACED.lockClosedMax, TRACED.lockClosedMax),
      closedEnds: new Float64Array(buffer, TRACED.lockClosed + 16 * TRACED.lockClosedMax, TRACED.lockClosedMax),
      buckets: (values, n0, i0, count, perLevel) => bands(values.byteOffset, n0, i0, count, slotAt, TRACED.lockClosed, TRACED.lockClosedMax, perLevel),
      sum: (values, i0, i1) => sum(values.byteOffset, i0, i1, slotAt + 16),
    };
    return {
      lock,
      state,
      smooth: new Float64Array(buffer, blockAt + TRACED.blockSmooth, WASM_CHUNK_SAMPLES),
      phaseErr: new Float64Array(buffer, blockAt + TRACED.blockPhaseErr, WASM_CHUNK_SAMPLES),
      reset(c) {
        state.fill(0);
        state[16] = c.amplitude;
        state[17] = c.lockAlpha;
        state[18] = c.centerHz;
        state[19] = c.gainHzPerUnit;
        ints.set([0, 0, c.boxcarLength, boxAt]);
        f64.fill(0, boxAt / 8, boxAt / 8 + c.boxcarLength);
      },
      run(n0, i0, i1, tail, demod) {
        const makeInput = k === 0 && traced.floatMakesInput;
        (k === 1 ? accumulateBitTrue : makeInput ? accumulateFloat : accumulate)(k, n0, i0, i1, tail ? 1 : 0, demod ? 1 : 0, k === 0 ? 1 : 0, own, makeInput ? 1 : 0, traced.inputAmplitude);
      },
    };
  }

  /** Hand the instance back once the run's outputs are read. */
  release(): void {
    releaseWasmBitTrueLoop(this.loop);
  }
}

/**
 * Whether a traced run's float sections and ripple boxcar fit the module's memory: the one rule for
 * which runs wasmTraced takes (where WebAssembly runs at all), also read by the tests that count them.
 */
export function tracedRunFits(floatSections: number, boxcarLength: number): boolean {
  return floatSections <= MAX_SECTIONS && boxcarLength <= MAX_WASM_BOXCAR;
}

/**
 * An instance for a traced run (the bit-true plan loaded when there is one), or null when the
 * TypeScript path must run: no WebAssembly, or a run that does not fit (tracedRunFits).
 */
export function wasmTraced(plan: BitTruePlan | undefined, floatSections: number, boxcarLength: number): WasmTraced | null {
  if (!tracedRunFits(floatSections, boxcarLength)) return null;
  const loop = plan ? wasmBitTrueLoop(plan) : wasmInstanceLoop();
  return loop ? new WasmTraced(loop) : null;
}
