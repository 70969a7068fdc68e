/**
 * The Butterworth loop filter against scipy.signal.butter(N, fc, fs=fs) — which prewarps at fc — and
 * the consequence of DESIGN.md's rule that the bilinear transform is prewarped only "when given".
 */
import { describe, expect, it } from 'vitest';
import { designLoopFilter, digitalResponse, ifFmDemodSpec, type LoopSpec } from '../../src/index.ts';
import { runAuditReference } from './reference/run.ts';

const specs: LoopSpec[] = [1, 2, 3, 4].flatMap((order) =>
  [0.001, 0.01, 0.1].map((r) => ({
    ...ifFmDemodSpec,
    filter: { kind: 'butterworth' as const, order, cutoffHz: r * ifFmDemodSpec.sampleRateHz },
    discretization: { method: 'bilinear' as const, prewarpHz: r * ifFmDemodSpec.sampleRateHz },
  })),
);
const freqs = (spec: LoopSpec) => {
  const fc = (spec.filter as { cutoffHz: number }).cutoffHz;
  return [fc * 0.01, fc * 0.5, fc, fc * 2, spec.sampleRateHz * 0.45];
};
const refs = runAuditReference<{ butterDigital: { re: number[]; im: number[] }[] }>({
  butterDigital: specs.map((s) => ({ order: (s.filter as { order: number }).order, cutoffHz: (s.filter as { cutoffHz: number }).cutoffHz, sampleRateHz: s.sampleRateHz, freqHz: freqs(s) })),
}).butterDigital;

describe('Butterworth prewarped at its cutoff = scipy.signal.butter(N, fc, fs=fs) (OS3; SciPy)', () => {
  it.each(specs.map((s, i) => [`order ${(s.filter as { order: number }).order} fc ${(s.filter as { cutoffHz: number }).cutoffHz}`, i] as const))('%s', (_l, i) => {
    const spec = specs[i]!;
    const d = designLoopFilter(spec);
    freqs(spec).forEach((f, j) => {
      const h = digitalResponse(d.sections, f, spec.sampleRateHz);
      const e = { re: refs[i]!.re[j]!, im: refs[i]!.im[j]! };
      const m = Math.hypot(e.re, e.im);
      expect(Math.hypot(h.re - e.re, h.im - e.im) / m, `at ${f} Hz`).toBeLessThan(1e-8);
    });
    const c = digitalResponse(d.sections, (spec.filter as { cutoffHz: number }).cutoffHz, spec.sampleRateHz);
    expect(20 * Math.log10(Math.hypot(c.re, c.im))).toBeCloseTo(-3.0103, 4); // Bu30: −3.01 dB at fc
  });

  it('without prewarpHz the digital cutoff is warped to (fs/π)·atan(π·fc/fs), as the plain bilinear transform gives (OS3 Sec. 7.2)', () => {
    const spec: LoopSpec = { ...specs[10]!, discretization: { method: 'bilinear', prewarpHz: null } }; // order 4, fc = 0.1·fs
    const fc = (spec.filter as { cutoffHz: number }).cutoffHz;
    const d = designLoopFilter(spec);
    const warped = (spec.sampleRateHz / Math.PI) * Math.atan((Math.PI * fc) / spec.sampleRateHz);
    const h = digitalResponse(d.sections, warped, spec.sampleRateHz);
    expect(20 * Math.log10(Math.hypot(h.re, h.im))).toBeCloseTo(-3.0103, 6);
  });
});
