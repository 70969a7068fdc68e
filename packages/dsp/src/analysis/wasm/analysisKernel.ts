/**
 * The analysis's long loops in WebAssembly (analysisKernel.wat): the free response of the linearised
 * loop (linearLoop.ts, runFreeResponse), the discrete step responses (stepResponse.ts,
 * runDiscreteSteps) and the noise Gramian's matrix products (linearLoop.ts, multiply), the same doubles
 * as the TypeScript loops, which stay the reference and run wherever the module cannot (no WebAssembly
 * or no 128-bit SIMD in it, a Content Security Policy that forbids compiling it, more sections than its
 * memory holds). A fresh engine runs a first analysis's TypeScript loops unoptimised for
 * thousands of samples, a double boxed per operation; the module is compiled before its first sample.
 */
import { compileModule, instantiate } from '../../wasm/compileModule.ts';
import { ANALYSIS_KERNEL_WASM_BASE64 } from './analysisKernelBytes.ts';

/** Sections and kept step-response samples the module's memory holds (its layout comment). */
export const KERNEL_MAX_SECTIONS = 16;
export const KERNEL_MAX_KEPT = 1024;

/** Double offsets of the module's memory (the byte offsets of its layout comment, over 8). */
const AT = { coefficients: 0, states: 80, l1: 112, l2: 128, block: 144, prevBlock: 160, timeS: 256, phaseStep: 1280, frequencyStep: 2304, stepCoefficients: 3328, stepStates: 3408, matrices: 4096 } as const;
/** Byte offset of the step run's outcome that freeResponseWithSteps leaves (an i32). */
const STEP_OUTCOME_BYTE = 27520;
/** Doubles of the matrix area (from AT.matrices to the end of the module's one page). */
const MATRIX_DOUBLES = 4096;

interface AnalysisKernelExports {
  readonly memory: { readonly buffer: ArrayBuffer };
  readonly freeResponse: (k: number, kd: number, koT: number, theta: number, u1: number, u2: number, maxSamples: number) => number;
  readonly discreteSteps: (k: number, kt: number, t: number, twoPiT: number, n: number, stride: number, divergedRad: number) => number;
  readonly multiply: (x: number, y: number, n: number, out: number) => void;
  readonly gramian: (n: number, count: number) => number;
  readonly freeResponseWithSteps: (
    k: number, kd: number, koT: number, theta: number, u1: number, u2: number, maxSamples: number,
    ks: number, kt: number, t: number, twoPiT: number, n: number, stride: number, divergedRad: number,
  ) => number;
}

/** The one instance (the loops keep nothing in it between calls), its memory as doubles; null without WebAssembly. */
let kernel: { readonly exports: AnalysisKernelExports; readonly memory: Float64Array } | null | undefined;

function analysisKernel() {
  if (kernel === undefined) {
    const module = compileModule(ANALYSIS_KERNEL_WASM_BASE64);
    const exports = module ? instantiate<AnalysisKernelExports>(module, {}).exports : null;
    kernel = exports ? { exports, memory: new Float64Array(exports.memory.buffer) } : null;
  }
  return kernel;
}

/**
 * runFreeResponse (linearLoop.ts; the same arguments, coef holding k sections) in the module: the same
 * return value and the same doubles left in l1, l2, block and prevBlock. Null when the module cannot run it.
 */
export function kernelFreeResponse(coef: Float64Array, kd: number, koT: number, x: Float64Array, l1: Float64Array, l2: Float64Array, block: Float64Array, prevBlock: Float64Array, maxSamples: number): number | null {
  const k = l1.length;
  const km = k > KERNEL_MAX_SECTIONS ? null : analysisKernel();
  if (!km) return null;
  const m = km.memory;
  m.set(coef, AT.coefficients);
  m.set(x.subarray(3, 3 + 2 * k), AT.states);
  m.set(l1, AT.l1);
  m.set(l2, AT.l2);
  m.set(block, AT.block);
  m.set(prevBlock, AT.prevBlock);
  const job = companion;
  companion = null;
  let run: number;
  if (job) {
    const ks = job.coef.length / 5;
    m.set(job.coef, AT.stepCoefficients);
    m.fill(0, AT.stepStates, AT.stepStates + 2 * ks);
    run = km.exports.freeResponseWithSteps(k, kd, koT, x[0]!, x[1]!, x[2]!, maxSamples, ks, job.kt, job.t, job.twoPiT, job.n, job.stride, job.divergedRad);
    const r = new Int32Array(m.buffer, STEP_OUTCOME_BYTE, 1)[0]!;
    keptSteps(m, r, job.out);
    job.ran = true;
  } else run = km.exports.freeResponse(k, kd, koT, x[0]!, x[1]!, x[2]!, maxSamples);
  l1.set(m.subarray(AT.l1, AT.l1 + k));
  l2.set(m.subarray(AT.l2, AT.l2 + k));
  block.set(m.subarray(AT.block, AT.block + k));
  prevBlock.set(m.subarray(AT.prevBlock, AT.prevBlock + k));
  return run;
}

/** Where a step-response run keeps its samples (stepResponse.ts, Traces). */
export interface KernelStepTraces {
  readonly timeS: number[];
  readonly phaseStepErrorRad: number[];
  readonly frequencyStepErrorRad: number[];
  kept: number;
  diverged: boolean;
}

