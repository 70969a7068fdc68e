/**
 * The bit-true loop linearised about lock, as a state-space model whose inputs are the rounding points
 * of the arithmetic (packages/dsp/README.md, "Bit-true arithmetic") and whose outputs are every section
 * output and the NCO phase. Near lock the multiplier gives u = −Kd·θo + e_det (the input phase taken as
 * 0; the double-frequency term left out: the loop filter removes it, G3 Ch. 2); each direct-form-I
 * section adds its output rounding e_k after the sum, so the error runs through that section's poles and
 * on through the later sections (OS3 Sec. 6.9 (memory)); the tuning increment adds e_ctrl (radians of
 * NCO phase) and the phase register integrates with one sample of delay, θo[n+1] = θo[n] + Ko·T·y[n] + e_ctrl.
 *
 * The model is built by probing one linear step with unit vectors (so the matrices cannot disagree with
 * the step), and is used for the noise gains (sum of squares of the impulse response, from the
 * observability Gramian), DC gains (the mean a truncating point adds) and the peak gains of each section
 * (L1 of the impulse response by running it, L∞ of the frequency response on a grid): Jackson's Lp
 * norms of the transfer from a point to a node (Ja70).
 */
import type { Sos } from '../types/filter.ts';
import { type KernelMatrices, kernelFreeResponse, kernelMatrices } from './wasm/analysisKernel.ts';

/** The linearised loop: x[n+1] = A·x[n] + B·e[n], out[n] = C·x[n] + D·e[n]. Matrices are row-major. */
export interface LinearLoop {
  /** States: θo, the detector's two past outputs, then y[n−1], y[n−2] of each section. */
  readonly stateCount: number;
  /** Inputs: 0 = detector, 1 … K = section outputs, K + 1 = tuning increment (radians of phase). */
  readonly inputCount: number;
  /** Outputs: 0 … K − 1 = section outputs (K − 1 is the filter output y), K = NCO phase θo (rad). */
  readonly outputCount: number;
  readonly a: Float64Array;
  readonly b: Float64Array;
  readonly c: Float64Array;
  readonly d: Float64Array;
  readonly sections: readonly Sos[];
  readonly kd: number;
  readonly koTRadPerUnit: number;
}

/** One sample of the linear loop; writes the next state and the outputs (see LinearLoop). */
function linearStep(sections: readonly Sos[], kd: number, koT: number, s: Float64Array, e: Float64Array, next: Float64Array, out: Float64Array): void {
  const k = sections.length;
  const theta = s[0]!;
  const u = -kd * theta + e[0]!;
  let v = u;
  let x1 = s[1]!;
  let x2 = s[2]!;
  for (let j = 0; j < k; j++) {
    const { b, a } = sections[j]!;
    const y1 = s[3 + 2 * j]!;
    const y2 = s[4 + 2 * j]!;
    const y = b[0] * v + b[1] * x1 + b[2] * x2 - a[1] * y1 - a[2] * y2 + e[1 + j]!;
    next[3 + 2 * j] = y;
    next[4 + 2 * j] = y1;
    out[j] = y;
    x1 = y1;
    x2 = y2;
    v = y;
  }
  next[1] = u;
  next[2] = s[1]!;
  next[0] = theta + koT * v + e[k + 1]!;
  out[k] = theta;
}

/** Build the linear loop of quantised sections, detector gain kd and Ko·T (rad per unit per sample). */
export function linearLoop(sections: readonly Sos[], kd: number, koTRadPerUnit: number): LinearLoop {
  const k = sections.length;
  const n = 3 + 2 * k;
  const m = k + 2;
  const p = k + 1;
  const a = new Float64Array(n * n);
  const b = new Float64Array(n * m);
  const c = new Float64Array(p * n);
  const d = new Float64Array(p * m);
  const s = new Float64Array(n);
  const e = new Float64Array(m);
  const next = new Float64Array(n);
  const out = new Float64Array(p);
  for (let j = 0; j < n; j++) {
    s.fill(0);
    s[j] = 1;
    linearStep(sections, kd, koTRadPerUnit, s, e, next, out);
    for (let i = 0; i < n; i++) a[i * n + j] = next[i]!;
    for (let i = 0; i < p; i++) c[i * n + j] = out[i]!;
  }
  s.fill(0);
  for (let j = 0; j < m; j++) {
    e.fill(0);
    e[j] = 1;
    linearStep(sections, kd, koTRadPerUnit, s, e, next, out);
    for (let i = 0; i < n; i++) b[i * m + j] = next[i]!;
    for (let i = 0; i < p; i++) d[i * m + j] = out[i]!;
  }
  return { stateCount: n, inputCount: m, outputCount: p, a, b, c, d, sections, kd, koTRadPerUnit };
}

