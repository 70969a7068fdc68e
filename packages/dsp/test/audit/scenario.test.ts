/**
 * Scenario inputs that cannot mean what they say at the spec's loop rate (DESIGN.md: bad input gets a
 * clear error naming the field; common practice, no source): an offset or FM rate at or above the
 * Nyquist frequency aliases, and a step after the end of the run never happens.
 */
import { describe, expect, it } from 'vitest';
import { mainsSyncSpec, parseScenario, simulate } from '../../src/index.ts';

function namesField(scenario: unknown, field: string): { named: boolean; detail: string } {
  const p = parseScenario(scenario);
  if (!p.ok) return { named: p.issues.some((i) => i.field === field), detail: JSON.stringify(p.issues) };
  try {
    const r = simulate(mainsSyncSpec, p.scenario, { mode: 'float' }) as unknown as { warnings?: { field: string }[] };
    const named = (r.warnings ?? []).some((w) => w.field === field);
    return { named, detail: `ran without error; warnings ${JSON.stringify(r.warnings ?? null)}` };
  } catch (e) {
    const f = (e as { field?: string }).field;
    return { named: f === field, detail: `threw ${String(e)} field ${f}` };
  }
}

describe('scenario fields checked against the loop rate (fs = 10 kHz, durationS = 1 s)', () => {
  it.each([
    ['tone offset beyond Nyquist', { kind: 'tone', offsetHz: 6000, durationS: 0.1 }, 'offsetHz'],
    ['FM rate beyond Nyquist', { kind: 'fm', modulation: 'sine', rateHz: 6000, deviationHz: 5, durationS: 0.1 }, 'rateHz'],
    ['phase step after the end', { kind: 'phase-step', stepDeg: 10, atS: 5, durationS: 1 }, 'atS'],
    ['frequency step after the end', { kind: 'frequency-step', stepHz: 1, atS: 5, durationS: 1 }, 'atS'],
  ] as const)('%s is named', (_l, scenario, field) => {
    const r = namesField(scenario, field);
    expect(r.named, r.detail).toBe(true);
  });

  it('a run longer than the sample limit is refused naming durationS (README: 5·10^7 samples)', () => {
    expect(namesField({ kind: 'tone', offsetHz: 0, durationS: 1e6 }, 'durationS').named).toBe(true);
  });
});