/** A step-response run (runDiscreteSteps's loop and arguments) to be made beside the next free response; `ran` once it was. */
export interface KernelStepJob {
  readonly coef: Float64Array;
  readonly kt: number;
  readonly t: number;
  readonly twoPiT: number;
  readonly n: number;
  readonly stride: number;
  readonly divergedRad: number;
  readonly out: KernelStepTraces;
  ran: boolean;
}

/** The step run the next free response takes along (set only within alongsideFreeResponse). */
let companion: KernelStepJob | null = null;

/**
 * body(), with `job` run beside the first free response (kernelFreeResponse) body makes, in one loop of
 * the module (freeResponseWithSteps): the two recursions are independent, and each alone leaves the
 * processor waiting on its chain of dependent additions. job.ran says whether it was (body may make no
 * free response, or the module may not run); the caller then runs it alone. A job the module cannot hold
 * (more sections or kept samples than its memory has room for) is never taken.
 */
export function alongsideFreeResponse<T>(job: KernelStepJob | null, body: () => T): T {
  const fits = job !== null && job.coef.length / 5 <= KERNEL_MAX_SECTIONS && Math.ceil(job.n / job.stride) <= KERNEL_MAX_KEPT;
  companion = fits ? job : null;
  try {
    return body();
  } finally {
    companion = null;
  }
}

/** Copy a step run's kept samples (its outcome r: kept, or −1 − kept when it diverged) from the module into out. */
function keptSteps(m: Float64Array, r: number, out: KernelStepTraces): void {
  const kept = r < 0 ? -1 - r : r;
  for (let i = 0; i < kept; i++) {
    out.timeS[i] = m[AT.timeS + i]!;
    out.phaseStepErrorRad[i] = m[AT.phaseStep + i]!;
    out.frequencyStepErrorRad[i] = m[AT.frequencyStep + i]!;
  }
  out.kept = kept;
  out.diverged = r < 0;
}

/** The kept samples of a step-response run in the module (views of its memory, valid until its next call). */
export interface KernelSteps {
  readonly kept: number;
  readonly diverged: boolean;
  readonly timeS: Float64Array;
  readonly phaseStepErrorRad: Float64Array;
  readonly frequencyStepErrorRad: Float64Array;
}

/**
 * runDiscreteSteps (stepResponse.ts) in the module, for coef of its sections (b0 b1 b2 a1 a2 each) and
 * its constants: the samples it keeps, or null when the module cannot run it.
 */
export function kernelDiscreteSteps(coef: Float64Array, kt: number, t: number, twoPiT: number, n: number, stride: number, divergedRad: number): KernelSteps | null {
  const k = coef.length / 5;
  const km = k > KERNEL_MAX_SECTIONS || Math.ceil(n / stride) > KERNEL_MAX_KEPT ? null : analysisKernel();
  if (!km) return null;
  const m = km.memory;
  m.set(coef, AT.coefficients);
  m.fill(0, AT.states, AT.states + 2 * k);
  const r = km.exports.discreteSteps(k, kt, t, twoPiT, n, stride, divergedRad);
  const kept = r < 0 ? -1 - r : r;
  return {
    kept,
    diverged: r < 0,
    timeS: m.subarray(AT.timeS, AT.timeS + kept),
    phaseStepErrorRad: m.subarray(AT.phaseStep, AT.phaseStep + kept),
    frequencyStepErrorRad: m.subarray(AT.frequencyStep, AT.frequencyStep + kept),
  };
}

/**
 * n×n matrices in the module's memory, the product of two of them into a third (linearLoop.ts, multiply)
 * and noiseGains's doubling on them (gramian: matrices 0-4 its A^(2^j), square, scratch and transpose,
 * from 5 on the Gramians; true when it converged, false when A^(2^j) blew up or 64 rounds passed).
 */
export interface KernelMatrices {
  readonly matrices: Float64Array[];
  readonly multiply: (x: Float64Array, y: Float64Array, n: number, out: Float64Array) => void;
  readonly gramian: (n: number, count: number) => boolean;
}

/**
 * `count` zeroed n×n matrices in the module's memory (views, valid until the module's next use for
 * matrices) and its multiply on them, which leaves the doubles of linearLoop.ts's multiply; null when
 * the module cannot run or they do not fit.
 */
export function kernelMatrices(n: number, count: number): KernelMatrices | null {
  const km = count * n * n > MATRIX_DOUBLES ? null : analysisKernel();
  if (!km) return null;
  const size = n * n;
  const matrices: Float64Array[] = [];
  for (let i = 0; i < count; i++) matrices.push(km.memory.subarray(AT.matrices + i * size, AT.matrices + (i + 1) * size).fill(0));
  return { matrices, multiply: kernelMultiply, gramian: kernelGramian };
}

function kernelGramian(n: number, count: number): boolean {
  return kernel!.exports.gramian(n, count) === 1;
}

function kernelMultiply(x: Float64Array, y: Float64Array, n: number, out: Float64Array): void {
  kernel!.exports.multiply(x.byteOffset, y.byteOffset, n, out.byteOffset);
}
