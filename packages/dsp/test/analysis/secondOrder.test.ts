/**
 * Second-order loop formulas (G3 Ch. 2; B6 loop-filter tables; Og5 for margins and bandwidth) checked
 * against what the analysis computes from the transfer functions themselves.
 */
import { describe, expect, it } from 'vitest';
import { analyzeDesign } from '../../src/planDesign.ts';
import { analogClosedLoop } from '../../src/analysis/loopPolynomials.ts';
import { designLoopFilter } from '../../src/design.ts';
import { loopGain } from '../../src/analysis/loopGain.ts';
import { closedLoop, analogLoopResponse } from '../../src/analysis/response.ts';
import { highGainNoiseBandwidthHz, numericNoiseBandwidthHz, secondOrderNoiseBandwidthHz } from '../../src/analysis/noiseBandwidth.ts';
import { phaseMarginFromDampingDeg } from '../../src/analysis/secondOrder.ts';
import type { LoopSpec } from '../../src/spec/schema.ts';
import { ultrasonicSinglePoleSpec } from '../../src/spec/examples.ts';

const base: LoopSpec = { ...ultrasonicSinglePoleSpec, rippleFilter: null };
const withFilter = (filter: LoopSpec['filter'], gainHzPerUnit = base.nco.gainHzPerUnit): LoopSpec => ({
  ...base,
  filter,
  nco: { ...base.nco, gainHzPerUnit },
});
const K = loopGain(base).kRadPerS;

/** Normalised closed-loop denominator s² + a1·s + a0 of the analog loop. */
function closedLoopDen(spec: LoopSpec): [number, number] {
  const d = designLoopFilter(spec);
  const den = analogClosedLoop(d.analog, loopGain(spec).kRadPerS).h.den;
  return [den[1]! / den[0]!, den[2]! / den[0]!];
}

describe('natural frequency and damping (G3 Ch. 2, B6)', () => {
  it.each([
    ['pi', 300, 0.5],
    ['pi', 800, 1.2],
    ['lag-lead', 300, 0.7],
    ['lag-lead', 150, 2],
  ] as const)('%s designed from targets %f Hz, ζ = %f reports them back and has s² + 2ζωn·s + ωn²', (kind, naturalHz, damping) => {
    const spec = withFilter({ kind, naturalHz, damping });
    const d = designLoopFilter(spec);
    expect(d.naturalHz).toBeCloseTo(naturalHz, 9);
    expect(d.damping).toBeCloseTo(damping, 12);
    const wn = 2 * Math.PI * naturalHz;
    const [a1, a0] = closedLoopDen(spec);
    expect(a1 / (2 * damping * wn)).toBeCloseTo(1, 12);
    expect(a0 / (wn * wn)).toBeCloseTo(1, 12);
  });

  it('single-pole: ωn = √(K/τ), ζ = 1/(2√(Kτ)) match the closed-loop denominator', () => {
    const spec = withFilter({ kind: 'single-pole', cutoffHz: 500 });
    const tau = 1 / (2 * Math.PI * 500);
    const d = designLoopFilter(spec);
    expect(d.tau?.tauS).toBeCloseTo(tau, 15);
    const wn = Math.sqrt(K / tau);
    const zeta = 1 / (2 * Math.sqrt(K * tau));
    expect(d.naturalHz! * 2 * Math.PI).toBeCloseTo(wn, 8);
    expect(d.damping).toBeCloseTo(zeta, 12);
    const [a1, a0] = closedLoopDen(spec);
    expect(a1 / (2 * zeta * wn)).toBeCloseTo(1, 12);
    expect(a0 / (wn * wn)).toBeCloseTo(1, 12);
  });

  it('PI time constants from targets are τ1 = K/ωn², τ2 = 2ζ/ωn', () => {
    const d = designLoopFilter(withFilter({ kind: 'pi', naturalHz: 200, damping: 0.8 }));
    const wn = 2 * Math.PI * 200;
    expect(d.tau?.tau1S).toBeCloseTo(K / wn ** 2, 15);
    expect(d.tau?.tau2S).toBeCloseTo((2 * 0.8) / wn, 15);
  });
});

