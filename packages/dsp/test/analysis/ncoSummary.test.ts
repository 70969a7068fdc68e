/**
 * analyzeDesign carries the NCO figures at the loop rate (DESIGN.md: the NCO runs at sampleRateHz):
 * tuning word M = round(f·2^N/fs), actual frequency M·fs/2^N, resolution fs/2^N (TRG71).
 */
import { describe, expect, it } from 'vitest';
import { analyzeDesign } from '../../src/planDesign.ts';
import { exampleSpecs } from '../../src/spec/examples.ts';

describe('NCO summary in the analysis (TRG71)', () => {
  it.each(exampleSpecs.map((e) => [e.id, e.spec] as const))('%s: tuning word, actual frequency, resolution', (_id, spec) => {
    const r = analyzeDesign(spec);
    const n = spec.nco.accumulatorBits;
    const m = Math.round((spec.centerHz * 2 ** n) / spec.sampleRateHz);
    expect(r.nco.tuning.tuningWordDecimal).toBe(String(m));
    expect(r.nco.tuning.actualHz).toBeCloseTo((m * spec.sampleRateHz) / 2 ** n, 6);
    expect(r.nco.tuning.resolutionHz).toBeCloseTo(spec.sampleRateHz / 2 ** n, 12);
    expect(Math.abs(r.nco.tuning.actualHz - spec.centerHz)).toBeLessThanOrEqual(r.nco.tuning.resolutionHz / 2);
    expect(r.nco.controlError).toBeNull();
  });
});
