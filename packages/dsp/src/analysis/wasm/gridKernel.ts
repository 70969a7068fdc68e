/**
 * The analysis's frequency-grid passes in WebAssembly (gridKernel.wat): an open loop sampled on a grid,
 * analog or of digital sections, with its unwrapped phase (samplePhase, bode.ts), the same doubles as the
 * TypeScript passes of response.ts and bode.ts, which stay the reference and run wherever the module
 * cannot (no WebAssembly, a Content Security Policy that forbids compiling it, a grid or a filter larger
 * than its memory holds, a value that is not finite and takes finiteValue's fallback). A fresh engine runs
 * a first analysis's 600-point passes unoptimised, a double boxed per operation; the module is compiled
 * before its first point.
 */
import { compileModule, instantiate } from '../../wasm/compileModule.ts';
import { GRID_KERNEL_WASM_BASE64 } from './gridKernelBytes.ts';
import { anchoredPhaseDeg, DEG, doubles } from '../grid.ts';
import { unitCircleGrid } from '../response.ts';

/** What the module evaluates a response from: the flat coefficients response.ts reads too. */
export type GridKernelLoop =
  | {
      readonly kind: 'analog';
      /** Each section's numerator then denominator, highest power first (analogCoefficients). */
      readonly values: Float64Array;
      /** Their lengths, two a section. */
      readonly lengths: Int32Array;
      readonly kRadPerS: number;
    }
  | {
      readonly kind: 'sections';
      /** b0, b1, b2, a0, a1, a2 of each section (sectionCoefficients). */
      readonly coef: Float64Array;
      /** K·T of the NCO's K·T/(z − 1). */
      readonly kt: number;
      /** The loop rate: the grid's points on the unit circle are unitCircleGrid's for it. */
      readonly sampleRateHz: number;
    };

/** Coefficients, polynomial lengths and grid points the module's memory holds (its layout comment). */
const GRID_KERNEL_MAX_COEFFICIENTS = 256;
const GRID_KERNEL_MAX_LENGTHS = 128;
export const GRID_KERNEL_MAX_POINTS = 1024;

/** Double offsets of the module's memory (the byte offsets of its layout comment, over 8). */
const AT = { coefficients: 0, grid: 512, c1: 1536, s1: 2560, c2: 3584, s2: 4608, re: 5632, im: 6656, phase: 7680 } as const;
/** Offset of the polynomial lengths in 32-bit integers (byte 2048, over 4). */
const LENGTHS_AT = 512;

interface GridKernelExports {
  readonly memory: { readonly buffer: ArrayBuffer };
  readonly analogFill: (sections: number, n: number, k: number, twoPi: number) => number;
  readonly sectionsFill: (sections: number, n: number, kt: number) => number;
  readonly unwrapPhase: (n: number, phase: number, deg: number) => void;
}

/** The one instance (it keeps nothing between calls), its memory as doubles and as int32; null without WebAssembly. */
let kernel: { readonly exports: GridKernelExports; readonly memory: Float64Array; readonly ints: Int32Array } | null | undefined;

function gridKernel() {
  if (kernel === undefined) {
    const module = compileModule(GRID_KERNEL_WASM_BASE64);
    const exports = module ? instantiate<GridKernelExports>(module, { math: { atan2: Math.atan2 } }).exports : null;
    kernel = exports ? { exports, memory: new Float64Array(exports.memory.buffer), ints: new Int32Array(exports.memory.buffer) } : null;
  }
  return kernel;
}

/** A response's samples on a grid with its unwrapped phase (bode.ts's SampledPhase without the grid). */
export interface KernelSamples {
  readonly re: number[];
  readonly im: number[];
  readonly phaseDeg: number[];
}

/**
 * samplePhase's values and phase of `loop` on `grid` in the module (the first point anchored by
 * anchoredPhaseDeg). Null where the module cannot run it, or where a value is not finite (the
 * TypeScript pass then takes its fallback value).
 */
export function kernelSamplePhase(loop: GridKernelLoop, grid: readonly number[], loopType: number): KernelSamples | null {
  const n = grid.length;
  if (n < 1 || n > GRID_KERNEL_MAX_POINTS) return null;
  const size = loop.kind === 'analog' ? loop.values.length : loop.coef.length;
  if (size > GRID_KERNEL_MAX_COEFFICIENTS || (loop.kind === 'analog' && loop.lengths.length > GRID_KERNEL_MAX_LENGTHS)) return null;
  const km = gridKernel();
  if (!km) return null;
  const m = km.memory;
  m.set(grid, AT.grid);
  let bad: number;
  if (loop.kind === 'analog') {
    m.set(loop.values, AT.coefficients);
    km.ints.set(loop.lengths, LENGTHS_AT);
    bad = km.exports.analogFill(loop.lengths.length / 2, n, loop.kRadPerS, 2 * Math.PI);
  } else {
    const u = unitCircleGrid(grid, loop.sampleRateHz);
    m.set(loop.coef, AT.coefficients);
    m.set(u.c1, AT.c1);
    m.set(u.s1, AT.s1);
    m.set(u.c2, AT.c2);
    m.set(u.s2, AT.s2);
    bad = km.exports.sectionsFill(loop.coef.length / 6, n, loop.kt);
  }
  if (bad >= 0) return null;
  km.exports.unwrapPhase(n, anchoredPhaseDeg(m[AT.re]!, m[AT.im]!, loopType), DEG);
  const re = doubles(n);
  const im = doubles(n);
  const phaseDeg = doubles(n);
  for (let i = 0; i < n; i++) {
    re[i] = m[AT.re + i]!;
    im[i] = m[AT.im + i]!;
    phaseDeg[i] = m[AT.phase + i]!;
  }
  return { re, im, phaseDeg };
}
