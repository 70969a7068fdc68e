/**
 * The bit-true loop compiled to WebAssembly (bitTrueKernel.wat): the same arithmetic as
 * src/sim/bitTrueKernel.ts in 64-bit integers with branch-free rounding, about twice as fast as the
 * TypeScript loop and faster than bench/loop.c (bench/bench.ts measures all three). The TypeScript
 * loop stays the reference: test/sim/wasmKernel.test.ts proves the two bit-identical over seeded
 * random specs, and it runs wherever WebAssembly cannot be compiled (a page whose Content Security
 * Policy forbids it, an engine without it or without its fixed-width SIMD, which the bucket min and
 * max use). The same module holds the traced simulation's quantiser, float loop and accumulator core,
 * run through wasmTraced.ts on an instance of this class.
 */
import type { BitTruePlan } from '../../types/sim.ts';
import { CHECKSUM_BASIS } from '../checksum.ts';
import { MODE, type BitTrueChunkOut } from '../bitTrueKernel.ts';
import { BIT_TRUE_KERNEL_WASM_BASE64 } from './kernelBytes.ts';
import { compileModule, instantiate, type WasmInstance as WasmInstanceOf } from '../../wasm/compileModule.ts';

/** Samples one call of the kernel takes at most (the input and output areas of its memory). */
export const WASM_CHUNK_SAMPLES = 8192;
/** Sections the state and coefficient areas hold. */
export const MAX_SECTIONS = 8;

/** Byte offsets of the kernel's memory (the layout comment of bitTrueKernel.wat). */
const LAYOUT = {
  constants: 0,
  phase: 256,
  checksum: 264,
  sectionState: 512,
  coefficients: 1024,
  sineTable: 2048,
  input: 264192,
  phaseHi: 296960,
  phaseLo: 329728,
  tableAddress: 362496,
  ncoCode: 395264,
  detectorCode: 428032,
  filterCode: 460800,
  delta: 493568,
} as const;

/** The kernel's per-sample outputs: the record's columns and the tuning increment Δ. */
export interface WasmChunkOut extends BitTrueChunkOut {
  /** Δ[n] of each sample (an exact integer), so the NCO frequency needs no second rounding. */
  readonly delta: Float64Array;
}

type WasmInstance = WasmInstanceOf<WasmExports>;

/** The module's functions: the bit-true kernel and the traced simulation's loops (wasmTraced.ts). */
export interface WasmExports {
  readonly memory: { readonly buffer: ArrayBuffer };
  /** `count` samples; traced: input codes from the traced input chunk and outputs as doubles (wasmTraced.ts); record: per-sample outputs. */
  readonly run: (count: number, traced: number, record: number, own: number) => void;
  readonly accumulate: (k: number, n0: number, i0: number, i1: number, tail: number, demod: number, withFloat: number, own: number, makeInput: number, inputAmplitude: number) => void;
  /** accumulate with k = 1, withFloat and makeInput 0 as constants (scripts/assembleKernel.ts makes it from accumulate's text); the same arguments. */
  /** accumulate with k = 0, withFloat and makeInput 1 as constants (as accumulateBitTrue); the same arguments. */
  readonly accumulateFloat: (k: number, n0: number, i0: number, i1: number, tail: number, demod: number, withFloat: number, own: number, makeInput: number, inputAmplitude: number) => void;
  readonly accumulateBitTrue: (k: number, n0: number, i0: number, i1: number, tail: number, demod: number, withFloat: number, own: number, makeInput: number, inputAmplitude: number) => void;
  readonly bands: (src: number, n0: number, i0: number, count: number, slot: number, out: number, maxOut: number, perLevel: number) => number;
  readonly sum: (src: number, i0: number, i1: number, slot: number) => void;
  readonly phases: (count: number, n0: number, phase: number, constant: number, constantStep: number, centerHz: number, sampleRateHz: number, stepSample: number, stepCycles: number) => number;
  readonly sine: (count: number, src: number, dst: number, affine: number, amplitude: number, add: number, own: number, cosine: number) => void;
  readonly sinePairs: (count: number, src: number, dst: number, affine: number, amplitude: number, add: number, own: number) => void;
}

/** What the module imports: the engine's own sine and cosine, so the traced loops compute the doubles the TypeScript ones do. */
const IMPORTS = { math: { sin: Math.sin, cos: Math.cos } };
let compiled: object | null | undefined;

/** The compiled kernel; null where it cannot be compiled, and the TypeScript loop runs. */
function kernelModule(): object | null {
  if (compiled === undefined) compiled = compileModule(BIT_TRUE_KERNEL_WASM_BASE64);
  return compiled;
}

/** True when this engine can run the WebAssembly kernel. */
export function wasmKernelAvailable(): boolean {
  return kernelModule() !== null;
}

/** One bit-true loop in a WebAssembly instance of its own: constants, state and chunk buffers in its memory. */
export class WasmBitTrueLoop {
  /** Views of the outputs of the last chunk (valid until the next call of `run`). */
  readonly out: WasmChunkOut;
  /** The kernel's input area: codes written here run with `runInPlace`, without the copy of `run`. */
  readonly input: Int32Array;
  private readonly words: BigInt64Array;
  private readonly ints: Int32Array;
  private readonly runChunk: (count: number) => void;
  /** The instance's exports, for the traced simulation's loops that share this memory. */
  readonly exports: WasmExports;

