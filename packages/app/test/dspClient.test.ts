import { afterEach, describe, expect, it, vi } from 'vitest';
import { mainsSyncSpec } from '@loopwright/dsp';
import { DspClient, JobCancelledError } from '../src/workers/dspClient.ts';
import type { FromWorker, ToWorker } from '../src/workers/protocol.ts';

/** A worker stand-in: records what it is sent; the test answers for it. */
class FakeWorker extends EventTarget {
  readonly sent: ToWorker[] = [];
  terminated = false;
  postMessage(message: ToWorker): void {
    this.sent.push(message);
  }
  terminate(): void {
    this.terminated = true;
  }
  reply(message: FromWorker): void {
    this.dispatchEvent(new MessageEvent('message', { data: message }));
  }
}

function setup() {
  const workers: FakeWorker[] = [];
  const client = new DspClient(() => {
    const w = new FakeWorker();
    workers.push(w);
    return w as unknown as Worker;
  });
  return { client, workers };
}

/** An analysis job started with an abort signal, and the id the client gave it. */
function abortableJob() {
  const { client, workers } = setup();
  const controller = new AbortController();
  const job = client.run('analyze', mainsSyncSpec, null, { signal: controller.signal });
  const worker = workers[0]!;
  return { job, controller, worker, id: (worker.sent[0] as { id: number }).id };
}

describe('DSP worker client', () => {
  afterEach(() => vi.useRealTimers());

  it('numbers jobs, forwards progress and resolves with the output', async () => {
    const { client, workers } = setup();
    const seen: number[] = [];
    const job = client.run('analyze', mainsSyncSpec, null, { onProgress: (f) => seen.push(f) });
    const sent = workers[0]!.sent[0]!;
    expect(sent).toMatchObject({ type: 'run', job: 'analyze', spec: mainsSyncSpec });
    workers[0]!.reply({ type: 'progress', id: (sent as { id: number }).id, fraction: 0.5 });
    workers[0]!.reply({ type: 'done', id: (sent as { id: number }).id, output: { ok: 1 }, elapsedMs: 3 });
    await expect(job).resolves.toEqual({ output: { ok: 1 }, elapsedMs: 3 });
    expect(seen).toEqual([0.5]);
  });

  it('sends cancel on abort and reports the job cancelled', async () => {
    const { job, controller, worker, id } = abortableJob();
    controller.abort();
    expect(worker.sent[1]).toEqual({ type: 'cancel', id });
    worker.reply({ type: 'failed', id, message: 'Cancelled', cancelled: true });
    await expect(job).rejects.toBeInstanceOf(JobCancelledError);
  });

  it('reports a job cancelled whose result arrives after Cancel was pressed (a fast search beats the message)', async () => {
    const { job, controller, worker, id } = abortableJob();
    controller.abort();
    worker.reply({ type: 'done', id, output: { figure: 1 }, elapsedMs: 3 } as unknown as FromWorker);
    await expect(job).rejects.toBeInstanceOf(JobCancelledError);
  });

  it('restarts a worker that does not stop a cancelled job in time', async () => {
    vi.useFakeTimers();
    const { client, workers } = setup();
    const controller = new AbortController();
    const job = client.run('analyze', mainsSyncSpec, null, { signal: controller.signal });
    controller.abort();
    vi.advanceTimersByTime(1000);
    await expect(job).rejects.toBeInstanceOf(JobCancelledError);
    expect(workers[0]!.terminated).toBe(true);
    void client.run('analyze', mainsSyncSpec, null);
    expect(workers).toHaveLength(2);
  });
});
