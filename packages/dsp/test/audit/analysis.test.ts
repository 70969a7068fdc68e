/**
 * analyzeDesign (the public entry) against an independent SciPy model of the same loop
 * (reference/audit_reference.py): F(s) from the spec formulas, bilinear_zpk, L(s) = K·F(s)/s,
 * L(z) = K·T·F(z)·z⁻¹/(1 − z⁻¹), margins by a 40 000-point grid + brentq, closed loop on the same grid,
 * noise bandwidth by quad of |H|², ripple at 2·centerHz, coefficients by scipy.signal.bilinear.
 */
import { describe, expect, it } from 'vitest';
import { analyzeDesign, digitalResponse, type AnalysisResult } from '../../src/index.ts';
import { runAuditReference } from './reference/run.ts';
import { exampleCases, generatedCases, type AuditCase } from './specs.ts';

interface RefMargins {
  crossoverHz: number | null; phaseMarginDeg: number | null; phaseCrossoverHz: number | null;
  gainMarginDb: number | null; gainCrossingsHz: number[]; phaseCrossingsHz: number[];
}
interface RefCase {
  kRadPerS: number;
  analogMargins: RefMargins; discreteMargins: RefMargins;
  analogClosed: { bandwidth3dbHz: number | null; peakingDb: number };
  discreteClosed: { bandwidth3dbHz: number | null; peakingDb: number };
  analogNoiseHz: number; discreteNoiseHz: number;
  naturalHz: number | null; damping: number | null;
  ripple: { rippleHz: number; aliasedRippleHz: number; analogAttenuationDb: number; discreteAttenuationDb: number;
    analogFilterOutputAmplitude: number; discreteFilterOutputAmplitude: number; analogPhaseRippleDeg: number; discretePhaseRippleDeg: number };
  prewarp?: { analog: number; digital: number };
  b: number[]; a: number[]; bTf: number[]; aTf: number[];
}

const cases: AuditCase[] = [...exampleCases(), ...generatedCases()];
const refs = runAuditReference<{ cases: RefCase[] }>({ cases: cases.map((c) => c.spec) }).cases;
const results: AnalysisResult[] = cases.map((c) => analyzeDesign(c.spec));

function rel(a: number, b: number): number {
  return Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);
}

