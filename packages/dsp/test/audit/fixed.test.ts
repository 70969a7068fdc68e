/**
 * Fixed point: Q-format range, rounding modes (IEEE754 cl. 4.3 via Python's decimal module), the
 * "auto" fraction bits rule of DESIGN.md, checked on the examples' real coefficients.
 */
import { describe, expect, it } from 'vitest';
import { analyzeDesign, exampleSpecs, qFormat, quantizeValue, roundReal, roundShift, type LoopSpec } from '../../src/index.ts';
import { runAuditReference } from './reference/run.ts';
import { mulberry32 } from '../reference/random.ts';

type Mode = 'nearest' | 'half-even' | 'truncate';
const MODES: Mode[] = ['nearest', 'half-even', 'truncate'];

describe('Q format [−2^(W−F−1), 2^(W−F−1) − 2^−F] (REFERENCES.md, Fixed point)', () => {
  it.each([[16, 15], [18, 16], [24, 0], [8, 10], [32, 31], [12, 4]])('W = %i, F = %i', (w, f) => {
    const q = qFormat(w, f);
    expect(q.minValue).toBe(-(2 ** (w - f - 1)));
    expect(q.maxValue).toBe(2 ** (w - f - 1) - 2 ** -f);
    expect(q.lsb).toBe(2 ** -f);
  });

  it('saturate clamps to the range, wrap is two\'s complement modulo 2^W (common practice, no source)', () => {
    // Q1.15 (W = 16, F = 15): 1.0 is one LSB above the maximum
    expect(quantizeValue(1, 16, 15, 'nearest', 'saturate')).toMatchObject({ code: 32767, overflowed: true });
    expect(quantizeValue(1, 16, 15, 'nearest', 'wrap')).toMatchObject({ code: -32768, overflowed: true });
    expect(quantizeValue(-1, 16, 15, 'nearest', 'saturate')).toMatchObject({ code: -32768, overflowed: false });
  });
});

describe('rounding modes against decimal ROUND_HALF_UP / HALF_EVEN / FLOOR (IEEE754 cl. 4.3)', () => {
  // Ties both signs (±0.5, ±1.5, ±2.5, ±3.5 LSB) plus random non-ties.
  const rnd = mulberry32(3);
  const cases: { p: number; s: number }[] = [];
  for (const s of [1, 2, 3, 8]) for (let k = -9; k <= 9; k++) cases.push({ p: (2 * k + 1) * 2 ** (s - 1), s });
  for (let i = 0; i < 300; i++) cases.push({ p: Math.round((rnd() - 0.5) * 2 ** 40), s: 1 + Math.floor(rnd() * 20) });
  const refs = runAuditReference<{ rounding: Record<Mode, number>[] }>({ rounding: cases }).rounding;

  it('roundShift(p, s) — the bit-true shift — in every mode, negative ties included', () => {
    cases.forEach((c, i) => {
      for (const m of MODES) expect(roundShift(c.p, c.s, m), `${m} ${c.p}/2^${c.s}`).toBe(refs[i]![m]);
    });
  });

  it('roundReal(v) — coefficient and input quantisation — agrees on the same values', () => {
    cases.forEach((c, i) => {
      for (const m of MODES) expect(roundReal(c.p / 2 ** c.s, m), `${m} ${c.p}/2^${c.s}`).toBe(refs[i]![m]);
    });
  });

  it('the named ties of DESIGN.md: −2.5 → −3 (nearest), −2 (half-even), −3 (truncate toward −∞) (worked by hand)', () => {
    expect(roundReal(-2.5, 'nearest')).toBe(-3);
    expect(roundReal(-2.5, 'half-even')).toBe(-2);
    expect(roundReal(-2.5, 'truncate')).toBe(-3);
    expect(roundReal(-0.5, 'nearest')).toBe(-1);
    expect(roundReal(0.5, 'half-even')).toBe(0);
    expect(roundShift(-1, 4, 'truncate')).toBe(-1);
  });
});

describe('"auto" fraction bits: the most fraction bits that still hold every coefficient (DESIGN.md)', () => {
  function check(spec: LoopSpec): void {
    const r = analyzeDesign(spec);
    const q = r.quantization.filter;
    expect(q, spec.name).not.toBeNull();
    const w = spec.fixedPoint.coefficientBits;
    const f = q!.format.fractionBits;
    const values = r.filter.sections.flatMap((s) => [s.b[0]!, s.b[1]!, s.b[2]!, s.a[1]!, s.a[2]!]);
    const mode = spec.fixedPoint.rounding;
    const fits = (bits: number) => values.every((v) => {
      const c = roundReal(v * 2 ** bits, mode);
      return c >= -(2 ** (w - 1)) && c <= 2 ** (w - 1) - 1;
    });
    expect(fits(f), `${spec.name}: F = ${f} holds every coefficient`).toBe(true);
    if (f < 62) expect(fits(f + 1), `${spec.name}: F + 1 = ${f + 1} must not`).toBe(false);
    // and every code is the coefficient rounded in the spec's mode (no saturation at the auto F)
    for (const s of q!.sections) for (const c of s.coefficients) expect(c.code).toBe(roundReal(c.value * 2 ** f, mode));
  }
  it.each(exampleSpecs.map((e) => [e.id, e.spec] as const))('%s', (_id, spec) => check(spec));
  it.each(MODES.flatMap((m) => [12, 16, 20, 28].map((w) => [m, w] as const)))('mains sync, %s, %i bits', (m, w) => {
    const base = exampleSpecs[0]!.spec;
    check({ ...base, fixedPoint: { ...base.fixedPoint, rounding: m, coefficientBits: w } });
  });
});
