/**
 * The compute pool refuses work beyond its queue with a clear 503 (server_busy) instead of queueing
 * without bound, and finishes what it accepted (common practice, no source: bounded queues with
 * back-pressure).
 */
import { mainsSyncSpec } from '@loopwright/dsp';
import fs from 'node:fs/promises';
import os from 'node:os';
import { describe, expect, it } from 'vitest';
import { AppError } from '../src/errors.ts';
import { ComputePool } from '../src/services/compute.ts';

/** A simulation comes back as its JSON (src/encodedJson.ts). */
const sampleCountOf = (json: Uint8Array): number => (JSON.parse(new TextDecoder().decode(json)) as { sampleCount: number }).sampleCount;

/** Nice values of this process's threads, from /proc/self/task/<tid>/stat field 19 (proc(5); Linux). */
async function threadNiceValues(): Promise<number[]> {
  const tids = await fs.readdir('/proc/self/task');
  const stats = await Promise.all(tids.map((tid) => fs.readFile(`/proc/self/task/${tid}/stat`, 'utf8').catch(() => null)));
  // Fields after the parenthesised name start at field 3 (state), so nice (19) is the 17th of them.
  return stats.flatMap((stat) => (stat === null ? [] : [Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[16])]));
}

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
      for (const d of done) expect(d.status === 'fulfilled' && d.value.ok && d.value.kind === 'simulation' && sampleCountOf(d.value.simulationJson)).toBe(500_000);
    } finally {
      await pool.close();
    }
  }, 120_000);

  it.runIf(process.platform === 'linux')('lowers the priority of its compute threads only, not of the thread that owns the pool', async () => {
    // +7: a value no other thread of this process has, so the threads found are the pool's.
    const own = os.getPriority(0);
    const pool = new ComputePool({ threads: 1, timeoutMs: 60_000, maxQueue: 1, niceIncrement: 7 });
    try {
      const outcome = await pool.run({ kind: 'analysis', spec: mainsSyncSpec });
      expect(outcome.ok).toBe(true);
      const nice = await threadNiceValues();
      // The worker's thread, and the module-loader thread tsx's register() starts from it, which inherits its nice value.
      expect(nice.filter((n) => n === Math.min(19, own + 7)).length).toBeGreaterThanOrEqual(1);
      expect(os.getPriority(0)).toBe(own);
    } finally {
      await pool.close();
    }
  });
});
