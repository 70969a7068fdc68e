/**
 * Lock and lock time (src/sim/lockMetric.ts; REFERENCES.md, "Lock and lock time"): the same input
 * gives the same lock time whatever the run's length, the demo loops lock under their editor's FM
 * scenarios, a loop driven past its hold-in range does not, and a NumPy/SciPy simulation of its own
 * (reference/lock_reference.py) finds the same lock time and the same tracking error under FM.
 */
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { planDesign, simulatePlan } from '../../src/planDesign.ts';
import { exampleSpecs, ifFmDemodSpec, ultrasonicSinglePoleSpec } from '../../src/spec/examples.ts';
import { requireValidSpec, type LoopSpec } from '../../src/spec/schema.ts';
import type { Scenario } from '../../src/spec/scenario.ts';
import { modulationReference } from '../../src/sim/lockMetric.ts';
import { runPythonReference } from '../reference/scipy.ts';

const planOf = (spec: LoopSpec) => planDesign(requireValidSpec(spec));

describe('lock time does not depend on the run length', () => {
  it('gives one lock time for the same 40 kHz step in runs of 0.15, 1 and 10 ms (IF demodulator)', () => {
    // The step at 30 µs settles in well under a microsecond (crossover ≈ 200 kHz); each run is long
    // enough to show it. Common practice, no source: a figure of one event must not change with the window.
    const plan = planOf(ifFmDemodSpec);
    const times = [0.15e-3, 1e-3, 10e-3].map((durationS) => simulatePlan(plan, { kind: 'frequency-step', stepHz: 40e3, atS: 30e-6, durationS }));
    for (const r of times) {
      expect(r.float!.metrics.locked).toBe(true);
      expect(r.bitTrue!.metrics.locked).toBe(true);
    }
    const floatTimes = new Set(times.map((r) => r.float!.metrics.lockTimeS));
    const bitTimes = new Set(times.map((r) => r.bitTrue!.metrics.lockTimeS));
    expect(floatTimes.size).toBe(1);
    expect(bitTimes.size).toBe(1);
    expect([...floatTimes][0]!).toBeGreaterThan(30e-6);
    expect([...floatTimes][0]!).toBeLessThan(32e-6);
  });

  it('reports no lock for a run that ends before the loop settles (the mains loop, 20 ms after a 40° step)', () => {
    // ζωn ≈ 22 1/s: 40° decays to 0.1 rad in about 60 ms (G3 Ch. 2 step response), longer than the run.
    const r = simulatePlan(planOf(exampleSpecs[0]!.spec), { kind: 'phase-step', stepDeg: 40, atS: 0, durationS: 0.02 }, { mode: 'float' });
    expect(r.float!.metrics.locked).toBe(false);
    expect(r.float!.metrics.lockTimeS).toBeNull();
  });
});

describe('lock under modulation', () => {
  // The editor's default FM scenario (packages/app/src/form/scenarioDraft.ts): rate crossover/8,
  // deviation 0.3·crossover, 30/crossover long, rounded to two digits as the form does.
  const r2 = (x: number) => Number(x.toPrecision(2));
  for (const example of exampleSpecs) {
    it(`locks ${example.id} under sine, triangle and square FM inside its bandwidth, both loops`, () => {
      const plan = planOf(example.spec);
      const fc = plan.analysis.margins.discrete.crossoverHz!;
      const durationS = r2(Math.min(30 / fc, 400_000 / example.spec.sampleRateHz));
      for (const modulation of ['sine', 'triangle', 'square'] as const) {
        const sc: Scenario = { kind: 'fm', modulation, rateHz: r2(fc / 8), deviationHz: r2(0.3 * fc), durationS };
        const r = simulatePlan(plan, sc);
        for (const run of [r.float!, r.bitTrue!]) {
          expect(run.metrics.locked, `${example.id} ${modulation}`).toBe(true);
          expect(run.metrics.cycleSlips).toBe(0);
          expect(run.metrics.lockTimeS!).toBeLessThan(durationS / 2);
        }
      }
    });
  }

  it('does not lock when the deviation passes the hold-in range (type 1, K·F(0) = 800 Hz, G3)', () => {
    const r = simulatePlan(planOf(ultrasonicSinglePoleSpec), { kind: 'fm', modulation: 'sine', rateHz: 100, deviationHz: 3000, durationS: 0.05 });
    for (const run of [r.float!, r.bitTrue!]) {
      expect(run.metrics.locked).toBe(false);
      expect(run.metrics.lockTimeS).toBeNull();
    }
  });
});

