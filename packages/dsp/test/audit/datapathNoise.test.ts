/**
 * Data-path noise and scaling against SciPy: the noise gains (Σh²) and DC gains from every rounding
 * point to the filter output and the NCO phase, and each section's L1, L2 and L∞ gain from the
 * detector, against the audit script's own closed-loop transfer functions in z⁻¹ (impulse responses by
 * scipy.signal.sosfilt, 2^18 samples; L∞ by sosfreqz on a dense grid) — Ja70's Lp norms, OS3 Sec. 6.9
 * (memory) for where a section's rounding enters. The TypeScript side sums the Gramian of a
 * state-space model; the script never sees it.
 */
import { describe, expect, it } from 'vitest';
import { analyzeDesign, type LoopSpec } from '../../src/index.ts';
import { runAuditReference } from './reference/run.ts';
import { exampleCases, generatedCases } from './specs.ts';

interface Ref {
  inputs: { outputGain: number; phaseGain: number; outputDc: number; phaseDc: number; tail: number }[];
  sections: { l1: number; l2: number; lInf: number }[];
}

const cases = [...exampleCases(), ...generatedCases(7).filter((_, i) => i % 3 === 0)];
const usable = cases
  .map((c) => ({ ...c, r: analyzeDesign(c.spec) }))
  .filter((c) => c.r.quantization.noise !== null);
const refs = runAuditReference<{ datapathNoise: Ref[] }>({
  datapathNoise: usable.map(({ spec, r }) => ({
    sections: r.quantization.filter!.sections.map((s) => s.quantized),
    amplitude: spec.input.amplitude,
    waveform: spec.nco.waveform,
    amplitudeBits: spec.nco.amplitudeBits,
    gainHzPerUnit: r.nco.control!.actualGainHzPerUnit,
    sampleRateHz: spec.sampleRateHz,
  })),
}).datapathNoise;

const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);

describe('data-path noise against SciPy', () => {
  it('the set is not vacuous', () => expect(usable.length).toBeGreaterThanOrEqual(8));

  it.each(usable.map((c, i) => [c.label, i] as const))('%s', (_l, i) => {
    const { r } = usable[i]!;
    const ref = refs[i]!;
    const noise = r.quantization.noise!;
    // the input point shares the detector's path (times the NCO output's mean square); the others map one to one
    const points = noise.points.filter((p) => p.kind !== 'input');
    expect(points.length).toBe(ref.inputs.length);
    points.forEach((p, j) => {
      const x = ref.inputs[j]!;
      expect(x.tail).toBeLessThan(1e-9 * Math.max(1, Math.sqrt(x.outputGain), Math.sqrt(x.phaseGain)));
      expect(rel(p.outputNoiseGain, x.outputGain)).toBeLessThan(1e-5);
      expect(rel(p.phaseNoiseGain, x.phaseGain)).toBeLessThan(1e-5);
      if (p.meanLsb !== 0) {
        expect(rel(p.outputMean, p.meanLsb * p.lsb * x.outputDc)).toBeLessThan(1e-6);
        expect(rel(p.phaseMeanRad, p.meanLsb * p.lsb * x.phaseDc)).toBeLessThan(1e-6);
      }
    });
    noise.sections.forEach((s, k) => {
      const x = ref.sections[k]!;
      expect(rel(s.l1Gain, x.l1)).toBeLessThan(1e-4);
      expect(rel(s.l2Gain, x.l2)).toBeLessThan(1e-5);
      // the grid refined by golden section finds the peak of SciPy's 200 000-point grid or slightly above it
      expect(rel(s.lInfGain, x.lInf)).toBeLessThan(2e-3);
    });
  });
});
