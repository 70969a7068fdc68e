/**
 * A 'both' simulation split over two compute threads (services/compute.ts runSimulation) answers
 * the bytes one thread running both loops answers (the sequential run in this thread, through the
 * same task function), stops both halves when cancelled, and fails as the sequential run fails,
 * naming the same field (the split changes where the loops run, not what they compute; no outside source).
 */
import { mainsSyncSpec, ifFmDemodSpec } from '@loopwright/dsp';
import { afterAll, describe, expect, it } from 'vitest';
import { ComputePool } from '../src/services/compute.ts';
import { runComputeTask, type SimulationTask } from '../src/workers/compute.ts';

const pool = new ComputePool({ threads: 2, timeoutMs: 120_000, maxQueue: 4 });
afterAll(() => pool.close());

const text = (bytes: Uint8Array) => new TextDecoder().decode(bytes);

const task = (spec: unknown, scenario: unknown, buckets = 200): SimulationTask => ({ kind: 'simulation', spec, scenario, options: { buckets } });

/** The one-task answer: the task function with mode 'both', run here in one thread. */
function sequential(t: SimulationTask) {
  const outcome = runComputeTask(t);
  return outcome.ok && outcome.kind === 'simulation' ? { ok: true as const, json: text(outcome.simulationJson) } : outcome;
}

describe('a simulation split over two compute threads', () => {
  const cases: readonly [string, SimulationTask][] = [
    ['a tone', task(mainsSyncSpec, { kind: 'tone', offsetHz: 1, durationS: 4 })],
    ['a sweep', task(mainsSyncSpec, { kind: 'sweep', fromHz: 0, toHz: 6, rateHzPerS: 6, durationS: 2.2 }, 50)],
    ['FM with noise', task(ifFmDemodSpec, { kind: 'fm', modulation: 'sine', rateHz: 1e4, deviationHz: 5e4, durationS: 3e-4, snrDb: 20, seed: 3 })],
    ['a scenario beyond the fixed-point reach (warnings)', task(mainsSyncSpec, { kind: 'tone', offsetHz: 18, durationS: 2 })],
  ];
  for (const [name, t] of cases) {
    it(`answers the bytes of the one-task run: ${name}`, async () => {
      const outcome = await pool.runSimulation(t);
      expect(outcome.ok && outcome.kind).toBe('simulation');
      if (!outcome.ok || outcome.kind !== 'simulation') return;
      expect(text(outcome.simulationJson)).toBe((sequential(t) as { json: string }).json);
      // Two threads idle (this machine has two cores or more): one loop on each.
      if (pool.threadLimit >= 2) {
        expect(outcome.halvesOn).toHaveLength(2);
        expect(new Set(outcome.halvesOn).size).toBe(2);
      }
    }, 60_000);
  }

  it('runs one task when the mode asks one loop, or when no second thread is idle', async () => {
    const float = await pool.runSimulation({ ...task(mainsSyncSpec, { kind: 'tone', offsetHz: 1, durationS: 1 }), options: { mode: 'float', buckets: 10 } });
    expect(float.ok && float.kind === 'simulation' && float.halvesOn).toBeUndefined();
    const busy = pool.run({ ...task(mainsSyncSpec, { kind: 'tone', offsetHz: 1, durationS: 20 }), options: { mode: 'bit-true', buckets: 10 } });
    const t = task(mainsSyncSpec, { kind: 'tone', offsetHz: 0.5, durationS: 1 });
    const both = await pool.runSimulation(t);
    expect(both.ok && both.kind === 'simulation' && both.halvesOn).toBeUndefined();
    expect(both.ok && both.kind === 'simulation' && text(both.simulationJson)).toBe((sequential(t) as { json: string }).json);
    await busy;
  }, 120_000);

  it('stops both halves when cancelled, leaving both threads idle for the next split run', async () => {
    const cancel = new AbortController();
    const run = pool.runSimulation(task(mainsSyncSpec, { kind: 'tone', offsetHz: 1, durationS: 2000 }), cancel.signal);
    setTimeout(() => cancel.abort(), 300);
    await expect(run).rejects.toMatchObject({ name: 'AbortError' });
    // Split again: only possible when neither half of the cancelled run still holds a thread.
    const next = await pool.runSimulation(task(mainsSyncSpec, { kind: 'tone', offsetHz: 1, durationS: 1 }));
    if (pool.threadLimit >= 2) expect(next.ok && next.kind === 'simulation' && next.halvesOn).toHaveLength(2);
  }, 120_000);

  it('fails as the one-task run fails, naming the field', async () => {
    const narrow = { ...mainsSyncSpec, filter: { kind: 'pi', naturalHz: 5, damping: 50 }, fixedPoint: { ...mainsSyncSpec.fixedPoint, coefficientBits: 4 } };
    const failing: readonly [SimulationTask, string][] = [
      // Only the bit-true half fails: a 4-bit coefficient cannot hold the loop (planDesign.test.ts).
      [task(narrow, { kind: 'tone', offsetHz: 1, durationS: 1 }), 'fixedPoint.coefficientBits'],
      // Both halves fail, on the sample count the sequential run checks first.
      [task(mainsSyncSpec, { kind: 'tone', offsetHz: 1, durationS: 1e5 }), 'durationS'],
      [task(mainsSyncSpec, { kind: 'tone', offsetHz: 'near', durationS: 1 }), 'offsetHz'],
      [task({ ...mainsSyncSpec, sampleRateHz: -1 }, { kind: 'tone', offsetHz: 1, durationS: 1 }), 'sampleRateHz'],
    ];
    for (const [t, field] of failing) {
      const outcome = await pool.runSimulation(t);
      expect(outcome.ok).toBe(false);
      if (outcome.ok) continue;
      expect(outcome.issues.map((i) => i.field)).toContain(field);
      const { threadId: _one, ...expected } = sequential(t) as typeof outcome;
      const { threadId: _two, ...actual } = outcome;
      expect(actual).toStrictEqual(expected);
    }
  }, 120_000);
});