/**
 * out = x·y (n×n). Each element is summed in a local over l in increasing order, skipping x[i][l] = 0:
 * the same additions in the same order as accumulating into out row by row, without a store per term.
 * Four elements of a row are summed side by side (then two, then one for the columns left): each sum
 * is a chain of dependent additions, and independent chains keep the processor's adders busy where one
 * waits on the last (each element still gets its own terms in its own order, so the same doubles). Four
 * rather than two took the 7×7 products of the two-section demo loops from about 0.57 to 0.45 µs.
 */
export function multiply(x: Float64Array, y: Float64Array, n: number, out: Float64Array): void {
  for (let i = 0; i < n; i++) {
    const row = i * n;
    let j = 0;
    for (; j + 3 < n; j += 4) {
      let acc0 = 0;
      let acc1 = 0;
      let acc2 = 0;
      let acc3 = 0;
      for (let l = 0, yl = j; l < n; l++, yl += n) {
        const xil = x[row + l]!;
        if (xil === 0) continue;
        acc0 += xil * y[yl]!;
        acc1 += xil * y[yl + 1]!;
        acc2 += xil * y[yl + 2]!;
        acc3 += xil * y[yl + 3]!;
      }
      out[row + j] = acc0;
      out[row + j + 1] = acc1;
      out[row + j + 2] = acc2;
      out[row + j + 3] = acc3;
    }
    for (; j + 1 < n; j += 2) {
      let acc0 = 0;
      let acc1 = 0;
      for (let l = 0, yl = j; l < n; l++, yl += n) {
        const xil = x[row + l]!;
        if (xil === 0) continue;
        acc0 += xil * y[yl]!;
        acc1 += xil * y[yl + 1]!;
      }
      out[row + j] = acc0;
      out[row + j + 1] = acc1;
    }
    if (j === n) continue;
    let acc = 0;
    for (let l = 0, yl = j; l < n; l++, yl += n) {
      const xil = x[row + l]!;
      if (xil !== 0) acc += xil * y[yl]!;
    }
    out[row + j] = acc;
  }
}

/** out = xᵀ (n×n). */
function transpose(x: Float64Array, n: number, out: Float64Array): void {
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) out[j * n + i] = x[i * n + j]!;
}

/**
 * q ← Q + Mᵀ·Q·M, both products by multiply (t and u are scratch, matT is Mᵀ). The zero terms multiply
 * skips would add ±0 to a sum that starts at +0 and so is never -0: for a finite Q the doubles are those of
 * summing every term, in the same order.
 */
function addCongruence(q: Float64Array, mat: Float64Array, matT: Float64Array, n: number, t: Float64Array, u: Float64Array): void {
  multiply(q, mat, n, t);
  multiply(matT, t, n, u);
  for (let k = 0; k < n * n; k++) q[k] = q[k]! + u[k]!;
}

/**
 * Σ over n ≥ 0 of (C_o·Aⁿ·B_i)² + D_oi² for every input i and the outputs `outputs`: the noise gain
 * from each input to each of those outputs. The observability Gramian Q = Σ (Aᵀ)ⁿ·C_oᵀ·C_o·Aⁿ is summed
 * by doubling (Q ← Q + (A^(2^j))ᵀ·Q·A^(2^j), A ← A²), so a loop whose impulse response lasts 2^20
 * samples costs 20 small matrix products. Null when the loop does not decay (unstable or on the circle).
 * The doubling runs in the analysis's WebAssembly module where it can (wasm/analysisKernel.ts, gramian:
 * the same doubles): its products are most of this step, and there they go without a bounds check per element.
 */
export function noiseGains(loop: LinearLoop, outputs: readonly number[]): number[][] | null {
  return gramianNoiseGains(loop, outputs, kernelMatrices(loop.stateCount, 5 + outputs.length));
}

/** noiseGains with the products of `kernel` on its matrices, or multiply on new ones when null. */
export function gramianNoiseGains(loop: LinearLoop, outputs: readonly number[], kernel: KernelMatrices | null): number[][] | null {
  const { stateCount: n, inputCount: m, a, b, c, d } = loop;
  const mats = kernel?.matrices ?? Array.from({ length: 5 + outputs.length }, () => new Float64Array(n * n));
  const grams = outputs.map((o, g) => {
    const q = mats[5 + g]!;
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) q[i * n + j] = c[o * n + i]! * c[o * n + j]!;
    return q;
  });
  mats[0]!.set(a);
  const converged = kernel ? kernel.gramian(n, grams.length) : doubleGramians(mats, grams, n);
  if (!converged) return null;
  return outputs.map((o, k) => {
    const q = grams[k]!;
    const gains: number[] = [];
    for (let i = 0; i < m; i++) {
      let acc = 0;
      for (let r = 0; r < n; r++) {
        let row = 0;
        for (let s = 0; s < n; s++) row += q[r * n + s]! * b[s * m + i]!;
        acc += b[r * m + i]! * row;
      }
      gains.push(acc + d[o * m + i]! ** 2);
    }
    return gains;
  });
}

