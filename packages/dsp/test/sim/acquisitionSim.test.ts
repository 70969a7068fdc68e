import { describe, expect, it } from 'vitest';
import { measureAcquisition, cascadeDcGain } from '../../src/analysis/acquisitionSim.ts';
import { mainsSyncSpec, ultrasonicSinglePoleSpec } from '../../src/spec/examples.ts';
import { designLoopFilter } from '../../src/design.ts';

describe('measureAcquisition (simulated nonlinear float loop)', () => {
  it('measures hold-in of a type-1 loop at K·F(0) (G3 Ch. 2) within its bisection bracket', () => {
    // Sinusoidal detector: equilibrium sin θe = Δω/(K·F(0)) exists only for Δω ≤ K·F(0).
    // K = Kd·Ko = (A/2)·2π·gainHzPerUnit, F(0) = 1 → hold-in = 0.4·2000 = 800 Hz.
    const spec = ultrasonicSinglePoleSpec;
    const expectedHz = (spec.input.amplitude / 2) * spec.nco.gainHzPerUnit * cascadeDcGain(designLoopFilter(spec).sections)!;
    expect(expectedHz).toBeCloseTo(800, 6);
    const r = measureAcquisition(spec);
    expect(r.label).toBe('simulated');
    expect(r.holdInHz.passHz).toBeLessThanOrEqual(expectedHz * 1.01);
    expect(r.holdInHz.failHz!).toBeGreaterThanOrEqual(expectedHz * 0.99);
    // Lock-in and pull-in cannot exceed hold-in (no equilibrium beyond it).
    expect(r.lockInHz.passHz).toBeLessThanOrEqual(r.holdInHz.failHz! + 1e-9);
    expect(r.pullInHz.passHz).toBeLessThanOrEqual(r.holdInHz.failHz! + 1e-9);
  });

  it('finds the PI loop’s lock-in within 2x of 2ζωn and pull-out near 1.8·ωn·(ζ+1) (G3, B6; Ku23 on the spread)', () => {
    const spec = mainsSyncSpec;
    const r = measureAcquisition(spec);
    const fn = 5;
    const zeta = 0.707;
    const lockInEstimateHz = 2 * zeta * fn; // 2ζωn in Hz
    const pullOutEstimateHz = 1.8 * fn * (zeta + 1); // 1.8·ωn·(ζ+1) in Hz
    const lockIn = r.lockInHz.valueHz!;
    expect(lockIn / lockInEstimateHz).toBeGreaterThan(0.5);
    expect(lockIn / lockInEstimateHz).toBeLessThan(2);
    // Gardner's pull-out formula is an empirical fit for ζ ≈ 0.5–1.4 (memory): allow 20 %.
    expect(r.pullOutHz.valueHz! / pullOutEstimateHz).toBeGreaterThan(0.8);
    expect(r.pullOutHz.valueHz! / pullOutEstimateHz).toBeLessThan(1.25);
    // Ideal PI: hold-in unbounded (G3) → the search reaches the control word's range and says so
    // instead of reporting the limit as a figure.
    expect(r.holdInHz.atSearchLimit).toBe(true);
    expect(r.holdInHz.limitedBy).toBe('control-range');
    expect(r.holdInHz.valueHz).toBeNull();
    expect(r.holdInHz.passHz).toBe(spec.nco.gainHzPerUnit);
    expect(r.notes.join(' ')).toMatch(/type-2/);
  });

  it('stops searching once its sample budget is spent, reports progress and stops when aborted', () => {
    const seen: number[] = [];
    const r = measureAcquisition(ultrasonicSinglePoleSpec, { maxSamples: 50_000, onProgress: (f) => seen.push(f) });
    expect(r.budgetExhausted).toBe(true);
    // A search the budget cut short keeps its bracket and reports no figure.
    const cut = [r.lockInHz, r.pullOutHz, r.holdInHz, r.pullInHz].filter((m) => m.limitedBy === 'sample-budget');
    expect(cut.length).toBeGreaterThan(0);
    for (const m of cut) expect(m.valueHz).toBeNull();
    // At most one run past the budget (the run in progress when it ran out).
    expect(r.samplesSimulated).toBeLessThan(2 * 50_000);
    expect(seen.at(-1)).toBe(1);
    const flag = { aborted: true };
    expect(() => measureAcquisition(ultrasonicSinglePoleSpec, { signal: flag })).toThrow(/aborted/);
  });
});