describe('noise bandwidth (G3 Ch. 2; REFERENCES.md)', () => {
  it.each([0.3, 0.5, 0.7071, 1, 2])('single-pole loop, ζ = %f: exact B_L = K/4, and the high-gain formula is (1 + 4ζ²)x too high', (zeta) => {
    // ζ = 1/(2√(Kτ)) ⇒ τ = 1/(4ζ²K)
    const tau = 1 / (4 * zeta * zeta * K);
    const spec = withFilter({ kind: 'single-pole', cutoffHz: 1 / (2 * Math.PI * tau) });
    const r = analyzeDesign(spec);
    expect(r.noiseBandwidth.analogMethod).toBe('closed-form');
    expect(r.noiseBandwidth.analogHz! / (K / 4)).toBeCloseTo(1, 10);
    expect(r.noiseBandwidth.highGainApproximationHz! / r.noiseBandwidth.analogHz!).toBeCloseTo(1 + 4 * zeta * zeta, 8);
  });

  it.each([
    ['single-pole', { kind: 'single-pole', cutoffHz: 900 }],
    ['lag-lead', { kind: 'lag-lead', naturalHz: 400, damping: 0.6 }],
    ['pi', { kind: 'pi', naturalHz: 400, damping: 0.6 }],
  ] as const)('%s: closed form (b1²a0 + b0²)/(4a0a1) equals the numeric integral of |H|²', (_k, filter) => {
    const spec = withFilter(filter);
    const d = designLoopFilter(spec);
    const k = loopGain(spec).kRadPerS;
    const h = analogClosedLoop(d.analog, k).h;
    const n = h.num.length === 2 ? h.num : [0, h.num[0]!];
    const c = h.den[0]!;
    const closed = secondOrderNoiseBandwidthHz(n[0]! / c, n[1]! / c, h.den[1]! / c, h.den[2]! / c);
    const numeric = numericNoiseBandwidthHz(closedLoop(analogLoopResponse(d.analogSections, k)), 1e-3, 1e9, { tail: true, intervals: 20000 });
    expect(numeric / closed).toBeCloseTo(1, 6);
  });

  it('PI: the closed form equals (ωn/2)(ζ + 1/(4ζ)) exactly (high-gain loop)', () => {
    const r = analyzeDesign(withFilter({ kind: 'pi', naturalHz: 250, damping: 0.9 }));
    expect(r.noiseBandwidth.analogHz! / highGainNoiseBandwidthHz(2 * Math.PI * 250, 0.9)).toBeCloseTo(1, 10);
  });
});

describe('phase margin and bandwidth versus damping (Og5 Sec. 7-6, 7-7 (memory); B6)', () => {
  it.each([0.3, 0.5, 0.7071, 1, 1.5])('single-pole and PI loops at ζ = %f have PM = atan(2ζ/√(√(1+4ζ⁴) − 2ζ²))', (zeta) => {
    const tau = 1 / (4 * zeta * zeta * K);
    const sp = analyzeDesign(withFilter({ kind: 'single-pole', cutoffHz: 1 / (2 * Math.PI * tau) }));
    const pi = analyzeDesign(withFilter({ kind: 'pi', naturalHz: 300, damping: zeta }));
    expect(sp.margins.analog.phaseMarginDeg!).toBeCloseTo(phaseMarginFromDampingDeg(zeta), 7);
    expect(pi.margins.analog.phaseMarginDeg!).toBeCloseTo(phaseMarginFromDampingDeg(zeta), 7);
    expect(phaseMarginFromDampingDeg(0.7071)).toBeGreaterThan(65);
  });

  it.each([0.4, 0.7071, 1.3])('PI loop −3 dB bandwidth = fn·√(2ζ²+1+√((2ζ²+1)²+1)) at ζ = %f (B6 (memory))', (zeta) => {
    const fn = 300;
    const r = analyzeDesign(withFilter({ kind: 'pi', naturalHz: fn, damping: zeta }));
    const q = 2 * zeta * zeta + 1;
    expect(r.closedLoop.analog.bandwidth3dbHz! / (fn * Math.sqrt(q + Math.sqrt(q * q + 1)))).toBeCloseTo(1, 9);
  });

  it.each([0.4, 0.7071, 1.3])('single-pole loop −3 dB bandwidth = ωn·√(1−2ζ²+√(4ζ⁴−4ζ²+2)) at ζ = %f (Og5)', (zeta) => {
    const tau = 1 / (4 * zeta * zeta * K);
    const r = analyzeDesign(withFilter({ kind: 'single-pole', cutoffHz: 1 / (2 * Math.PI * tau) }));
    const fn = Math.sqrt(K / tau) / (2 * Math.PI);
    const expected = fn * Math.sqrt(1 - 2 * zeta * zeta + Math.sqrt(4 * zeta ** 4 - 4 * zeta * zeta + 2));
    expect(r.closedLoop.analog.bandwidth3dbHz! / expected).toBeCloseTo(1, 9);
  });

  it('peaking of the standard second-order loop: Mr = 1/(2ζ√(1−ζ²)) for ζ < 0.707 (Og5 Sec. 7-7 (memory))', () => {
    const zeta = 0.3;
    const tau = 1 / (4 * zeta * zeta * K);
    const r = analyzeDesign(withFilter({ kind: 'single-pole', cutoffHz: 1 / (2 * Math.PI * tau) }));
    expect(r.closedLoop.analog.peakingDb).toBeCloseTo(20 * Math.log10(1 / (2 * zeta * Math.sqrt(1 - zeta * zeta))), 8);
  });
});

