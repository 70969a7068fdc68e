/**
 * A simulation split over two job workers (workers/splitSimulation.ts) gives the page what one worker
 * running both loops gives it, stops both halves when cancelled, and fails with the one-worker run's
 * message naming the field (the split moves the loops, not what they compute; no outside source).
 * The workers are stand-ins serving the real jobs in this thread (jobServer.ts), their messages
 * structured-cloned with the buffers the worker moves, as postMessage does.
 */
import { describe, expect, it } from 'vitest';
import { ifFmDemodSpec, mainsSyncSpec, type LoopSpec, type Scenario } from '@loopwright/dsp';
import { DspClient, JobCancelledError } from '../src/workers/dspClient.ts';
import { simulateOn } from '../src/workers/splitSimulation.ts';
import { simulateJob } from '../src/workers/dspJobs.ts';
import { dspJobServer } from '../src/workers/jobServer.ts';
import type { FromWorker, ToWorker } from '../src/workers/protocol.ts';

class InProcessWorker extends EventTarget {
  readonly sent: ToWorker[] = [];
  /** Bytes moved (not copied) with each answer. */
  readonly moved: number[] = [];
  private readonly serve = dspJobServer((message, transfer) => {
    this.moved.push(transfer.reduce<number>((n, b) => n + (b as ArrayBuffer).byteLength, 0));
    const data = structuredClone(message, { transfer }) as FromWorker;
    setTimeout(() => this.dispatchEvent(new MessageEvent('message', { data })), 0);
  });
  postMessage(message: ToWorker): void {
    this.sent.push(message);
    this.serve(structuredClone(message));
  }
  terminate(): void {}
}

function twoWorkers() {
  const workers: InProcessWorker[] = [];
  const client = () =>
    new DspClient(() => {
      const w = new InProcessWorker();
      workers.push(w);
      return w as unknown as Worker;
    });
  return { clients: [client(), client()] as const, workers };
}

const ctx = { signal: new AbortController().signal, onProgress: () => {} };

describe('a simulation split over two job workers', () => {
  const cases: readonly [string, LoopSpec, Scenario][] = [
    ['a tone, every sample kept', mainsSyncSpec, { kind: 'tone', offsetHz: 1, durationS: 3 }],
    ['FM with noise', ifFmDemodSpec, { kind: 'fm', modulation: 'sine', rateHz: 1e4, deviationHz: 5e4, durationS: 3e-4, snrDb: 20, seed: 5 }],
    ['a sweep', mainsSyncSpec, { kind: 'sweep', fromHz: 0, toHz: 6, rateHzPerS: 6, durationS: 2.2 }],
  ];
  for (const [name, spec, scenario] of cases) {
    it(`gives what one worker gives: ${name}`, async () => {
      const { clients, workers } = twoWorkers();
      const seen: number[] = [];
      const done = await simulateOn(clients, spec, scenario, { onProgress: (f) => seen.push(f) });
      expect(done.output).toStrictEqual(await simulateJob(spec, scenario, ctx));
      expect(workers.map((w) => (w.sent[0] as { input: { mode: string } }).input.mode)).toEqual(['float', 'bit-true']);
      // Each half's traces (and the bit-true half's sine table) moved, not copied.
      for (const w of workers) expect(w.moved.at(-1)).toBeGreaterThan(0);
      expect(seen.at(-1)).toBe(1);
      expect(seen).toEqual([...seen].sort((a, b) => a - b));
    });
  }

  it('runs one job on one worker', async () => {
    const { clients, workers } = twoWorkers();
    const scenario: Scenario = { kind: 'tone', offsetHz: 0, durationS: 1 };
    const done = await simulateOn([clients[0]], mainsSyncSpec, scenario);
    expect(done.output).toStrictEqual(await simulateJob(mainsSyncSpec, scenario, ctx));
    expect(workers).toHaveLength(1);
    expect(workers[0]!.sent[0]).toMatchObject({ job: 'simulate' });
  });

  it('stops both halves when cancelled', async () => {
    const { clients, workers } = twoWorkers();
    const controller = new AbortController();
    const run = simulateOn(clients, mainsSyncSpec, { kind: 'tone', offsetHz: 1, durationS: 5000 }, { signal: controller.signal, onProgress: () => controller.abort() });
    await expect(run).rejects.toBeInstanceOf(JobCancelledError);
    for (const w of workers) expect(w.sent.map((m) => m.type)).toEqual(['run', 'cancel']);
  });

  it('fails with the message of the one-worker run, naming the field, when one half or both fail', async () => {
    const narrow = { ...mainsSyncSpec, filter: { kind: 'pi', naturalHz: 5, damping: 50 }, fixedPoint: { ...mainsSyncSpec.fixedPoint, coefficientBits: 4 } } as LoopSpec;
    const failing: readonly [LoopSpec, Scenario, string][] = [
      // Only the bit-true half fails: a 4-bit coefficient cannot hold the loop (dsp planDesign.test.ts).
      [narrow, { kind: 'tone', offsetHz: 1, durationS: 1 }, 'fixedPoint.coefficientBits'],
      // Both fail, on the sample count the one-worker run checks first.
      [mainsSyncSpec, { kind: 'tone', offsetHz: 1, durationS: 1e5 }, 'durationS'],
    ];
    for (const [spec, scenario, field] of failing) {
      const sequential = await simulateJob(spec, scenario, ctx).then(
        () => null,
        (e: Error) => e.message,
      );
      expect(sequential).toContain(field);
      const { clients } = twoWorkers();
      await expect(simulateOn(clients, spec, scenario)).rejects.toThrow(sequential!);
    }
  });
});
