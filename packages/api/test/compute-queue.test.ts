/**
 * The compute pool refuses work beyond its queue with a clear 503 (server_busy) instead of queueing
 * without bound, and finishes what it accepted (common practice, no source: bounded queues with
 * back-pressure).
 */
import { mainsSyncSpec } from '@loopwright/dsp';
import { describe, expect, it } from 'vitest';
import { AppError } from '../src/errors.ts';
import { ComputePool } from '../src/services/compute.ts';

describe('the compute pool queue', () => {
  it('answers 503 server_busy once one thread is busy and its one queue place is taken, and finishes the accepted runs', async () => {
    const pool = new ComputePool({ threads: 1, timeoutMs: 120_000, maxQueue: 1 });
    const task = {
      kind: 'simulation' as const,
      spec: mainsSyncSpec,
      scenario: { kind: 'tone', offsetHz: 1, durationS: 50 },
      options: { mode: 'bit-true' as const, buckets: 10 },
    };
    try {
      const outcomes = await Promise.allSettled([pool.run(task), pool.run(task), pool.run(task)]);
      const refused = outcomes.filter((o): o is PromiseRejectedResult => o.status === 'rejected');
      const done = outcomes.filter((o) => o.status === 'fulfilled');
      expect(refused.length).toBeGreaterThanOrEqual(1);
      for (const r of refused) {
        expect(r.reason).toBeInstanceOf(AppError);
        expect(r.reason).toMatchObject({ code: 'server_busy', status: 503, message: 'the server is busy computing; try again shortly' });
      }
      expect(done.length).toBeGreaterThanOrEqual(1);
      for (const d of done) expect(d.status === 'fulfilled' && d.value.ok && d.value.kind === 'simulation' && d.value.simulation.sampleCount).toBe(500_000);
    } finally {
      await pool.close();
    }
  }, 120_000);
});
