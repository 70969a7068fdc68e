/**
 * The sweep scenario: the input offset ramps linearly from fromHz to toHz and back at rateHzPerS; the
 * metrics say where lock was lost going out and regained coming back (src/sim/sweepMetrics.ts).
 */
import { describe, expect, it } from 'vitest';
import { measureAcquisition, parseScenario, planDesign, requireValidSpec, simulatePlan, scenarioRateIssue, type Scenario } from '../../src/index.ts';
import { mainsSyncSpec, ultrasonicLagLeadSpec } from '../../src/spec/examples.ts';

function scenario(input: unknown): Scenario {
  const r = parseScenario(input);
  if (!r.ok) throw new Error(r.issues.map((i) => i.message).join('; '));
  return r.scenario;
}

describe('sweep scenario', () => {
  it('names the field a sweep gets wrong', () => {
    const bad = (input: unknown) => {
      const r = parseScenario(input);
      return r.ok ? null : r.issues[0]!.field;
    };
    expect(bad({ kind: 'sweep', fromHz: 0, toHz: 100, rateHzPerS: 100, durationS: 1.5 })).toBe('durationS');
    expect(bad({ kind: 'sweep', fromHz: 5, toHz: 5, rateHzPerS: 100, durationS: 1 })).toBe('toHz');
    expect(bad({ kind: 'sweep', fromHz: 0, toHz: 100, rateHzPerS: 0, durationS: 3 })).toBe('rateHzPerS');
    expect(bad({ kind: 'sweep', fromHz: 0, toHz: 100, rateHzPerS: 100, durationS: 2 })).toBeNull();
    // Sampling theorem (common practice, no source): the far end must stay below Nyquist.
    const far = scenario({ kind: 'sweep', fromHz: 0, toHz: 6000, rateHzPerS: 6000, durationS: 2 });
    expect(scenarioRateIssue(mainsSyncSpec, far)?.field).toBe('toHz');
  });

  it('traces the input frequency out and back, and a tone has no sweep metrics', () => {
    const plan = planDesign(requireValidSpec(mainsSyncSpec));
    const r = simulatePlan(plan, scenario({ kind: 'sweep', fromHz: -2, toHz: 3, rateHzPerS: 5, durationS: 2.5 }), { mode: 'float', buckets: 50 });
    const f = r.float!.traces.inputFrequencyHz!;
    // A linear ramp: centre − 2 Hz at the start, centre + 3 Hz at the turn (t = 1 s), back at 2 s, then held.
    expect(f.min[0]).toBeCloseTo(48, 6);
    expect(Math.max(...f.max)).toBeCloseTo(53, 2);
    expect(f.max.at(-1)).toBeCloseTo(48, 6);
    expect(r.float!.metrics.sweep!.turnS).toBeCloseTo(1, 9);
    const tone = simulatePlan(plan, scenario({ kind: 'tone', offsetHz: 1, durationS: 0.5 }), { mode: 'float' });
    expect(tone.float!.metrics.sweep).toBeUndefined();
    expect(tone.float!.traces.inputFrequencyHz).toBeUndefined();
  });

  it('a type-1 loop swept slowly loses lock near hold-in K·F(0) and regains it lower, between lock-in and pull-in (G3 Ch. 2)', () => {
    const spec = ultrasonicLagLeadSpec;
    // K·F(0) = (A/2)·gainHzPerUnit·F(0) Hz with F(0) = 1 for lag-lead (G3): 800 Hz.
    const holdInHz = (spec.input.amplitude / 2) * spec.nco.gainHzPerUnit;
    const plan = planDesign(requireValidSpec(spec));
    const r = simulatePlan(plan, scenario({ kind: 'sweep', fromHz: 0, toHz: 1000, rateHzPerS: 2000, durationS: 1.05 }), {});
    const acq = measureAcquisition(spec);
    for (const run of [r.float!, r.bitTrue!]) {
      const s = run.metrics.sweep!;
      // The loss lags the saddle-node at K·F(0) by the ramp's travel during the slow escape (it shrinks as the rate drops).
      expect(s.lockLostHz! / holdInHz).toBeGreaterThan(0.995);
      expect(s.lockLostHz! / holdInHz).toBeLessThan(1.015);
      expect(s.lockRegainedHz!).toBeLessThan(s.lockLostHz!);
      expect(s.lockRegainedHz!).toBeGreaterThan(acq.lockInHz.passHz * 0.97);
      expect(s.lockRegainedHz!).toBeLessThan(acq.pullInHz.failHz! * 1.01);
      expect(s.slipsOut).toBeGreaterThan(0);
      expect(s.heldThroughout).toBe(false);
    }
  }, 30_000);

  it('an ideal PI loop holds through the sweep in float, the bit-true loop loses lock inside its control range ±gainHzPerUnit (G3: PI hold-in is unbounded but the NCO control saturates)', () => {
    const plan = planDesign(requireValidSpec(mainsSyncSpec));
    const r = simulatePlan(plan, scenario({ kind: 'sweep', fromHz: 0, toHz: 30, rateHzPerS: 5, durationS: 14 }), {});
    expect(r.float!.metrics.sweep!.heldThroughout).toBe(true);
    expect(r.float!.metrics.sweep!.lockLostHz).toBeNull();
    const b = r.bitTrue!.metrics.sweep!;
    expect(b.lockLostHz!).toBeLessThanOrEqual(mainsSyncSpec.nco.gainHzPerUnit);
    expect(b.lockRegainedHz!).toBeLessThan(b.lockLostHz!);
  });
});
