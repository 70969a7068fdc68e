/**
 * Facts of the trade (common practice, no source), checked on the analysis itself.
 */
import { describe, expect, it } from 'vitest';
import { analyzeDesign } from '../../src/planDesign.ts';
import { discreteLoopResponse, toDb } from '../../src/analysis/response.ts';
import type { LoopSpec } from '../../src/spec/schema.ts';
import { ultrasonicSinglePoleSpec } from '../../src/spec/examples.ts';
import type { Sos } from '../../src/types/filter.ts';

const deg = (c: { re: number; im: number }) => (Math.atan2(c.im, c.re) * 180) / Math.PI;
const withGain = (spec: LoopSpec, gainHzPerUnit: number): LoopSpec => ({ ...spec, nco: { ...spec.nco, gainHzPerUnit } });

describe('the NCO acts as an integrator (common practice, no source)', () => {
  const unity: Sos[] = [{ b: [1, 0, 0], a: [1, 0, 0] }];
  const fs = 1e6;
  const nco = discreteLoopResponse(unity, 2 * Math.PI * 100, fs);

  it('falls at −20 dB per decade well below the loop rate', () => {
    for (const f of [1, 10, 100]) expect(toDb(nco(f)) - toDb(nco(10 * f))).toBeCloseTo(20, 2);
  });

  it('has −90° of phase at low frequency (plus the half-sample lag of its delay)', () => {
    expect(deg(nco(10))).toBeCloseTo(-90, 2);
    // z⁻¹/(1 − z⁻¹) = e^{−jωT/2}/(2j·sin(ωT/2)): −90° − 180°·f/fs exactly.
    expect(deg(nco(1e5))).toBeCloseTo(-90 - (180 * 1e5) / fs, 9);
  });
});

describe('a single-pole loop filter trades phase margin for gain (common practice, no source)', () => {
  const spec: LoopSpec = { ...ultrasonicSinglePoleSpec, rippleFilter: null };
  const gains = [20, 100, 500, 2000, 8000, 30000];
  const results = gains.map((g) => analyzeDesign(withGain(spec, g)));
  const pm = results.map((r) => r.margins.analog.phaseMarginDeg!);

  it('phase margin is near 90° at low gain, falls monotonically, and is below 45° at high gain', () => {
    expect(pm[0]!).toBeGreaterThan(85);
    for (let i = 1; i < pm.length; i++) expect(pm[i]!).toBeLessThan(pm[i - 1]!);
    expect(pm.at(-1)!).toBeLessThan(45);
  });

  it('the open-loop phase stays between −90° and −180° for the analog loop', () => {
    for (const r of results) {
      for (const p of r.bode.analogPhaseDeg) {
        expect(p).toBeLessThanOrEqual(-90 + 1e-9);
        expect(p).toBeGreaterThanOrEqual(-180 - 1e-9);
      }
    }
  });

  it('higher loop gain lets more 2·f ripple reach the NCO phase', () => {
    const ripple = results.map((r) => r.ripple.analogPhaseRippleDeg);
    for (let i = 1; i < ripple.length; i++) expect(ripple[i]!).toBeGreaterThan(ripple[i - 1]!);
  });

  it('at fixed damping a wider (higher-gain) loop needs a wider filter, so its ripple attenuation drops', () => {
    // ζ = 1/(2√(Kτ)) fixed at 0.7 ⇒ cutoff = 4ζ²K/(2π) grows with K (G3 Ch. 2).
    const att = [200, 1000, 5000].map((g) => {
      const k = (ultrasonicSinglePoleSpec.input.amplitude / 2) * 2 * Math.PI * g;
      const r = analyzeDesign({ ...withGain(spec, g), filter: { kind: 'single-pole', cutoffHz: (4 * 0.49 * k) / (2 * Math.PI) } });
      return r.ripple.discreteAttenuationDb;
    });
    expect(att[1]!).toBeLessThan(att[0]!);
    expect(att[2]!).toBeLessThan(att[1]!);
  });
});

describe('discrete loop reaches −180° exactly at Nyquist (DESIGN.md: closed search interval)', () => {
  it('a lag-lead loop without ripple filter has its phase crossover at fs/2 and a finite gain margin', () => {
    const spec: LoopSpec = { ...ultrasonicSinglePoleSpec, filter: { kind: 'lag-lead', tau1S: 2.6e-4, tau2S: 2.5e-4 }, rippleFilter: null };
    const r = analyzeDesign(spec);
    // F(z) at z = −1 is real and positive (bilinear maps s = ∞ there), and 1/(z − 1) = −1/2: L is real, negative.
    expect(r.margins.discrete.phaseCrossoverHz).toBe(spec.sampleRateHz / 2);
    expect(r.margins.discrete.gainMarginDb).not.toBeNull();
    // |L(−1)| = K·T·(τ2/(τ1+τ2))/2 (the bilinear F at Nyquist equals F(∞)).
    const k = r.loopGain.kRadPerS;
    const expected = -20 * Math.log10(((k / spec.sampleRateHz) * (2.5 / 5.1)) / 2);
    expect(r.margins.discrete.gainMarginDb!).toBeCloseTo(expected, 9);
    // The analog prototype never reaches −180°: no gain margin.
    expect(r.margins.analog.gainMarginDb).toBeNull();
  });
});
