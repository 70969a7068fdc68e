/**
 * Margins, closed-loop figures and noise bandwidth of random loops against SciPy, live
 * (test/reference/scipy_reference.py: freqs_zpk / freqz_zpk after bilinear_zpk on a 20 000-point
 * log grid refined with brentq, quad for the noise integral). The Python side builds F(s) from the
 * DESIGN.md formulas on its own; only the spec's numbers are shared.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { analyzeDesign } from '../../src/analysis/analyzeDesign.ts';
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
}

const CASES = 120;
const specs = randomValidSpecs(20261202, CASES);
let results: AnalysisResult[] = [];
let ref: RefLoop[] = [];

function probeFrequencies(spec: LoopSpec, r: AnalysisResult): number[] {
  const fc = r.margins.discrete.crossoverHz ?? spec.sampleRateHz / 1000;
  return [fc / 10, fc, fc * 3, spec.sampleRateHz * 0.3];
}

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

describe(`loop analysis agrees with SciPy on ${CASES} seeded random specs`, () => {
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

  it.each(specs.map((_, i) => [i] as const))('case %i: closed-loop bandwidth and peaking', (i) => {
    const r = results[i]!;
    const p = ref[i]!;
    expectHzClose(r.closedLoop.analog.bandwidth3dbHz, p.analogClosed.bandwidth3dbHz, 1e-7, 'analog bandwidth3dbHz');
    expectHzClose(r.closedLoop.discrete.bandwidth3dbHz, p.discreteClosed.bandwidth3dbHz, 1e-7, 'discrete bandwidth3dbHz');
    expectAbsClose(r.closedLoop.analog.peakingDb, p.analogClosed.peakingDb, 1e-6, 'analog peakingDb');
    expectAbsClose(r.closedLoop.discrete.peakingDb, p.discreteClosed.peakingDb, 1e-6, 'discrete peakingDb');
  });

  it.each(specs.map((_, i) => [i] as const).filter(([i]) => i % 3 === 0))('case %i: noise bandwidth (quad)', (i) => {
    const r = results[i]!;
    const p = ref[i]!;
    expectHzClose(r.noiseBandwidth.analogHz, p.analogNoiseHz!, 1e-5, 'analog noise bandwidth');
    expectHzClose(r.noiseBandwidth.discreteHz, p.discreteNoiseHz!, 1e-5, 'discrete noise bandwidth');
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