describe.each(cases.map((c, i) => ({ ...c, i })))('$label', ({ i }) => {
  const r = results[i]!;
  const ref = refs[i]!;

  it('loop gain K = (A_in/2)·2π·gainHzPerUnit (DESIGN.md conventions)', () => {
    expect(rel(r.loopGain.kRadPerS, ref.kRadPerS)).toBeLessThan(1e-14);
  });

  it('analog margins match SciPy grid + brentq (Og5 definitions)', () => {
    const m = r.margins.analog;
    const e = ref.analogMargins;
    expect(m.gainCrossingsHz.length).toBe(e.gainCrossingsHz.length);
    if (e.crossoverHz === null) expect(m.crossoverHz).toBeNull();
    else {
      expect(rel(m.crossoverHz!, e.crossoverHz)).toBeLessThan(1e-7);
      expect(Math.abs(m.phaseMarginDeg! - e.phaseMarginDeg!)).toBeLessThan(1e-6);
    }
    if (e.gainMarginDb === null) expect(m.gainMarginDb).toBeNull();
    else {
      expect(rel(m.phaseCrossoverHz!, e.phaseCrossoverHz!)).toBeLessThan(1e-7);
      expect(Math.abs(m.gainMarginDb! - e.gainMarginDb)).toBeLessThan(1e-6);
    }
  });

  it('discrete margins match SciPy on the closed interval [.., fs/2] (DESIGN.md)', () => {
    const m = r.margins.discrete;
    const e = ref.discreteMargins;
    expect(m.gainCrossingsHz.length).toBe(e.gainCrossingsHz.length);
    if (e.crossoverHz === null) expect(m.crossoverHz).toBeNull();
    else {
      expect(rel(m.crossoverHz!, e.crossoverHz)).toBeLessThan(1e-7);
      expect(Math.abs(m.phaseMarginDeg! - e.phaseMarginDeg!)).toBeLessThan(1e-6);
    }
    expect(m.phaseCrossings.map((p) => p.freqHz).length).toBe(e.phaseCrossingsHz.length);
    if (e.gainMarginDb === null) expect(m.gainMarginDb).toBeNull();
    else {
      expect(rel(m.phaseCrossoverHz!, e.phaseCrossoverHz!)).toBeLessThan(1e-7);
      expect(Math.abs(m.gainMarginDb! - e.gainMarginDb)).toBeLessThan(1e-6);
    }
  });

  it('closed-loop −3 dB bandwidth and peaking match SciPy (|H| = 1/√2 above the peak)', () => {
    for (const [ours, theirs] of [[r.closedLoop.analog, ref.analogClosed], [r.closedLoop.discrete, ref.discreteClosed]] as const) {
      if (theirs.bandwidth3dbHz === null) expect(ours.bandwidth3dbHz).toBeNull();
      else expect(rel(ours.bandwidth3dbHz!, theirs.bandwidth3dbHz)).toBeLessThan(1e-7);
      expect(Math.abs(ours.peakingDb! - theirs.peakingDb)).toBeLessThan(1e-6);
    }
  });

  it('noise bandwidth equals the exact integral ∫|H|²df (G3; scipy.integrate.quad)', () => {
    expect(rel(r.noiseBandwidth.analogHz!, ref.analogNoiseHz)).toBeLessThan(1e-6);
    expect(rel(r.noiseBandwidth.discreteHz!, ref.discreteNoiseHz)).toBeLessThan(1e-6);
  });

  it('natural frequency and damping per kind (REFERENCES.md, G3 Ch. 2 / B6)', () => {
    if (ref.naturalHz === null) {
      expect(r.secondOrder).toBeNull();
      return;
    }
    expect(rel(r.secondOrder!.naturalHz, ref.naturalHz)).toBeLessThan(1e-12);
    expect(rel(r.secondOrder!.damping, ref.damping!)).toBeLessThan(1e-12);
  });

  it('ripple at 2·centerHz: analog |F(j2π·2fc)| and discrete |F(e^{jω·2fc·T})| (aliasing by periodicity)', () => {
    expect(r.ripple.rippleHz).toBe(ref.ripple.rippleHz);
    expect(Math.abs(r.ripple.aliasedRippleHz - ref.ripple.aliasedRippleHz)).toBeLessThan(1e-9 * ref.ripple.rippleHz);
    expect(Math.abs(r.ripple.analogAttenuationDb - ref.ripple.analogAttenuationDb)).toBeLessThan(1e-6);
    expect(Math.abs(r.ripple.discreteAttenuationDb - ref.ripple.discreteAttenuationDb)).toBeLessThan(1e-6);
    for (const k of ['analogFilterOutputAmplitude', 'discreteFilterOutputAmplitude', 'analogPhaseRippleDeg', 'discretePhaseRippleDeg'] as const) {
      expect(rel(r.ripple[k], ref.ripple[k]), k).toBeLessThan(1e-7);
    }
  });

  it('prewarped: |F| of the digital filter equals the analog |F| at prewarpHz (OS3 Sec. 7.2, PM4)', () => {
    if (!ref.prewarp) return expect(cases[i]!.spec.discretization.prewarpHz).toBeNull();
    expect(rel(ref.prewarp.digital, ref.prewarp.analog)).toBeLessThan(1e-9); // the reference itself
    const fp = cases[i]!.spec.discretization.prewarpHz!;
    const d = digitalResponse(r.filter.sections, fp, cases[i]!.spec.sampleRateHz);
    expect(rel(Math.hypot(d.re, d.im), ref.prewarp.analog)).toBeLessThan(1e-9);
  });

  it('digital F(z) b/a (a[0] = 1) equals scipy.signal.bilinear with fs or the prewarped fs′', () => {
    const d = r.filter.digital;
    // signal.bilinear trims numerator coefficients below 1e-14 (narrow high-order low-pass); compare it
    // where it kept every coefficient, and always against bilinear_zpk + zpk2tf (same transform, SciPy).
    if (ref.bTf.length === d.b.length) {
      const sb = Math.max(...ref.bTf.map(Math.abs));
      d.b.forEach((v, j) => expect(Math.abs(v - ref.bTf[j]!) / sb).toBeLessThan(1e-9));
      d.a.forEach((v, j) => expect(Math.abs(v - ref.aTf[j]!) / Math.max(...ref.aTf.map(Math.abs))).toBeLessThan(1e-9));
    }
    expect(d.a[0]).toBe(1);
    expect(d.b.length).toBe(ref.b.length);
    expect(d.a.length).toBe(ref.a.length);
    const scaleB = Math.max(...ref.b.map(Math.abs));
    const scaleA = Math.max(...ref.a.map(Math.abs));
    d.b.forEach((v, j) => expect(Math.abs(v - ref.b[j]!) / scaleB).toBeLessThan(1e-9));
    d.a.forEach((v, j) => expect(Math.abs(v - ref.a[j]!) / scaleA).toBeLessThan(1e-9));
  });
});
