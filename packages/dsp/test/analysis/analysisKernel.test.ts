/// <reference types="node" />
/**
 * The analysis's WebAssembly loops (src/analysis/wasm/analysisKernel.ts) give the doubles of the
 * TypeScript loops they stand in for, bit for bit (Object.is on every value, so a −0 or a NaN counts):
 * the linearised loop's free response behind impulseNorms (linearLoop.ts), the discrete step
 * responses (stepResponse.ts) and the noise Gramian's matrix products (linearLoop.ts, multiply), over the
 * quantised sections of seeded random specs and of the demo specs, with random states, decaying, cut at
 * the sample limit and diverging, and over random matrices holding zeros, −0 and non-finite values. The TypeScript loops themselves
 * are checked against outside references in test/audit (datapathNoise, steps).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { assembleKernel, kernelBytesModule, kernelBytesPath } from '../../scripts/assembleKernel.ts';
import { ANALYSIS_KERNEL_WASM_BASE64 } from '../../src/analysis/wasm/analysisKernelBytes.ts';
import { alongsideFreeResponse, KERNEL_MAX_KEPT, KERNEL_MAX_SECTIONS, kernelFreeResponse, kernelMatrices, type KernelStepJob } from '../../src/analysis/wasm/analysisKernel.ts';
import { gramianNoiseGains, linearLoop, MAX_IMPULSE_SAMPLES, multiply, runFreeResponse } from '../../src/analysis/linearLoop.ts';
import { DIVERGED_RAD, kernelSteps, PLOT_POINTS, runDiscreteSteps, stepLoop, type Traces } from '../../src/analysis/stepResponse.ts';
import { planDesign } from '../../src/planDesign.ts';
import { parseLoopSpec } from '../../src/spec/schema.ts';
import { exampleSpecs } from '../../src/spec/examples.ts';
import type { Sos } from '../../src/types/filter.ts';
import { logUniform, mulberry32, randomLoopSpec, uniform } from '../reference/random.ts';

/** Quantised sections with their loop's Kd and Ko·T: the demo specs', then seeded random specs'. */
function loops(count: number): { sections: readonly Sos[]; kd: number; koT: number; kRadPerS: number; sampleRateHz: number }[] {
  const out = [];
  const specs = [...exampleSpecs.map((e) => e.spec)];
  const rnd = mulberry32(16);
  for (let i = 0; specs.length < count && i < 20 * count; i++) specs.push(randomLoopSpec(rnd, i));
  for (const input of specs) {
    const parsed = parseLoopSpec(input);
    if (!parsed.ok) continue;
    const plan = planDesign(parsed.spec);
    if (!plan.quantized || !plan.nco.control) continue;
    const sections = plan.quantized.sections.map((s) => s.quantized);
    const koT = (2 * Math.PI * plan.nco.control.actualGainHzPerUnit) / parsed.spec.sampleRateHz;
    const loop = linearLoop(sections, plan.analysis.loopGain.kd, koT);
    out.push({ sections, kd: loop.kd, koT, kRadPerS: plan.analysis.loopGain.kRadPerS, sampleRateHz: parsed.spec.sampleRateHz });
  }
  return out;
}

const CASES = loops(40);

function coefficients(sections: readonly Sos[]): Float64Array {
  return Float64Array.from(sections.flatMap((s) => [s.b[0], s.b[1], s.b[2], s.a[1], s.a[2]]));
}

function expectSameDoubles(actual: ArrayLike<number>, expected: ArrayLike<number>): void {
  expect(actual.length).toBe(expected.length);
  for (let i = 0; i < expected.length; i++) if (!Object.is(actual[i], expected[i])) expect([i, actual[i]]).toEqual([i, expected[i]]);
}

/** Both loops from copies of the same inputs: their return values and the four arrays they leave. */
function freeResponses(coef: Float64Array, kd: number, koT: number, x: Float64Array, block0: Float64Array) {
  const k = block0.length;
  const run = (kernel: boolean) => {
    const arrays = { l1: new Float64Array(k), l2: block0.map((h) => h * h), block: Float64Array.from(block0), prevBlock: new Float64Array(k) };
    const state = Float64Array.from(x);
    const samples = kernel
      ? kernelFreeResponse(coef, kd, koT, state, arrays.l1, arrays.l2, arrays.block, arrays.prevBlock, MAX_IMPULSE_SAMPLES)
      : runFreeResponse(coef, kd, koT, state, arrays.l1, arrays.l2, arrays.block, arrays.prevBlock);
    expectSameDoubles(state, x);
    return { samples, ...arrays };
  };
  return { wasm: run(true), ts: run(false) };
}

function traces(room: number): Traces {
  const doubles = () => new Array<number>(room).fill(0.5);
  return { timeS: doubles(), phaseStepErrorRad: doubles(), frequencyStepErrorRad: doubles(), kept: 0, diverged: false };
}

