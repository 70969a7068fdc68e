/**
 * The analysis worker's warm-up (workers/jobServer.ts, dspClient.ts): the client asks every worker it
 * starts to warm up, before any job; the worker analyses each of dsp's warm-up analyses (warmupSequence) in a task of its own and
 * posts nothing for them; a job sent before, during or after the warm-up gets the answer a worker that
 * never warmed up gives. The analysis is a pure function of the spec (no outside source), so the
 * answers must be equal to the last bit.
 */
import { afterEach, describe, expect, it, vi } from 'vitest';
import { exampleSpecs, warmupSequence, type LoopSpec } from '@loopwright/dsp';
import { DspClient } from '../src/workers/dspClient.ts';
import { dspJobServer } from '../src/workers/jobServer.ts';
import type { FromWorker, ToWorker } from '../src/workers/protocol.ts';

/** A job server in this thread; what it posts is structured-cloned, as postMessage does. */
function server() {
  const posted: FromWorker[] = [];
  const serve = dspJobServer((message, transfer) => posted.push(structuredClone(message, { transfer }) as FromWorker));
  return { posted, serve: (message: ToWorker) => serve(structuredClone(message)) };
}

const analyze = (id: number, spec: LoopSpec): ToWorker => ({ type: 'run', id, job: 'analyze', spec, input: null });
const outputOf = (posted: readonly FromWorker[], id: number) => {
  const done = posted.find((m) => m.id === id);
  if (done?.type !== 'done') throw new Error(`job ${id} did not finish: ${JSON.stringify(done)}`);
  return done.output;
};
/** Lets the job server's async job post its answer. */
const settle = () => new Promise<void>((resolve) => queueMicrotask(resolve)).then(() => Promise.resolve());

describe('the analysis worker warm-up', () => {
  afterEach(() => vi.useRealTimers());

  it('analyses every warm-up spec, one task each, and posts nothing for them', async () => {
    vi.useFakeTimers({ toFake: ['setTimeout'] });
    const { posted, serve } = server();
    serve({ type: 'warmUp' });
    serve({ type: 'warmUp' });
    let tasks = 0;
    while (vi.getTimerCount() > 0) {
      expect(vi.getTimerCount()).toBe(1);
      vi.advanceTimersToNextTimer();
      tasks++;
    }
    await settle();
    expect(tasks).toBe(warmupSequence.length);
    expect(posted).toEqual([]);
  });

  it('answers jobs sent before, in the middle of and after the warm-up as a worker without one does', async () => {
    vi.useFakeTimers({ toFake: ['setTimeout'] });
    const specs = exampleSpecs.map((e) => e.spec);
    const cold = server();
    specs.forEach((spec, i) => cold.serve(analyze(i + 1, spec)));
    await settle();

    const warm = server();
    warm.serve({ type: 'warmUp' });
    warm.serve(analyze(1, specs[0]!));
    vi.advanceTimersToNextTimer();
    warm.serve(analyze(2, specs[1]!));
    vi.advanceTimersToNextTimer();
    warm.serve(analyze(3, specs[2]!));
    await vi.runAllTimersAsync();
    warm.serve(analyze(4, specs[3]!));
    await settle();

    expect(warm.posted.map((m) => m.id)).toEqual([1, 2, 3, 4]);
    specs.forEach((_, i) => expect(outputOf(warm.posted, i + 1)).toEqual(outputOf(cold.posted, i + 1)));
  });
});

describe('the DSP client of the analysis worker', () => {
  class FakeWorker extends EventTarget {
    readonly sent: ToWorker[] = [];
    postMessage(message: ToWorker): void {
      this.sent.push(message);
    }
    terminate(): void {}
  }

  it('starts its worker when asked, before any job, and has each worker it starts warm up first', () => {
    const workers: FakeWorker[] = [];
    const factory = () => {
      const w = new FakeWorker();
      workers.push(w);
      return w as unknown as Worker;
    };
    const warming = new DspClient(factory, { warmUp: true });
    warming.start();
    expect(workers).toHaveLength(1);
    void warming.run('analyze', exampleSpecs[0]!.spec, null).catch(() => {});
    expect(workers[0]!.sent.map((m) => m.type)).toEqual(['warmUp', 'run']);
    warming.dispose();
    void warming.run('analyze', exampleSpecs[0]!.spec, null).catch(() => {});
    expect(workers[1]!.sent.map((m) => m.type)).toEqual(['warmUp', 'run']);

    const plain = new DspClient(factory);
    void plain.run('analyze', exampleSpecs[0]!.spec, null).catch(() => {});
    expect(workers[2]!.sent.map((m) => m.type)).toEqual(['run']);
    warming.dispose();
    plain.dispose();
  });
});
