import { describe, expect, it } from 'vitest';
import type { Sos } from '../../src/types/filter.ts';
import { sosMagnitudeSquared, maxResponseDeviationDb } from '../../src/fixed/sosResponse.ts';
import { digitalResponse } from '../../src/analysis/response.ts';
import { python } from './python.ts';

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
});