  constructor(instance: WasmInstance) {
    this.exports = instance.exports;
    const run = instance.exports.run;
    this.runChunk = (count) => run(count, 0, 1, 0);
    const buffer = instance.exports.memory.buffer;
    const i32 = (offset: number) => new Int32Array(buffer, offset, WASM_CHUNK_SAMPLES);
    this.input = i32(LAYOUT.input);
    this.out = {
      phaseHi: new Uint32Array(buffer, LAYOUT.phaseHi, WASM_CHUNK_SAMPLES),
      phaseLo: new Uint32Array(buffer, LAYOUT.phaseLo, WASM_CHUNK_SAMPLES),
      tableAddress: i32(LAYOUT.tableAddress),
      ncoCode: i32(LAYOUT.ncoCode),
      detectorCode: i32(LAYOUT.detectorCode),
      filterCode: i32(LAYOUT.filterCode),
      delta: new Float64Array(buffer, LAYOUT.delta, WASM_CHUNK_SAMPLES),
    };
    this.words = new BigInt64Array(buffer);
    this.ints = new Int32Array(buffer);
  }

  /** Run `count` (≤ WASM_CHUNK_SAMPLES) input codes; the outputs are then in `out`. */
  run(input: Int32Array, count: number): void {
    this.input.set(count === input.length ? input : input.subarray(0, count));
    this.runChunk(count);
  }

  /** Run the first `count` codes already written to `input`. */
  runInPlace(count: number): void {
    this.runChunk(count);
  }

  /** FNV-1a checksum of the record so far (src/sim/checksum.ts). */
  get checksum(): number {
    return (this.ints[LAYOUT.checksum / 4] as number) >>> 0;
  }

  /** Load the plan's constants and start from the initial state (the instance may have run another plan). */
  load(plan: BitTruePlan): void {
    const n = plan.ncoAccumulatorBits;
    const p = plan.phaseBits;
    const big = (v: number) => BigInt(v);
    // In the order of the constant loads of bitTrueKernel.wat.
    const constants: bigint[] = [
      big(MODE[plan.rounding]),
      big(plan.overflow === 'wrap' ? 1 : 0),
      2n ** big(plan.dataBits - 1) - 1n,
      big(64 - plan.dataBits),
      big(plan.amplitudeBits - 1),
      big(plan.coefficientFractionBits),
      // The exact sum of five products is below 2^(Wc + D + 1); a wider MAC word can never overflow.
      big(plan.accumulatorBits < plan.coefficientBits + plan.dataBits + 1 ? 1 : 0),
      2n ** big(Math.min(plan.accumulatorBits, 64) - 1) - 1n,
      big(64 - plan.accumulatorBits),
      big(plan.sectionCount),
      BigInt.asIntN(64, 2n ** big(n) - 1n),
      big(n - p),
      big(2 ** p - 1),
      big(2 ** (p - 2)),
      big(2 ** (p - 1)),
      big(plan.waveform === 'square' ? 1 : 0),
      big(plan.ncoFullScale),
      BigInt.asIntN(64, (big(plan.tuning.tuningWordHi) << 32n) | big(plan.tuning.tuningWordLo)),
      big(plan.control.gainCode),
      big(plan.control.gainShift),
    ];
    this.words.set(constants, LAYOUT.constants / 8);
    this.words.set(plan.coefficientCodes.map(big), LAYOUT.coefficients / 8);
    this.words.fill(0n, LAYOUT.sectionState / 8, LAYOUT.sectionState / 8 + 4 * MAX_SECTIONS);
    this.words[LAYOUT.phase / 8] = 0n;
    this.ints[LAYOUT.checksum / 4] = CHECKSUM_BASIS | 0;
    this.ints.set(plan.sineTable, LAYOUT.sineTable / 4);
  }
}

/**
 * Instances handed back by finished runs, so a short run (a golden-vector cut, an editor's simulation)
 * does not pay for allocating and clearing a new instance's 2 MiB memory (32 pages); `load` resets
 * every byte a run reads.
 */
const spare: WasmBitTrueLoop[] = [];
const MAX_SPARE = 4;

/** A WebAssembly bit-true loop for the plan, or null when this engine cannot run one. */
export function wasmBitTrueLoop(plan: BitTruePlan): WasmBitTrueLoop | null {
  if (plan.sectionCount > MAX_SECTIONS) return null;
  const loop = wasmInstanceLoop();
  loop?.load(plan);
  return loop;
}

/** An instance of the module with no plan loaded (a float-only traced run), or null without WebAssembly. */
export function wasmInstanceLoop(): WasmBitTrueLoop | null {
  const module = kernelModule();
  if (!module) return null;
  return spare.pop() ?? new WasmBitTrueLoop(instantiate<WasmExports>(module, IMPORTS));
}

/** Hand a loop whose run is over (its outputs and checksum read) back for the next run. */
export function releaseWasmBitTrueLoop(loop: WasmBitTrueLoop): void {
  if (spare.length < MAX_SPARE && !spare.includes(loop)) spare.push(loop);
}
