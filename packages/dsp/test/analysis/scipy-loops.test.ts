/**
 * Margins, closed-loop figures and noise bandwidth of random loops against SciPy, live
 * (test/reference/scipy_reference.py: freqs_zpk / freqz_zpk after bilinear_zpk on a 20 000-point
 * log grid refined with brentq, quad for the noise integral). The Python side builds F(s) from the
 * DESIGN.md formulas on its own; only the spec's numbers are shared.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { analyzeDesign } from '../../src/planDesign.ts';
import type { AnalysisResult } from '../../src/types/analysis.ts';
import type { LoopSpec } from '../../src/spec/schema.ts';
import { analysisRange } from '../../src/analysis/frequencyRange.ts';
import { runScipyReference } from '../reference/scipy.ts';
import { randomValidSpecs } from '../reference/random.ts';

interface RefMargins {
  crossoverHz: number | null;
  phaseMarginDeg: number | null;
  phaseCrossoverHz: number | null;
  gainMarginDb: number | null;
}
interface RefClosed {
  bandwidth3dbHz: number | null;
  peakingDb: number;
}
interface RefLoop {
  analog: RefMargins;
  discrete: RefMargins;
  analogClosed: RefClosed;
  discreteClosed: RefClosed;
  analogNoiseHz?: number;
  discreteNoiseHz?: number;
  analogMagDb: number[];
  discreteMagDb: number[];
  analogPhaseDeg: number[];
  discretePhaseDeg: number[];
  step?: { phase: number[]; frequency: number[] };
}

const RANDOM_CASES = 120;
const BOOSTED_CASES = 40;
const random = randomValidSpecs(20261202, RANDOM_CASES);
// The same loops with 30x the loop gain: many become unstable, so stability is exercised both ways.
const boosted = random.slice(0, BOOSTED_CASES).map((s) => ({ ...s, name: `${s.name}_boosted`, nco: { ...s.nco, gainHzPerUnit: s.nco.gainHzPerUnit * 30 } }));
const specs = [...random, ...boosted];
const CASES = specs.length;
let results: AnalysisResult[] = [];
let ref: RefLoop[] = [];

function probeFrequencies(spec: LoopSpec, r: AnalysisResult): number[] {
  const fc = r.margins.discrete.crossoverHz ?? spec.sampleRateHz / 1000;
  return [fc / 10, fc, fc * 3, spec.sampleRateHz * 0.3];
}

/** Step responses are checked on a few stable random loops run sample by sample (the Python loop is slow). */
const stepCase = (i: number) => i % 10 === 1 && results[i]!.stepResponses.source === 'discrete' && results[i]!.stability.discreteStable;

beforeAll(() => {
  results = specs.map((s) => analyzeDesign(s));
  const loops = specs.map((s, i) => {
    const r = results[i]!;
    const range = analysisRange(r.filter.analogSections, r.loopGain.kRadPerS, s.sampleRateHz);
    return {
      sampleRateHz: s.sampleRateHz,
      kRadPerS: r.loopGain.kRadPerS,
      filter: s.filter,
      rippleFilter: s.rippleFilter ?? null,
      prewarpHz: s.discretization.prewarpHz,
      fMinHz: range.fMinHz,
      fMaxAnalogHz: range.fMaxAnalogHz,
      noiseBandwidth: i % 3 === 0,
      stepSamples: stepCase(i) ? Math.round(r.stepResponses.timeS.at(-1)! * s.sampleRateHz) + 1 : 0,
      freqHz: probeFrequencies(s, r),
    };
  });
  ref = runScipyReference<{ loops: RefLoop[] }>({ loops }).loops;
}, 120_000);

/** Relative closeness for frequencies; both null counts as agreement. */
function expectHzClose(actual: number | null, expected: number | null, rel: number, what: string): void {
  if (expected === null || actual === null) {
    expect(actual, what).toBe(expected);
    return;
  }
  expect(Math.abs(actual - expected) / expected, `${what}: ${actual} vs ${expected}`).toBeLessThan(rel);
}

function expectAbsClose(actual: number | null, expected: number | null, tol: number, what: string): void {
  if (expected === null || actual === null) {
    expect(actual, what).toBe(expected);
    return;
  }
  expect(Math.abs(actual - expected), `${what}: ${actual} vs ${expected}`).toBeLessThan(tol);
}

const wrap180 = (d: number) => ((((d + 180) % 360) + 360) % 360) - 180;

