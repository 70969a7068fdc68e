/**
 * The noise bandwidth found from Gramians (As70, ZDG96) against SciPy (test/reference/scipy_reference.py
 * "noiseExact", built from the zpk of F(s) and bilinear_zpk on its own): the integral ∫|H|² df by
 * scipy.integrate.quad, and SciPy's Gramians (solve_continuous_lyapunov / solve_discrete_lyapunov, which
 * keep fewer digits of a narrow discrete loop: 1e-8). Also against the integral it replaced, our Simpson
 * integral, run far finer and wider than the analysis ran it.
 */
import { describe, expect, it } from 'vitest';
import { analyzeDesign } from '../../src/planDesign.ts';
import type { LoopSpec } from '../../src/spec/schema.ts';
import { exampleSpecs } from '../../src/spec/examples.ts';
import { analysisRange } from '../../src/analysis/frequencyRange.ts';
import { analogLoopResponse, closedLoop, discreteLoopResponse } from '../../src/analysis/response.ts';
import { numericNoiseBandwidthHz } from '../../src/analysis/noiseBandwidth.ts';
import { continuousEnergy } from '../../src/analysis/lyapunov.ts';
import { runScipyReference } from '../reference/scipy.ts';
import { randomValidSpecs } from '../reference/random.ts';

const specs: LoopSpec[] = [...exampleSpecs.map((e) => e.spec), ...randomValidSpecs(20261203, 16)];
const results = specs.map((s) => analyzeDesign(s));
const stable = results.map((r) => r.stability.analogStable && r.stability.discreteStable);
const ranges = specs.map((s, i) => analysisRange(results[i]!.filter.analogSections, results[i]!.loopGain.kRadPerS, s.sampleRateHz));
interface RefNoise { analogLyapunovHz: number; discreteLyapunovHz: number; analogQuadHz: number; discreteQuadHz: number }
const ref = runScipyReference<{ noiseExact: RefNoise[] }>({
  noiseExact: specs.map((s, i) => ({
    sampleRateHz: s.sampleRateHz,
    kRadPerS: results[i]!.loopGain.kRadPerS,
    filter: s.filter,
    rippleFilter: s.rippleFilter ?? null,
    prewarpHz: s.discretization.prewarpHz,
    fMinHz: ranges[i]!.fMinHz,
    fMaxAnalogHz: ranges[i]!.fMaxAnalogHz,
  })),
}).noiseExact;

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('noise bandwidth by Gramians (As70, ZDG96)', () => {
  it('the single-pole loop K/(s + K) has energy K/2 (∫ K²e^(−2Kt) dt)', () => {
    expect(rel(continuousEnergy([1e4], [1, 1e4])!, 5e3)).toBeLessThan(1e-14);
  });

  it('a third-order H has the energy its table integral gives, (b2²·a0·a1 + (b1² − 2·b0·b2)·a0·a3 + b0²·a2·a3)/(2·a0·a3·(a1·a2 − a0·a3)) (standard integral table, memory)', () => {
    // H = (b0·s² + b1·s + b2)/(a0·s³ + a1·s² + a2·s + a3)
    const [b0, b1, b2] = [0.3, 2, 5];
    const [a0, a1, a2, a3] = [1, 4, 6, 3];
    const table = (b2 * b2 * a0 * a1 + (b1 * b1 - 2 * b0 * b2) * a0 * a3 + b0 * b0 * a2 * a3) / (2 * a0 * a3 * (a1 * a2 - a0 * a3));
    expect(rel(continuousEnergy([b0, b1, b2], [a0, a1, a2, a3])!, table)).toBeLessThan(1e-13);
  });

  it.each(specs.map((s, i) => [i, s.name, s.filter.kind] as const))('case %i (%s, %s) equals SciPy’s Gramians and the integral', (i) => {
    const r = results[i]!;
    if (!stable[i]) return expect(r.noiseBandwidth.discreteHz === null || r.noiseBandwidth.analogHz === null).toBe(true);
    const s = specs[i]!;
    const k = r.loopGain.kRadPerS;
    const range = ranges[i]!;
    const { analogHz, discreteHz } = r.noiseBandwidth;
    expect(rel(analogHz!, ref[i]!.analogQuadHz)).toBeLessThan(1e-9);
    expect(rel(discreteHz!, ref[i]!.discreteQuadHz)).toBeLessThan(1e-9);
    expect(rel(analogHz!, ref[i]!.analogLyapunovHz)).toBeLessThan(1e-9);
    expect(rel(discreteHz!, ref[i]!.discreteLyapunovHz)).toBeLessThan(1e-8);
    const fine = { intervals: 20000 };
    const analogIntegral = numericNoiseBandwidthHz(closedLoop(analogLoopResponse(r.filter.analogSections, k)), range.fMinHz * 1e-3, range.fMaxAnalogHz * 1e3, { ...fine, tail: true });
    const discreteIntegral = numericNoiseBandwidthHz(closedLoop(discreteLoopResponse(r.filter.sections, k, s.sampleRateHz)), range.fMinHz * 1e-3, range.nyquistHz, fine);
    expect(rel(analogHz!, analogIntegral)).toBeLessThan(1e-9);
    expect(rel(discreteHz!, discreteIntegral)).toBeLessThan(1e-9);
  });
});
