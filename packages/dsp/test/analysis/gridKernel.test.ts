/// <reference types="node" />
/**
 * The analysis's grid module (src/analysis/wasm/gridKernel.ts) gives the doubles of the TypeScript
 * passes it stands in for, bit for bit (Object.is on every value, so a −0 or a NaN counts): the open
 * loop's samples and unwrapped phase on a grid (samplePhase, bode.ts), analog and of digital sections,
 * for the demo specs and seeded random specs (designed and quantised sections), on their analysis grids
 * and on random grids. The TypeScript passes themselves are checked against SciPy in
 * scipy-loops.test.ts and against published figures in test/audit.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { assembleKernel, kernelBytesModule, kernelBytesPath } from '../../scripts/assembleKernel.ts';
import { GRID_KERNEL_WASM_BASE64 } from '../../src/analysis/wasm/gridKernelBytes.ts';
import { GRID_KERNEL_MAX_POINTS, kernelSamplePhase } from '../../src/analysis/wasm/gridKernel.ts';
import { analogLoopResponse, discreteLoopResponse, type GridResponseFn } from '../../src/analysis/response.ts';
import { type SampledPhase, samplePhase } from '../../src/analysis/bode.ts';
import { logGrid } from '../../src/analysis/grid.ts';
import { analysisRange } from '../../src/analysis/frequencyRange.ts';
import { planDesign } from '../../src/planDesign.ts';
import { parseLoopSpec } from '../../src/spec/schema.ts';
import { exampleSpecs } from '../../src/spec/examples.ts';
import { logUniform, mulberry32, randomLoopSpec } from '../reference/random.ts';

interface Case {
  readonly label: string;
  readonly fn: GridResponseFn;
  readonly grid: readonly number[];
  readonly loopType: number;
}

/** The analog, designed discrete and quantised discrete loops of demo and random specs, on their grids. */
function cases(count: number): Case[] {
  const specs = exampleSpecs.map((e) => e.spec);
  const rnd = mulberry32(41);
  for (let i = 0; specs.length < count && i < 20 * count; i++) specs.push(randomLoopSpec(rnd, i));
  const out: Case[] = [];
  specs.forEach((input, n) => {
    const parsed = parseLoopSpec(input);
    if (!parsed.ok) return;
    const spec = parsed.spec;
    const plan = planDesign(spec);
    const k = plan.analysis.loopGain.kRadPerS;
    const fs = spec.sampleRateHz;
    const loopType = plan.analysis.loopType;
    const range = analysisRange(plan.filter.analogSections, k, fs);
    const analog = analogLoopResponse(plan.filter.analogSections, k);
    out.push({ label: `analog ${n}`, fn: analog, grid: logGrid(range.fMinHz, range.fMaxAnalogHz, 600), loopType });
    const grid = logGrid(range.fMinHz, fs / 2, 600);
    out.push({ label: `designed ${n}`, fn: discreteLoopResponse(plan.filter.sections, k, fs), grid, loopType });
    if (plan.quantized) out.push({ label: `quantised ${n}`, fn: discreteLoopResponse(plan.quantized.sections.map((s) => s.quantized), k, fs), grid, loopType });
    // Random sorted grids, of random length, up to fs/2.
    const m = 2 + Math.floor(rnd() * 900);
    const random = Array.from({ length: m }, () => logUniform(rnd, range.fMinHz, fs / 2)).sort((a, b) => a - b);
    out.push({ label: `analog ${n}, random grid`, fn: analog, grid: random, loopType });
    out.push({ label: `designed ${n}, random grid`, fn: discreteLoopResponse(plan.filter.sections, k, fs), grid: random, loopType });
  });
  return out;
}

const CASES = cases(40);

/** The same response without its module description: samplePhase takes the TypeScript pass. */
function typeScriptOnly(fn: GridResponseFn): GridResponseFn {
  return Object.assign((f: number) => fn(f), { fill: fn.fill });
}

function expectSameDoubles(actual: readonly number[], expected: readonly number[]): void {
  expect(actual.length).toBe(expected.length);
  for (let i = 0; i < expected.length; i++) if (!Object.is(actual[i], expected[i])) expect([i, actual[i]]).toEqual([i, expected[i]]);
}

function expectSameSamples(actual: SampledPhase, expected: SampledPhase): void {
  expectSameDoubles(actual.re, expected.re);
  expectSameDoubles(actual.im, expected.im);
  expectSameDoubles(actual.phaseDeg, expected.phaseDeg);
}

describe('the analysis grid WebAssembly module', () => {
  it('is the .wat as it stands, assembled by wabt', async () => {
    const bytes = await assembleKernel('grid');
    expect(Buffer.from(bytes).toString('base64')).toBe(GRID_KERNEL_WASM_BASE64);
    expect(readFileSync(kernelBytesPath('grid'), 'utf8')).toBe(kernelBytesModule(bytes, 'grid'));
  });

  it('runs in Node (so the comparisons below compare two different passes)', () => {
    expect(CASES.length).toBeGreaterThan(100);
    for (const c of CASES.slice(0, 3)) expect(kernelSamplePhase(c.fn.kernel!, c.grid, c.loopType)).not.toBeNull();
  });

  it.each(CASES.map((c) => [c.label, c] as const))('%s: the samples and unwrapped phase of the TypeScript pass', (_label, c) => {
    const k = kernelSamplePhase(c.fn.kernel!, c.grid, c.loopType);
    expect(k).not.toBeNull();
    expectSameSamples({ freqHz: c.grid, ...k! }, samplePhase(typeScriptOnly(c.fn), c.grid, c.loopType));
  });

  it('declines a value that is not finite and a grid longer than its memory, so the TypeScript pass runs', () => {
    const c = CASES[0]!;
    const sections = [{ num: [1], den: [1, 0, 0] }]; // 1/s² times K/s: at K = ∞ every value is ∞ or NaN
    const infinite = analogLoopResponse(sections, Infinity);
    expect(kernelSamplePhase(infinite.kernel!, c.grid, 1)).toBeNull();
    expectSameSamples(samplePhase(infinite, c.grid, 1), samplePhase(typeScriptOnly(infinite), c.grid, 1));
    const long = logGrid(c.grid[0]!, c.grid[c.grid.length - 1]!, GRID_KERNEL_MAX_POINTS + 1);
    expect(kernelSamplePhase(c.fn.kernel!, long, c.loopType)).toBeNull();
    expectSameSamples(samplePhase(c.fn, long, c.loopType), samplePhase(typeScriptOnly(c.fn), long, c.loopType));
  });
});