/**
 * The doubling of noiseGains in TypeScript (the analysis module's gramian does the same operations): Q ←
 * Q + (A^(2^j))ᵀ·Q·A^(2^j) for each Gramian, A ← A², from mats[0] = A (mats 1-4 scratch), until every
 * |A^(2^j)| entry is below 1e-6 (true) or one is not finite or above 1e150, or 64 rounds passed (false).
 */
function doubleGramians(mats: Float64Array[], grams: readonly Float64Array[], n: number): boolean {
  let power = mats[0]!;
  let square = mats[1]!;
  const t = mats[2]!;
  const u = mats[3]!;
  const powerT = mats[4]!;
  for (let iter = 0; iter < 64; iter++) {
    transpose(power, n, powerT);
    for (let g = 0; g < grams.length; g++) addCongruence(grams[g]!, power, powerT, n, t, u);
    multiply(power, power, n, square);
    const previous = power;
    power = square;
    square = previous;
    let big = 0;
    for (let i = 0; i < n * n; i++) big = Math.max(big, Math.abs(power[i]!));
    if (!Number.isFinite(big) || big > 1e150) return false;
    if (big < 1e-6) return true;
  }
  return false;
}

/**
 * DC gain D + C·(I − A)⁻¹·B from every input to every output (Gaussian elimination with partial
 * pivoting): where the mean of a truncating point ends up. Null when I − A is singular.
 */
export function dcGains(loop: LinearLoop): number[][] | null {
  const { stateCount: n, inputCount: m, outputCount: p, a, b, c, d } = loop;
  const w = n + m;
  const aug = new Float64Array(n * w);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) aug[i * w + j] = (i === j ? 1 : 0) - a[i * n + j]!;
    for (let j = 0; j < m; j++) aug[i * w + n + j] = b[i * m + j]!;
  }
  for (let col = 0; col < n; col++) {
    let piv = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(aug[r * w + col]!) > Math.abs(aug[piv * w + col]!)) piv = r;
    if (Math.abs(aug[piv * w + col]!) < 1e-300) return null;
    if (piv !== col) for (let j = 0; j < w; j++) [aug[col * w + j], aug[piv * w + j]] = [aug[piv * w + j]!, aug[col * w + j]!];
    const pv = aug[col * w + col]!;
    for (let r = 0; r < n; r++) {
      if (r === col) continue;
      const f = aug[r * w + col]! / pv;
      if (f === 0) continue;
      for (let j = col; j < w; j++) aug[r * w + j] = aug[r * w + j]! - f * aug[col * w + j]!;
    }
  }
  const out: number[][] = [];
  for (let o = 0; o < p; o++) {
    const row: number[] = [];
    for (let i = 0; i < m; i++) {
      let acc = d[o * m + i]!;
      for (let r = 0; r < n; r++) acc += (c[o * n + r]! * aug[r * w + n + i]!) / aug[r * w + r]!;
      row.push(acc);
    }
    out.push(row);
  }
  return out;
}

/** Samples after which the impulse response is cut when it has not died away (its tail is then extrapolated). */
export const MAX_IMPULSE_SAMPLES = 1 << 16;

export interface ImpulseNorms {
  /** Σ|h[n]| from the input to each section output. */
  readonly l1: readonly number[];
  /** √(Σ h[n]²) from the input to each section output. */
  readonly l2: readonly number[];
  /** Samples run; `extrapolated` when the run hit MAX_IMPULSE_SAMPLES and the tail was estimated geometrically. */
  readonly samples: number;
  readonly extrapolated: boolean;
}

/**
 * Run the impulse response from input `input` until every state has fallen below 1e-8 of the largest
 * output seen (checked every 64 samples), accumulating L1 and L2 of each section output. Sample 0, where
 * the impulse enters, is linearStep itself; after it the response is the free evolution of the state,
 * run flat over typed arrays (O(K) per sample, no dense matrices): this loop is most of the cost of the
 * noise analysis, and runs in the analysis's WebAssembly module where it can (wasm/analysisKernel.ts,
 * the same doubles).
 */
