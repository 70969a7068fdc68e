/**
 * Loop gain conventions (DESIGN.md): Kd = A_in·A_nco/2, Ko = 2π·gainHzPerUnit, K = Kd·Ko.
 * A square NCO's fundamental has amplitude 4/π (Fourier series of sgn(cos θ); common practice,
 * no source), so its detector gain is 2·A_in/π and the analysis says so in a warning.
 */
import { describe, expect, it } from 'vitest';
import { loopGain } from '../../src/analysis/loopGain.ts';
import { analyzeDesign } from '../../src/planDesign.ts';
import { ultrasonicSinglePoleSpec } from '../../src/spec/examples.ts';
import type { LoopSpec } from '../../src/spec/schema.ts';

describe('loop gain', () => {
  it('sine NCO: Kd = A_in/2, Ko = 2π·gainHzPerUnit, K = Kd·Ko', () => {
    const g = loopGain(ultrasonicSinglePoleSpec);
    expect(g.kd).toBe(0.4);
    expect(g.koRadPerSPerUnit).toBeCloseTo(2 * Math.PI * 2000, 9);
    expect(g.kRadPerS).toBeCloseTo(0.4 * 2 * Math.PI * 2000, 9);
  });

  it('square NCO: Kd = 2·A_in/π, with a warning that says why', () => {
    const spec: LoopSpec = { ...ultrasonicSinglePoleSpec, nco: { ...ultrasonicSinglePoleSpec.nco, waveform: 'square' } };
    expect(loopGain(spec).kd).toBeCloseTo((2 * 0.8) / Math.PI, 15);
    const r = analyzeDesign(spec);
    expect(r.loopGain.kd).toBeCloseTo((2 * 0.8) / Math.PI, 15);
    expect(r.warnings.find((w) => w.field === 'nco.waveform')?.message).toMatch(/4\/π/);
  });
});