describe(`loop analysis agrees with SciPy on ${CASES} seeded random specs (${BOOSTED_CASES} with boosted gain)`, () => {
  it.each(specs.map((s, i) => [i, s.filter.kind, s.rippleFilter ? 'ripple' : 'no ripple'] as const))(
    'case %i (%s, %s): analog and discrete margins',
    (i) => {
      const r = results[i]!;
      const p = ref[i]!;
      for (const which of ['analog', 'discrete'] as const) {
        const m = r.margins[which];
        const q = p[which];
        expectHzClose(m.crossoverHz, q.crossoverHz, 1e-7, `${which} crossoverHz`);
        expectAbsClose(m.phaseMarginDeg, q.phaseMarginDeg, 1e-5, `${which} phaseMarginDeg`);
        expectHzClose(m.phaseCrossoverHz, q.phaseCrossoverHz, 1e-7, `${which} phaseCrossoverHz`);
        expectAbsClose(m.gainMarginDb, q.gainMarginDb, 1e-5, `${which} gainMarginDb`);
      }
    },
  );

  it.each(specs.map((_, i) => [i] as const))('case %i: closed-loop bandwidth and peaking (null with a note when unstable)', (i) => {
    const r = results[i]!;
    const p = ref[i]!;
    for (const which of ['analog', 'discrete'] as const) {
      const stable = which === 'analog' ? r.stability.analogStable : r.stability.discreteStable;
      const c = r.closedLoop[which];
      const q = which === 'analog' ? p.analogClosed : p.discreteClosed;
      if (!stable) {
        // An unstable closed loop has no frequency response: no bandwidth, peaking or noise bandwidth.
        expect(c.bandwidth3dbHz).toBeNull();
        expect(c.peakingDb).toBeNull();
        expect(c.notes.join(' ')).toMatch(/unstable/);
        expect(which === 'analog' ? r.noiseBandwidth.analogHz : r.noiseBandwidth.discreteHz).toBeNull();
        continue;
      }
      expectHzClose(c.bandwidth3dbHz, q.bandwidth3dbHz, 1e-7, `${which} bandwidth3dbHz`);
      expectAbsClose(c.peakingDb, q.peakingDb, 1e-6, `${which} peakingDb`);
    }
  });

  it('closed-loop stability agrees with the simplified Nyquist criterion on SciPy\'s margins (Og5 Sec. 7-5 (memory))', () => {
    // Open loop stable apart from the integrators and minimum phase: with one gain crossover and at most
    // one phase crossover, the closed loop is stable iff PM > 0 and GM > 0. Checked for both loops.
    let checked = 0;
    let unstable = 0;
    specs.forEach((_, i) => {
      const r = results[i]!;
      for (const which of ['analog', 'discrete'] as const) {
        const m = r.margins[which];
        const q = ref[i]![which];
        if (m.gainCrossingsHz.length !== 1 || m.phaseCrossings.length > 1 || q.phaseMarginDeg === null) continue;
        const expected = q.phaseMarginDeg > 0 && (q.gainMarginDb === null || q.gainMarginDb > 0);
        const actual = which === 'analog' ? r.stability.analogStable : r.stability.discreteStable;
        expect(actual, `case ${i} ${which}`).toBe(expected);
        checked++;
        if (!expected) unstable++;
      }
    });
    expect(checked).toBeGreaterThan(150);
    expect(unstable).toBeGreaterThan(0); // the random set includes unstable loops, so both answers are exercised
  });

  it.each(specs.map((_, i) => [i] as const).filter(([i]) => i % 3 === 0))('case %i: noise bandwidth (quad)', (i) => {
    const r = results[i]!;
    const p = ref[i]!;
    if (r.stability.analogStable) expectHzClose(r.noiseBandwidth.analogHz, p.analogNoiseHz!, 1e-5, 'analog noise bandwidth');
    if (r.stability.discreteStable) expectHzClose(r.noiseBandwidth.discreteHz, p.discreteNoiseHz!, 1e-5, 'discrete noise bandwidth');
  });

  it('step responses of the discrete loop agree with the loop run sample by sample in Python (sosfilt)', () => {
    let checked = 0;
    specs.forEach((s, i) => {
      if (!stepCase(i)) return;
      const r = results[i]!.stepResponses;
      const p = ref[i]!.step!;
      r.timeS.forEach((t, j) => {
        const n = Math.round(t * s.sampleRateHz);
        expect(Math.abs(r.phaseStepErrorRad[j]! - p.phase[n]!), `case ${i} phase step at n=${n}`).toBeLessThan(1e-9);
        const scale = Math.max(1e-12, Math.max(...p.frequency.map(Math.abs)));
        expect(Math.abs(r.frequencyStepErrorRad[j]! - p.frequency[n]!) / scale, `case ${i} frequency step at n=${n}`).toBeLessThan(1e-9);
      });
      checked++;
    });
    expect(checked).toBeGreaterThan(5);
  });

  it('open-loop responses agree at probe frequencies (freqs_zpk, freqz_zpk)', async () => {
    const { analogLoopResponse, discreteLoopResponse, toDb } = await import('../../src/analysis/response.ts');
    specs.forEach((s, i) => {
      const r = results[i]!;
      const p = ref[i]!;
      const fa = analogLoopResponse(r.filter.analogSections, r.loopGain.kRadPerS);
      const fd = discreteLoopResponse(r.filter.sections, r.loopGain.kRadPerS, s.sampleRateHz);
      probeFrequencies(s, r).forEach((f, j) => {
        const a = fa(f);
        const d = fd(f);
        expect(Math.abs(toDb(a) - p.analogMagDb[j]!), `case ${i} analog dB at ${f}`).toBeLessThan(1e-7);
        expect(Math.abs(toDb(d) - p.discreteMagDb[j]!), `case ${i} discrete dB at ${f}`).toBeLessThan(1e-6);
        expect(Math.abs(wrap180((Math.atan2(a.im, a.re) * 180) / Math.PI - p.analogPhaseDeg[j]!))).toBeLessThan(1e-7);
        expect(Math.abs(wrap180((Math.atan2(d.im, d.re) * 180) / Math.PI - p.discretePhaseDeg[j]!))).toBeLessThan(1e-6);
      });
    });
  });
});