interface PyCase {
  readonly lockTimeS: number | null;
  readonly locked: boolean;
  readonly table: number[] | null;
}

describe('against a NumPy/SciPy simulation of the float loop (reference/lock_reference.py)', () => {
  const ifCase = { filter: { kind: 'butterworth', order: 2, cutoffHz: 800e3 } };
  const usCase = { filter: { kind: 'single-pole', cutoffHz: 1600 } };
  const cases: { spec: LoopSpec; filter: object; scenario: Scenario }[] = [
    // A 60° initial phase error that settles while the loop tracks a 25 kHz sine message.
    { spec: ifFmDemodSpec, ...ifCase, scenario: { kind: 'fm', modulation: 'sine', rateHz: 25e3, deviationHz: 60e3, durationS: 0.16e-3, initialPhaseDeg: 60 } },
    { spec: ifFmDemodSpec, ...ifCase, scenario: { kind: 'fm', modulation: 'square', rateHz: 25e3, deviationHz: 40e3, durationS: 0.16e-3, initialPhaseDeg: -45 } },
    { spec: ultrasonicSinglePoleSpec, ...usCase, scenario: { kind: 'frequency-step', stepHz: 400, atS: 0.5e-3, durationS: 4e-3 } },
  ];
  const py = runPythonReference<{ cases: PyCase[] }>('lock reference', fileURLToPath(new URL('./reference/lock_reference.py', import.meta.url)), {
    cases: cases.map((c) => ({
      sampleRateHz: c.spec.sampleRateHz,
      centerHz: c.spec.centerHz,
      amplitude: c.spec.input.amplitude,
      gainHzPerUnit: c.spec.nco.gainHzPerUnit,
      filter: c.filter,
      scenario: c.scenario,
      toleranceRad: 0.1,
    })),
  }).cases;

  cases.forEach((c, i) => {
    it(`finds the same lock time: ${c.spec.name}, ${c.scenario.kind}`, () => {
      const plan = planOf(c.spec);
      const r = simulatePlan(plan, c.scenario, { mode: 'float' });
      const ref = py[i]!;
      expect(r.float!.metrics.locked).toBe(ref.locked);
      expect(ref.lockTimeS).not.toBeNull();
      expect(ref.lockTimeS!).toBeGreaterThan(0);
      // One bucket of the grid (a quarter of the 2·fc ripple period) apart at most.
      const bucketS = Math.max(1, Math.round(Math.round(c.spec.sampleRateHz / (2 * c.spec.centerHz)) / 4)) / c.spec.sampleRateHz;
      expect(Math.abs(r.float!.metrics.lockTimeS! - ref.lockTimeS!)).toBeLessThanOrEqual(bucketS + 1e-12);
      if (ref.table) {
        // The tracking error over one period: harmonics (TypeScript) against lfilter (SciPy), sample i
        // of the SciPy period sitting half a sample before phase i/P (the input phase sums earlier samples).
        const table = modulationReference({ spec: plan.spec, sections: plan.filter.sections }, c.scenario)!.errorRad;
        const period = ref.table.length;
        let worst = 0;
        for (let k = 0; k < period; k++) {
          let x = (((k - 0.5) / period) * table.length) % table.length;
          if (x < 0) x += table.length;
          const j = Math.floor(x);
          const v = table[j]! + (x - j) * (table[(j + 1) % table.length]! - table[j]!);
          worst = Math.max(worst, Math.abs(v - ref.table[k]!));
        }
        // Bound: the linear interpolation of the 1024-point table at a corner of the square's phase
        // (slope change 2·2π·Δf/fm per cycle, error ≤ slope change·h/4) plus the half-sample
        // difference between the sum and the integral of the offset (π·Δf/fs).
        const dev = c.scenario.kind === 'fm' ? c.scenario : null;
        const cornerRad = dev && dev.modulation === 'square' ? (2 * 2 * Math.PI * dev.deviationHz) / dev.rateHz / table.length / 4 : 0;
        expect(worst).toBeLessThan(cornerRad + (Math.PI * (dev?.deviationHz ?? 0)) / c.spec.sampleRateHz + 1e-4);
      }
    });
  });
});
