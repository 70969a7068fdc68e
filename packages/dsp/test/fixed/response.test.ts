import { describe, expect, it } from 'vitest';
import type { Sos } from '../../src/types/filter.ts';
import { sosMagnitudeSquared, maxResponseDeviationDb } from '../../src/fixed/sosResponse.ts';
import { digitalResponse } from '../../src/analysis/response.ts';
import { python } from './python.ts';
import { mulberry32, uniform } from '../reference/random.ts';

describe('section cascade response', () => {
  it('matches scipy.signal.sosfreqz for a 4th-order Butterworth in sections', () => {
    const ref = python<{ sos: number[][]; w: number[]; h2: number[] }>(
      `import numpy as np, scipy.signal as s
sos = s.butter(4, 0.05, output='sos')
w = np.linspace(0.001, np.pi, 50)
w, h = s.sosfreqz(sos, worN=w)
out = {'sos': sos.tolist(), 'w': w.tolist(), 'h2': (np.abs(h)**2).tolist()}`,
      null,
    );
    const sections: Sos[] = ref.sos.map((r) => ({ b: [r[0]!, r[1]!, r[2]!], a: [r[3]!, r[4]!, r[5]!] }));
    ref.w.forEach((w, i) => expect(sosMagnitudeSquared(sections, w)).toBeCloseTo(ref.h2[i] ?? NaN, 10));
  });

  it('reports the dB deviation of a known gain error', () => {
    // Scaling b by 1.01 changes the response by 20·log10(1.01) = 0.0864 dB everywhere.
    const s: Sos = { b: [0.2, 0.4, 0.2], a: [1, -0.5, 0.3] };
    const scaled: Sos = { b: [0.202, 0.404, 0.202], a: s.a };
    expect(maxResponseDeviationDb([s], [scaled], 40)).toBeCloseTo(20 * Math.log10(1.01), 9);
  });

  it('gives the squared magnitude of the complex response the analysis computes (one evaluation, two reductions)', () => {
    // An equivalence of the same cascade stated two ways: Π|N|²/|D|² = |Π N/D|² (common practice, no source).
    const sections: Sos[] = [
      { b: [0.2, 0.4, 0.2], a: [1, -0.5, 0.3] },
      { b: [1, -1.9, 0.95], a: [1, -1.98, 0.981] },
    ];
    const fs = 48e3;
    for (const f of [1, 10, 100, 1e3, 5e3, 2e4, 2.3e4]) {
      const h = digitalResponse(sections, f, fs);
      const mag2 = sosMagnitudeSquared(sections, (2 * Math.PI * f) / fs);
      expect(Math.abs(mag2 / (h.re * h.re + h.im * h.im) - 1)).toBeLessThan(1e-12);
    }
  });

  it('finds the deviation that comparing the two dB responses at every grid point gives, to the last bit', () => {
    // The definition written out point by point (the band, the peak, the largest |dB difference|: common practice, no source); the
    // module decides most points on the squared magnitudes and must land on exactly the same double.
    const points = 600;
    const definition = (ref: readonly Sos[], test: readonly Sos[], bandDb: number): number | null => {
      const db = (sections: readonly Sos[], k: number) => 10 * Math.log10(sosMagnitudeSquared(sections, Math.PI * 10 ** (-6 + (6 * k) / (points - 1))));
      const r = Array.from({ length: points }, (_, k) => db(ref, k));
      const peak = Math.max(...r.filter(Number.isFinite));
      let worst = 0;
      let anyFinite = false;
      r.forEach((rk, k) => {
        if (!Number.isFinite(rk) || rk < peak - bandDb) return;
        const t = db(test, k);
        if (t === -Infinity) return;
        if (!Number.isFinite(t)) worst = Infinity;
        else {
          anyFinite = true;
          worst = Math.max(worst, Math.abs(t - rk));
        }
      });
      return anyFinite ? worst : null;
    };
    const rnd = mulberry32(7);
    const section = (): Sos => {
      // poles and zeros of radius 0.3-0.999999 at any angle: narrow and wide sections alike
      const pole = uniform(rnd, 0.3, 1 - 10 ** uniform(rnd, -6, -1));
      const angle = uniform(rnd, 0, Math.PI);
      const zero = uniform(rnd, 0, 1.2);
      const gain = 10 ** uniform(rnd, -8, 2);
      return { b: [gain, -2 * zero * Math.cos(angle / 2) * gain, zero * zero * gain], a: [1, -2 * pole * Math.cos(angle), pole * pole] };
    };
    const nudge = (s: Sos, bits: number): Sos => {
      const q = (v: number) => Math.round(v * 2 ** bits) / 2 ** bits;
      return { b: [q(s.b[0]), q(s.b[1]), q(s.b[2])], a: [1, q(s.a[1]), q(s.a[2])] };
    };
    for (let i = 0; i < 60; i++) {
      const ref = Array.from({ length: 1 + (i % 3) }, section);
      const test = ref.map((s) => nudge(s, 4 + (i % 25)));
      for (const band of [40, 3, 1e-9, 400]) expect(maxResponseDeviationDb(ref, test, band)).toBe(definition(ref, test, band));
    }
    // The edges: a test cascade that is zero, one with a pole on the circle, the same cascade twice.
    const s: Sos = { b: [0.2, 0.4, 0.2], a: [1, -0.5, 0.3] };
    const cases: [Sos[], Sos[]][] = [
      [[s], [{ b: [0, 0, 0], a: s.a }]],
      [[s], [{ b: s.b, a: [1, -2, 1] }]],
      [[s], [s]],
      [[{ b: [1, 0, -1], a: s.a }], [s]],
    ];
    for (const [ref, test] of cases) expect(maxResponseDeviationDb(ref, test, 40)).toBe(definition(ref, test, 40));
  });
});
