/**
 * The quantised loop: margins of the loop with the integer-code sections (codes/2^F) against the
 * SciPy model (numpy roots of each section, L(z) = K·T·F(z)/(z − 1), grid + brentq; Og5), pole radius
 * against numpy.roots, and the response deviation against scipy.signal.sosfreqz on a 60 000-point grid
 * (README definition: |dB| difference where the reference is within 40 dB of its peak).
 */
import { describe, expect, it } from 'vitest';
import { analyzeDesign, type LoopSpec } from '../../src/index.ts';
import { runAuditReference } from './reference/run.ts';
import { exampleCases, generatedCases } from './specs.ts';

const cases = [
  ...exampleCases(),
  ...generatedCases(5).map((c, i) => ({
    label: `${c.label} ${12 + (i % 5) * 3}-bit ${['nearest', 'half-even', 'truncate'][i % 3]}`,
    spec: { ...c.spec, fixedPoint: { ...c.spec.fixedPoint, coefficientBits: 12 + (i % 5) * 3, rounding: (['nearest', 'half-even', 'truncate'] as const)[i % 3] } } as LoopSpec,
  })),
];
const results = cases.map((c) => analyzeDesign(c.spec));
const usable = cases.map((c, i) => ({ ...c, r: results[i]! })).filter((c) => c.r.quantization.filter && c.r.quantization.loop);
const refs = runAuditReference<{ sectionLoops: { margins: { crossoverHz: number | null; phaseMarginDeg: number | null; gainMarginDb: number | null } | null; poleRadius: number[]; maxDeviationDb?: number }[] }>({
  sectionLoops: usable.map(({ spec, r }) => ({
    sampleRateHz: spec.sampleRateHz,
    kRadPerS: r.loopGain.kRadPerS,
    fMinHz: r.bode.freqHz[0],
    sections: r.quantization.filter!.sections.map((s) => s.quantized),
    referenceSections: r.quantization.filter!.sections.map((s) => s.reference),
  })),
}).sectionLoops;

describe('quantised loop against SciPy', () => {
  it('most cases quantise (the set is not vacuous)', () => expect(usable.length).toBeGreaterThan(20));

  it.each(usable.map((c, i) => [c.label, i] as const))('%s', (_l, i) => {
    const { r } = usable[i]!;
    const e = refs[i]!;
    const q = r.quantization.filter!;
    q.sections.forEach((s, j) => {
      // quantized values are exactly code·2^−F (worked by hand)
      expect(s.quantized.b[0]).toBe(s.codes.b0 * 2 ** -q.format.fractionBits);
      expect(s.quantized.a[1]).toBe(s.codes.a1 * 2 ** -q.format.fractionBits);
      expect(Math.abs(s.poleRadius - e.poleRadius[j]!)).toBeLessThan(1e-7);
    });
    const m = r.quantization.loop!.margins;
    if (r.quantization.loop!.stable && e.margins) {
      const x = e.margins;
      if (x.crossoverHz === null) expect(m.crossoverHz).toBeNull();
      else {
        expect(Math.abs(m.crossoverHz! / x.crossoverHz - 1)).toBeLessThan(1e-7);
        expect(Math.abs(m.phaseMarginDeg! - x.phaseMarginDeg!)).toBeLessThan(1e-6);
      }
      if (x.gainMarginDb === null) expect(m.gainMarginDb).toBeNull();
      else expect(Math.abs(m.gainMarginDb! - x.gainMarginDb)).toBeLessThan(1e-6);
    }
    if (q.maxDeviationDb !== null && Number.isFinite(e.maxDeviationDb!)) {
      // a 600-point grid can only miss the maximum of the dense one, never exceed it
      expect(q.maxDeviationDb).toBeLessThanOrEqual(e.maxDeviationDb! + 1e-9);
      expect(q.maxDeviationDb).toBeGreaterThanOrEqual(0.8 * e.maxDeviationDb!);
    }
  });
});
