/**
 * The traced simulation in the WebAssembly module (bitTrueKernel.wat): the float loop, the input
 * quantiser, the bit-true kernel, the conversion of its outputs and the per-sample part of both trace
 * and metric accumulators run in one instance, on one input chunk in its memory, with no copies between them and none of
 * the JIT's deoptimisations of long TypeScript loops. Each function is the same double operations in
 * the same order as its TypeScript twin (floatKernel.ts, simulate.ts, runAccumulator.ts) and calls the
 * engine's own Math.sin and Math.cos, so every code, trace and metric is the same;
 * test/sim/fastPaths.test.ts compares the two paths bit for bit.
 */
import type { FloatLoopConfig } from '../floatKernel.ts';
import type { InputChunk } from '../inputSignal.ts';
import type { AccumulatorCore } from '../runAccumulator.ts';
import type { LockKernel } from '../lockMetric.ts';
import type { BitTruePlan } from '../../types/sim.ts';
import { MODE } from '../bitTrueKernel.ts';
import { MAX_SECTIONS, WASM_CHUNK_SAMPLES, releaseWasmBitTrueLoop, wasmBitTrueLoop, wasmInstanceLoop, type WasmBitTrueLoop } from './wasmKernel.ts';

/** Byte offsets of the traced areas (the layout comment of bitTrueKernel.wat). */
const TRACED = {
  inputX: 589824,
  inputPhase: 655360,
  inputOffset: 720896,
  block: 786432,
  blockBytes: 327680,
  state: 1441792,
  stateBytes: 512,
  convert: 1442496,
  float: 1442816,
  floatSections: 1442880,
  floatCoefficients: 1443136,
  boxcars: 1507328,
  lockSlots: 1769600,
  lockScratch: 1835008,
} as const;

/** Boxcar samples the memory holds per loop; a longer ripple period runs the TypeScript accumulator. */
export const MAX_WASM_BOXCAR = 16384;

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
export interface TracedObservations {
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

  constructor(readonly loop: WasmBitTrueLoop) {
    const buffer = loop.exports.memory.buffer;
    const view = (offset: number) => new Float64Array(buffer, offset, WASM_CHUNK_SAMPLES);
    this.input = { x: view(TRACED.inputX), phaseCycles: view(TRACED.inputPhase), offsetHz: view(TRACED.inputOffset) };
    const block = (k: number): TracedObservations => {
      const at = TRACED.block + k * TRACED.blockBytes;
      return { ncoPhase: view(at), y: view(at + 65536), ncoHz: view(at + 131072) };
    };
    this.observations = [block(0), block(1)];
    this.f64 = new Float64Array(buffer);
    this.i32 = new Int32Array(buffer);
  }

  /** Load the float loop's constants and start it from phase 0 and zero section states. */
  loadFloat(cfg: FloatLoopConfig): void {
    const f = this.f64;
    const at = TRACED.float / 8;
    // The expressions of runFloatChunk and floatRunner.
    f[at] = cfg.centerHz / cfg.sampleRateHz;
    f[at + 1] = cfg.gainHzPerUnit / cfg.sampleRateHz;
    f[at + 2] = cfg.centerHz;
    f[at + 3] = cfg.gainHzPerUnit;
    f[at + 4] = 0;
    this.i32[(TRACED.float + 40) / 4] = cfg.waveform === 'square' ? 1 : 0;
    this.i32[(TRACED.float + 44) / 4] = cfg.sections.length;
    f.fill(0, TRACED.floatSections / 8, TRACED.floatSections / 8 + 4 * MAX_SECTIONS);
    f.set(
      cfg.sections.flatMap((s) => [s.b[0], s.b[1], s.b[2], s.a[1], s.a[2]]),
      TRACED.floatCoefficients / 8,
    );
  }

  loadConvert(scales: BitTrueScales): void {
    this.f64.set([scales.hiWeight, scales.toCycles, scales.yScale, scales.centerHz, scales.hzPerLsb], TRACED.convert / 8);
  }

  /** The first `count` input samples as the plan's input codes, into the kernel's input area (quantizeInput's codes). */
  quantize(plan: BitTruePlan, count: number): void {
    const scale = 2 ** (plan.dataBits - 1);
    this.loop.exports.quantize(count, scale, MODE[plan.rounding], -scale, scale - 1);
  }

  /** The last kernel run's outputs as doubles, into observation block 1. */
  convert(count: number): void {
    this.loop.exports.convert(count);
  }

  /** Accumulator k's core (k = 0 float, 1 bit-true); the float core runs the float loop itself, a sample ahead of its accumulation. */
  core(k: 0 | 1): AccumulatorCore {
    const buffer = this.loop.exports.memory.buffer;
    const stateAt = TRACED.state + k * TRACED.stateBytes;
    const state = new Float64Array(buffer, stateAt, 20);
    const ints = new Int32Array(buffer, stateAt + 160, 4);
    const blockAt = TRACED.block + k * TRACED.blockBytes;
    const boxAt = TRACED.boxcars + k * MAX_WASM_BOXCAR * 8;
    const f64 = this.f64;
    const { accumulate, band, sum } = this.loop.exports;
    const slotAt = TRACED.lockSlots + k * 32;
    const lock: LockKernel = {
      scratch: new Float64Array(buffer, TRACED.lockScratch + k * WASM_CHUNK_SAMPLES * 8, WASM_CHUNK_SAMPLES),
      slots: new Float64Array(buffer, slotAt, 3),
      band: (values, i0, i1) => band(values.byteOffset, i0, i1, slotAt),
      sum: (values, i0, i1) => sum(values.byteOffset, i0, i1, slotAt + 16),
    };
    return {
      lock,
      state,
      smooth: new Float64Array(buffer, blockAt + 196608, WASM_CHUNK_SAMPLES),
      phaseErr: new Float64Array(buffer, blockAt + 262144, WASM_CHUNK_SAMPLES),
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
        accumulate(k, n0, i0, i1, tail ? 1 : 0, demod ? 1 : 0, k === 0 ? 1 : 0);
      },
    };
  }

  /** Hand the instance back once the run's outputs are read. */
  release(): void {
    releaseWasmBitTrueLoop(this.loop);
  }
}

/**
 * An instance for a traced run (the bit-true plan loaded when there is one), or null when the
 * TypeScript path must run: no WebAssembly, more sections than the memory holds, or a ripple boxcar
 * longer than its area.
 */
export function wasmTraced(plan: BitTruePlan | undefined, floatSections: number, boxcarLength: number): WasmTraced | null {
  if (floatSections > MAX_SECTIONS || boxcarLength > MAX_WASM_BOXCAR) return null;
  const loop = plan ? wasmBitTrueLoop(plan) : wasmInstanceLoop();
  return loop ? new WasmTraced(loop) : null;
}