describe('the analysis WebAssembly module', () => {
  it('is the .wat as it stands, assembled by wabt', async () => {
    const bytes = await assembleKernel('analysis');
    expect(Buffer.from(bytes).toString('base64')).toBe(ANALYSIS_KERNEL_WASM_BASE64);
    expect(readFileSync(kernelBytesPath('analysis'), 'utf8')).toBe(kernelBytesModule(bytes, 'analysis'));
  });

  it('runs in Node (so the comparisons below compare two different loops)', () => {
    expect(CASES.length).toBeGreaterThan(20);
    const c = CASES[0]!;
    const k = c.sections.length;
    expect(kernelFreeResponse(coefficients(c.sections), c.kd, c.koT, new Float64Array(3 + 2 * k), new Float64Array(k), new Float64Array(k), new Float64Array(k), new Float64Array(k), 64)).not.toBeNull();
  });

  it('leaves the free response of the TypeScript loop: samples run, L1, sums of squares and the last two blocks', () => {
    const rnd = mulberry32(3);
    for (const c of CASES) {
      const k = c.sections.length;
      for (let trial = 0; trial < 3; trial++) {
        const x = Float64Array.from({ length: 3 + 2 * k }, () => uniform(rnd, -1, 1) * logUniform(rnd, 1e-6, 10));
        const block0 = Float64Array.from({ length: k }, () => Math.abs(uniform(rnd, -1, 1)));
        const { wasm, ts } = freeResponses(coefficients(c.sections), c.kd, c.koT, x, block0);
        expect(wasm.samples).toBe(ts.samples);
        for (const key of ['l1', 'l2', 'block', 'prevBlock'] as const) expectSameDoubles(wasm[key], ts[key]);
      }
    }
    // A loop that rings for ever (a pole on the unit circle): both cut the run at the limit, alike.
    const ring = freeResponses(Float64Array.from([1, 0, 0, -1.8, 1]), 0, 0, Float64Array.from([0, 0, 0, 1, 0.5]), Float64Array.from([1]));
    expect(ring.ts.samples).toBe(-MAX_IMPULSE_SAMPLES);
    expect(ring.wasm.samples).toBe(ring.ts.samples);
    for (const key of ['l1', 'l2', 'block', 'prevBlock'] as const) expectSameDoubles(ring.wasm[key], ring.ts[key]);
  });

  it('keeps the step-response samples of the TypeScript loop, up to where a diverging loop stops', () => {
    const rnd = mulberry32(5);
    let diverged = 0;
    for (const c of CASES) {
      // The loop's own gain, and a gain 10³–10⁵ times it that can make the loop unstable.
      for (const kRadPerS of [c.kRadPerS, c.kRadPerS * logUniform(rnd, 1e3, 1e5)]) {
        const n = 1 + Math.floor(rnd() * 20_000);
        const stride = Math.max(1, Math.floor(n / PLOT_POINTS));
        const room = Math.ceil(n / stride);
        const loop = stepLoop(c.sections, kRadPerS, c.sampleRateHz);
        const wasm = traces(room);
        const ts = traces(room);
        expect(kernelSteps(loop, n, stride, wasm)).toBe(true);
        runDiscreteSteps(loop, n, stride, ts);
        expect([wasm.kept, wasm.diverged]).toEqual([ts.kept, ts.diverged]);
        for (const key of ['timeS', 'phaseStepErrorRad', 'frequencyStepErrorRad'] as const) expectSameDoubles(wasm[key], ts[key]);
        if (ts.diverged) diverged++;
      }
    }
    expect(diverged).toBeGreaterThan(0);
  });

  it('runs a step response beside a free response (freeResponseWithSteps) as each runs alone', () => {
    const rnd = mulberry32(11);
    let fused = 0;
    let diverged = 0;
    for (const [index, c] of CASES.entries()) {
      // The step run of another loop (as the analysis pairs the quantised loop's free response with the designed
      // loop's steps), shorter or longer than the free response, at the loop's gain or one that can diverge.
      const other = CASES[(index + 7) % CASES.length]!;
      const k = c.sections.length;
      for (const kRadPerS of [other.kRadPerS, other.kRadPerS * logUniform(rnd, 1e3, 1e5)]) {
        const n = 1 + Math.floor(rnd() * 20_000);
        const stride = Math.max(1, Math.floor(n / PLOT_POINTS));
        const room = Math.ceil(n / stride);
        const loop = stepLoop(other.sections, kRadPerS, other.sampleRateHz);
        const x = Float64Array.from({ length: 3 + 2 * k }, () => uniform(rnd, -1, 1) * logUniform(rnd, 1e-6, 10));
        const block0 = Float64Array.from({ length: k }, () => Math.abs(uniform(rnd, -1, 1)));
        const job: KernelStepJob = { ...loop, n, stride, divergedRad: DIVERGED_RAD, out: traces(room), ran: false };
        const together = alongsideFreeResponse(job, () => freeResponses(coefficients(c.sections), c.kd, c.koT, x, block0).wasm);
        expect(job.ran).toBe(true);
        const alone = freeResponses(coefficients(c.sections), c.kd, c.koT, x, block0).ts;
        expect(together.samples).toBe(alone.samples);
        for (const key of ['l1', 'l2', 'block', 'prevBlock'] as const) expectSameDoubles(together[key], alone[key]);
        const ts = traces(room);
        runDiscreteSteps(loop, n, stride, ts);
        expect([job.out.kept, job.out.diverged]).toEqual([ts.kept, ts.diverged]);
        for (const key of ['timeS', 'phaseStepErrorRad', 'frequencyStepErrorRad'] as const) expectSameDoubles(job.out[key].slice(0, ts.kept), ts[key].slice(0, ts.kept));
        if (ts.diverged) diverged++;
        if (n > Math.abs(alone.samples ?? 0)) fused++;
      }
    }
    // Both orders of ending (the step run outlasting the free response and not), and diverging runs, were met.
    expect(fused).toBeGreaterThan(5);
    expect(fused).toBeLessThan(2 * CASES.length - 5);
    expect(diverged).toBeGreaterThan(0);
  });

  it('takes a step run only within alongsideFreeResponse, once, and never one its memory cannot hold', () => {
    const c = CASES[0]!;
    const k = c.sections.length;
    const loop = stepLoop(c.sections, c.kRadPerS, c.sampleRateHz);
    const job = (n: number, stride: number): KernelStepJob => ({ ...loop, n, stride, divergedRad: DIVERGED_RAD, out: traces(Math.ceil(n / stride)), ran: false });
    const free = () => freeResponses(coefficients(c.sections), c.kd, c.koT, new Float64Array(3 + 2 * k).fill(0.5), new Float64Array(k).fill(0.5));
    const first = job(1000, 3);
    const second = job(1000, 3);
    alongsideFreeResponse(first, () => {
      free();
      alongsideFreeResponse(null, free);
      return free();
    });
    expect(first.ran).toBe(true);
    free();
    expect(second.ran).toBe(false);
    const tooMany = job(KERNEL_MAX_KEPT + 1, 1);
    alongsideFreeResponse(tooMany, free);
    expect(tooMany.ran).toBe(false);
  });

  it('multiplies matrices as the TypeScript multiply does, zeros skipped, every size of row', () => {
    const rnd = mulberry32(7);
    const entry = () => {
      const r = rnd();
      if (r < 0.25) return 0;
      if (r < 0.3) return -0;
      if (r < 0.31) return [Infinity, -Infinity, Number.NaN][Math.floor(rnd() * 3)]!;
      return uniform(rnd, -1, 1) * logUniform(rnd, 1e-12, 1e12);
    };
    for (let n = 1; n <= 20; n++) {
      for (let trial = 0; trial < 5; trial++) {
        const km = kernelMatrices(n, 3)!;
        const [x, y, out] = km.matrices as [Float64Array, Float64Array, Float64Array];
        for (let i = 0; i < n * n; i++) {
          x[i] = entry();
          y[i] = entry();
        }
        const expected = new Float64Array(n * n);
        multiply(Float64Array.from(x), Float64Array.from(y), n, expected);
        km.multiply(x, y, n, out);
        // Lanes whose sums meet a NaN may carry another NaN's bits; Object.is counts every NaN alike.
        expectSameDoubles(out, expected);
      }
    }
  });

  it('gives the noise gains of the TypeScript doubling (gramian), and declines a loop that grows alike', () => {
    let compared = 0;
    for (const c of CASES) {
      const k = c.sections.length;
      const loop = linearLoop(c.sections, c.kd, c.koT);
      const outputs = [k - 1, k];
      const ts = gramianNoiseGains(loop, outputs, null);
      const wasm = gramianNoiseGains(loop, outputs, kernelMatrices(loop.stateCount, 5 + outputs.length));
      expect(wasm === null).toBe(ts === null);
      if (!ts || !wasm) continue;
      for (let o = 0; o < outputs.length; o++) expectSameDoubles(wasm[o]!, ts[o]!);
      compared++;
    }
    expect(compared).toBeGreaterThan(20);
    // A loop whose section has a pole outside the unit circle: A^(2^j) grows past the bound in both.
    const growing = linearLoop([{ b: [1, 0, 0], a: [1, -2.5, 1.2] }], 0.01, 0.01);
    expect(gramianNoiseGains(growing, [0, 1], null)).toBeNull();
    expect(gramianNoiseGains(growing, [0, 1], kernelMatrices(growing.stateCount, 7))).toBeNull();
  });

  it('declines what its memory cannot hold, so the TypeScript loop runs', () => {
    const sections: Sos[] = Array.from({ length: KERNEL_MAX_SECTIONS + 1 }, () => ({ b: [1, 0, 0], a: [1, -0.5, 0] }));
    const k = sections.length;
    expect(kernelFreeResponse(coefficients(sections), 0.1, 0.1, new Float64Array(3 + 2 * k), new Float64Array(k), new Float64Array(k), new Float64Array(k), new Float64Array(k), 64)).toBeNull();
    expect(kernelSteps(stepLoop(sections, 1, 1e3), 100, 1, traces(100))).toBe(false);
    expect(kernelSteps(stepLoop(sections.slice(0, 1), 1, 1e3), KERNEL_MAX_KEPT + 1, 1, traces(KERNEL_MAX_KEPT + 1))).toBe(false);
    expect(kernelMatrices(25, 7)).toBeNull();
    expect(kernelMatrices(25, 6)).not.toBeNull();
  });
});
