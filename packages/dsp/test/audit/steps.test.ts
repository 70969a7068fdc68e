/**
 * Step responses of the discrete loop (phase error after a 1 rad phase step and a 1 Hz frequency step)
 * against scipy.signal.lfilter of E(z) = 1/(1 + L(z)) built from SciPy's own bilinear_zpk of F(s)
 * (reference/audit_reference.py; DESIGN.md conventions: one sample of NCO delay).
 */
import { describe, expect, it } from 'vitest';
import { analyzeDesign } from '../../src/index.ts';
import { runAuditReference } from './reference/run.ts';
import { exampleCases, generatedCases } from './specs.ts';

const all = [...exampleCases(), ...generatedCases(17)].map((c) => ({ ...c, r: analyzeDesign(c.spec) }));
// The low-order loops (b/a of at most 4th order stays well conditioned for lfilter) on the discrete path.
const cases = all.filter((c) => c.r.stepResponses.source === 'discrete' && c.r.filter.digital.a.length <= 5);
const refs = runAuditReference<{ steps: { phase: number[]; freq: number[] }[] }>({
  steps: cases.map(({ spec, r }) => ({ spec, n: Math.round(r.stepResponses.timeS[r.stepResponses.timeS.length - 1]! * spec.sampleRateHz) + 1 })),
}).steps;

describe('discrete step responses equal lfilter of 1/(1 + L(z))', () => {
  it('the set is not vacuous', () => expect(cases.length).toBeGreaterThan(8));
  it.each(cases.map((c, i) => [c.label, i] as const))('%s', (_l, i) => {
    const { r, spec } = cases[i]!;
    const e = refs[i]!;
    const s = r.stepResponses;
    const peakF = Math.max(...e.freq.map(Math.abs));
    s.timeS.forEach((t, j) => {
      const n = Math.round(t * spec.sampleRateHz);
      expect(Math.abs(s.phaseStepErrorRad[j]! - e.phase[n]!), `phase step at n = ${n}`).toBeLessThan(1e-6);
      // 1e-5 of the peak: lfilter runs a 4th-order b/a with poles near z = 1, which drifts by ~1e-6 over
      // thousands of samples (OS3 Sec. 6.8); our loop runs sections
      expect(Math.abs(s.frequencyStepErrorRad[j]! - e.freq[n]!) / peakF, `frequency step at n = ${n}`).toBeLessThan(1e-5);
    });
    expect(s.phaseStepErrorRad[0]).toBe(1); // the NCO's sample of delay: no correction at n = 0
  });
});
