/**
 * A warm compute pool (services/compute.ts `warm`) starts its threads with the pool and has each
 * analyse the warm-up specs and run the warm-up simulations before its first task. The warm-up must
 * not change any answer: the analysis and the simulation are pure functions of the spec and the
 * scenario (no outside source; noise from the scenario's seed), so a warm thread's first answers,
 * sent while it is still starting and warming up, equal a cold thread's and this thread's own.
 */
import { exampleSpecs, tryPlanDesign } from '@loopwright/dsp';
import { isDeepStrictEqual } from 'node:util';
import { describe, expect, it } from 'vitest';
import { loadConfig } from '../src/config.ts';
import { ComputePool } from '../src/services/compute.ts';
import type { ComputeOutcome, ComputeTask } from '../src/workers/compute.ts';

const specs = [...exampleSpecs.map((e) => e.spec), { ...exampleSpecs[0]!.spec, filter: { kind: 'pi', naturalHz: -5, damping: 0.7 } }];

const analyses: readonly ComputeTask[] = specs.map((spec) => ({ kind: 'analysis', spec }));

/** Each task's answer, all sent at once, without the thread id. */
async function answers(pool: ComputePool, tasks: readonly ComputeTask[] = analyses) {
  const outcomes = await Promise.all(tasks.map((task) => pool.run(task)));
  return outcomes.map(({ threadId: _threadId, ...rest }: ComputeOutcome) => rest);
}

describe('a warm compute pool', () => {
  it('starts its threads with the pool and answers its first tasks, sent mid-warm-up, as a cold thread does', async () => {
    const warm = new ComputePool({ threads: 1, timeoutMs: 120_000, maxQueue: 16, warm: true });
    const cold = new ComputePool({ threads: 1, timeoutMs: 120_000, maxQueue: 16 });
    try {
      // Started with the pool, before any task; the tasks below are sent in the same turn, so they
      // reach the thread while it is still loading its modules and warming up.
      expect(warm.threadCount).toBe(1);
      expect(cold.threadCount).toBe(0);
      const warmAnswers = await answers(warm);
      const coldAnswers = await answers(cold);
      expect(warmAnswers).toEqual(coldAnswers);
      const here = specs.map((spec) => {
        const planned = tryPlanDesign(spec);
        return planned.ok ? { ok: true, kind: 'analysis', analysis: planned.plan.analysis } : { ok: false, issues: planned.issues, prefix: 'spec' };
      });
      expect(warmAnswers).toEqual(here);
      expect(warmAnswers.at(-1)).toMatchObject({ ok: false, issues: [{ field: 'filter.naturalHz' }] });
    } finally {
      await Promise.all([warm.close(), cold.close()]);
    }
  }, 120_000);
});

describe('a warm compute pool\'s simulations', () => {
  it('answer every demo spec, whole and as split halves, sent mid-warm-up, with the bytes of a cold thread', async () => {
    const tasks = exampleSpecs.flatMap((e) => {
      const base = { kind: 'simulation', spec: e.spec, scenario: { kind: 'tone', offsetHz: 1, durationS: 4096 / e.spec.sampleRateHz, snrDb: 40, seed: 7 } } as const;
      return [
        { ...base, options: { mode: 'both' } },
        { ...base, options: { mode: 'float' }, half: true },
        { ...base, options: { mode: 'bit-true' }, half: true },
      ] as const;
    });
    const warm = new ComputePool({ threads: 1, timeoutMs: 120_000, maxQueue: 32, warm: true });
    const cold = new ComputePool({ threads: 1, timeoutMs: 120_000, maxQueue: 32 });
    try {
      const warmAnswers = await answers(warm, tasks);
      const coldAnswers = await answers(cold, tasks);
      expect(warmAnswers.every((a) => a.ok)).toBe(true);
      // Node's deep equality compares the answers' byte arrays as bytes (vitest's walks them element by element, seconds for these).
      warmAnswers.forEach((answer, i) => expect(isDeepStrictEqual(answer, coldAnswers[i]), `task ${i}`).toBe(true));
    } finally {
      await Promise.all([warm.close(), cold.close()]);
    }
  }, 120_000);
});

describe('LW_COMPUTE_WARM', () => {
  it('is on by default and off under NODE_ENV=test unless set', () => {
    expect(loadConfig({}).compute.warm).toBe(true);
    expect(loadConfig({ NODE_ENV: 'test' }).compute.warm).toBe(false);
    expect(loadConfig({ NODE_ENV: 'test', LW_COMPUTE_WARM: 'true' }).compute.warm).toBe(true);
    expect(loadConfig({ LW_COMPUTE_WARM: '0' }).compute.warm).toBe(false);
  });
});