export function impulseNorms(loop: LinearLoop, input: number): ImpulseNorms {
  const { sections, kd, koTRadPerUnit: koT, stateCount, inputCount, outputCount } = loop;
  const k = sections.length;
  const coef = Float64Array.from(sections.flatMap((x) => [x.b[0], x.b[1], x.b[2], x.a[1], x.a[2]]));
  const l1 = new Float64Array(k);
  const l2 = new Float64Array(k);
  const block = new Float64Array(k);
  const prevBlock = new Float64Array(k);
  const impulse = new Float64Array(inputCount);
  impulse[input] = 1;
  const state = new Float64Array(stateCount);
  const out = new Float64Array(outputCount);
  linearStep(sections, kd, koT, new Float64Array(stateCount), impulse, state, out);
  for (let j = 0; j < k; j++) {
    const h = Math.abs(out[j]!);
    block[j] = block[j]! + h;
    l2[j] = l2[j]! + h * h;
  }
  const run = kernelFreeResponse(coef, kd, koT, state, l1, l2, block, prevBlock, MAX_IMPULSE_SAMPLES) ?? runFreeResponse(coef, kd, koT, state, l1, l2, block, prevBlock);
  const done = run > 0;
  const samples = Math.abs(run);
  if (!done) {
    // A slowly decaying tail: take the block-to-block ratio as its geometric rate (one dominant mode).
    for (let j = 0; j < k; j++) {
      const ratio = prevBlock[j]! > 0 ? Math.min(block[j]! / prevBlock[j]!, 0.999999) : 0;
      l1[j] = l1[j]! + (block[j]! * ratio) / (1 - ratio);
      l2[j] = l2[j]! + ((block[j]! ** 2 / 64) * (ratio * ratio)) / (1 - ratio * ratio);
    }
  }
  return { l1: Array.from(l1), l2: Array.from(l2, Math.sqrt), samples, extrapolated: !done };
}

/**
 * The loop of impulseNorms from sample 1 on, the state after the impulse given (linearStep's layout) and
 * sample 0's |h| already in block and its square in l2: L1 (by blocks of 64) and the sum of squares into
 * l1 and l2, the last two blocks' L1 into block and prevBlock. Returns the samples run, negated when the
 * response had not died away by MAX_IMPULSE_SAMPLES. Without an input the step has no "+ e" terms: one
 * addition fewer per section, the detector and the phase on the chain every sample waits for; a dropped
 * "+ 0" can only turn a −0 into +0, which no |h|, sum or comparison here can tell apart. Nothing follows
 * the loop but the return: code after a hot loop runs in the loop's on-stack-replaced compile without
 * type feedback and left it by a deoptimisation.
 */
export function runFreeResponse(coef: Float64Array, kd: number, koT: number, x: Float64Array, l1: Float64Array, l2: Float64Array, block: Float64Array, prevBlock: Float64Array): number {
  const k = l1.length;
  // Section states y[n−1], y[n−2]; detector states u[n−1], u[n−2]; NCO phase θ.
  const ys = x.slice(3);
  let u1 = x[1]!;
  let u2 = x[2]!;
  let theta = x[0]!;
  let peak = 0;
  for (let j = 0; j < k; j++) if (block[j]! > peak) peak = block[j]!;
  let samples = 1;
  let done = false;
  for (;;) {
    for (let i = samples % 64; i < 64; i++) {
      const u = -kd * theta;
      let v = u;
      let x1 = u1;
      let x2 = u2;
      for (let j = 0; j < k; j++) {
        const o = 5 * j;
        const y1 = ys[2 * j]!;
        const y2 = ys[2 * j + 1]!;
        const y = coef[o]! * v + coef[o + 1]! * x1 + coef[o + 2]! * x2 - coef[o + 3]! * y1 - coef[o + 4]! * y2;
        ys[2 * j] = y;
        ys[2 * j + 1] = y1;
        x1 = y1;
        x2 = y2;
        v = y;
        const h = y < 0 ? -y : y;
        block[j] = block[j]! + h;
        l2[j] = l2[j]! + h * h;
        if (h > peak) peak = h;
      }
      u2 = u1;
      u1 = u;
      theta = theta + koT * v;
      samples++;
    }
    for (let j = 0; j < k; j++) l1[j] = l1[j]! + block[j]!;
    let live = Math.max(Math.abs(theta), Math.abs(u1), Math.abs(u2));
    for (let i = 0; i < 2 * k; i++) live = Math.max(live, Math.abs(ys[i]!));
    done = live < 1e-8 * Math.max(peak, 1e-300);
    if (done || samples >= MAX_IMPULSE_SAMPLES) break;
    prevBlock.set(block);
    block.fill(0);
  }
  return done ? samples : -samples;
}