describe('steady-state errors and estimates (G3 Ch. 2, B6)', () => {
  it('type 1: a frequency step Δf leaves 2π·Δf/(K·F(0)) rad; type 2 leaves none and a ramp leaves R/ωn²', () => {
    const sp = analyzeDesign(withFilter({ kind: 'single-pole', cutoffHz: 900 }));
    expect(sp.steadyState.frequencyStepRadPerHz).toBeCloseTo((2 * Math.PI) / K, 15);
    expect(sp.steadyState.frequencyRampRadPerHzPerS).toBeNull();
    const pi = analyzeDesign(withFilter({ kind: 'pi', naturalHz: 300, damping: 0.7 }));
    expect(pi.steadyState.frequencyStepRadPerHz).toBe(0);
    expect(pi.steadyState.frequencyRampRadPerHzPerS!).toBeCloseTo((2 * Math.PI) / (2 * Math.PI * 300) ** 2, 15);
    expect(pi.estimates.holdInHz).toBeNull();
    expect(pi.estimates.notes.join(' ')).toMatch(/infinite/);
  });

  it('the simulated step response settles to the steady-state formulas (final-value theorem)', () => {
    const sp = analyzeDesign(withFilter({ kind: 'single-pole', cutoffHz: 900 }));
    expect(sp.stepResponses.phaseStepErrorRad.at(-1)!).toBeCloseTo(0, 3);
    expect(sp.stepResponses.frequencyStepErrorRad.at(-1)! / sp.steadyState.frequencyStepRadPerHz).toBeCloseTo(1, 2);
    const pi = analyzeDesign(withFilter({ kind: 'pi', naturalHz: 300, damping: 0.7 }));
    expect(pi.stepResponses.frequencyStepErrorRad.at(-1)!).toBeCloseTo(0, 4);
    expect(pi.stepResponses.phaseStepErrorRad[0]!).toBeCloseTo(1, 6);
  });

  it('lock-in ≈ 2ζωn, pull-out ≈ 1.8ωn(ζ+1), pull-in TP ≈ Δω²/(2ζωn³), hold-in K·F(0), labelled estimates', () => {
    const r = analyzeDesign(withFilter({ kind: 'lag-lead', naturalHz: 300, damping: 0.7 }));
    const wn = 2 * Math.PI * 300;
    expect(r.estimates.label).toBe('estimate');
    expect(r.estimates.lockInHz! * 2 * Math.PI).toBeCloseTo(2 * 0.7 * wn, 6);
    expect(r.estimates.lockInFormulaHz).toBe(r.estimates.lockInHz);
    expect(r.estimates.pullOutFormulaHz! * 2 * Math.PI).toBeCloseTo(1.8 * wn * 1.7, 6);
    // Here 1.8ωn(ζ+1) exceeds K·F(0): a type-1 loop cannot stay locked beyond hold-in (G3), so it is capped.
    expect(1.8 * wn * 1.7).toBeGreaterThan(K);
    expect(r.estimates.pullOutHz! * 2 * Math.PI).toBeCloseTo(K, 6);
    expect(r.estimates.notes.join(' ')).toMatch(/pull-out.*capped/);
    expect(r.estimates.holdInHz! * 2 * Math.PI).toBeCloseTo(K, 6);
    const dw = 2 * Math.PI * 1000;
    expect(r.estimates.pullInTimeSPerHz2! * 1000 ** 2).toBeCloseTo(dw ** 2 / (2 * 0.7 * wn ** 3), 9);
  });
});
