/**
 * Second-order figures: the Og5 phase-margin formula against the measured margin where it is exact
 * (single-pole and PI loops without ripple filter: for both, PM = atan(2ζ/√(√(1+4ζ⁴) − 2ζ²)), since
 * the PI crossover x² = 2ζ² + √(4ζ⁴ + 1) gives atan(2ζx), the same number — worked by hand), the
 * closed-loop −3 dB bandwidth formulas (B6, Og5), and the aliased-ripple warning.
 */
import { describe, expect, it } from 'vitest';
import { analyzeDesign, parseLoopSpec, type LoopSpec } from '../../src/index.ts';
import { generatedCases } from './specs.ts';

const og5 = (z: number) => (Math.atan((2 * z) / Math.sqrt(Math.sqrt(1 + 4 * z ** 4) - 2 * z * z)) * 180) / Math.PI;
const cases = [11, 12, 13].flatMap((s) => generatedCases(s)).filter((c) => !c.spec.rippleFilter);

describe('phase margin vs damping (Og5) and closed-loop bandwidth formulas (B6, Og5)', () => {
  it.each(cases.map((c) => [c.label, c.spec] as const))('%s', (_l, spec: LoopSpec) => {
    const r = analyzeDesign(spec);
    if (!r.secondOrder) return expect(spec.filter.kind).toBe('butterworth');
    const z = r.secondOrder.damping;
    expect(Math.abs(r.secondOrder.phaseMarginFormulaDeg - og5(z))).toBeLessThan(1e-9);
    const wn = 2 * Math.PI * r.secondOrder.naturalHz;
    const kind = spec.filter.kind;
    if (kind === 'single-pole' || (kind === 'butterworth' && spec.filter.order === 1)) {
      expect(Math.abs(r.margins.analog.phaseMarginDeg! - og5(z))).toBeLessThan(1e-6);
      // H = ωn²/(s² + 2ζωn s + ωn²): ω3 = ωn·√(1 − 2ζ² + √(2 − 4ζ² + 4ζ⁴)) (Og5)
      const w3 = wn * Math.sqrt(1 - 2 * z * z + Math.sqrt(2 - 4 * z * z + 4 * z ** 4));
      expect(Math.abs(r.closedLoop.analog.bandwidth3dbHz! / (w3 / (2 * Math.PI)) - 1)).toBeLessThan(1e-7);
    }
    if (kind === 'pi') {
      expect(Math.abs(r.margins.analog.phaseMarginDeg! - og5(z))).toBeLessThan(1e-6);
      // H = (2ζωn s + ωn²)/(s² + 2ζωn s + ωn²): ω3 = ωn·√(2ζ² + 1 + √((2ζ² + 1)² + 1)) (B6)
      const w3 = wn * Math.sqrt(2 * z * z + 1 + Math.sqrt((2 * z * z + 1) ** 2 + 1));
      expect(Math.abs(r.closedLoop.analog.bandwidth3dbHz! / (w3 / (2 * Math.PI)) - 1)).toBeLessThan(1e-7);
    }
  });
});

describe('aliased ripple', () => {
  it('2·centerHz above fs/2 gives a warning that states the alias |2fc − k·fs| (README)', () => {
    const spec = { ...cases[0]!.spec, centerHz: 0.4 * cases[0]!.spec.sampleRateHz };
    const p = parseLoopSpec(spec);
    expect(p.ok).toBe(true);
    const alias = Math.abs(2 * spec.centerHz - spec.sampleRateHz);
    const w = p.ok ? p.warnings.find((x) => x.field === 'centerHz') : undefined;
    expect(w?.message).toMatch(/alias/);
    expect(analyzeDesign(spec).ripple.aliasedRippleHz / alias).toBeCloseTo(1, 12);
  });
});
