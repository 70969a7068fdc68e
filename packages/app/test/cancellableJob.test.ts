import { describe, expect, it } from 'vitest';
import { useCancellableJob } from '../src/stores/cancellableJob.ts';
import { JobCancelledError } from '../src/workers/dspClient.ts';

// Behaviour the simulation and word-length stores rely on (common practice for abortable jobs, no source).
describe('useCancellableJob', () => {
  it('reports a cancellation through onCancelled, not as an error', async () => {
    const job = useCancellableJob();
    let cancelled = false;
    await job.start(
      () => Promise.reject(new JobCancelledError()),
      () => (cancelled = true),
    );
    expect(cancelled).toBe(true);
    expect(job.error.value).toBe('');
    expect(job.running.value).toBe(false);
  });

  it('shows the message of a failed job', async () => {
    const job = useCancellableJob();
    await job.start(() => Promise.reject(new Error('fractionBits: too wide')));
    expect(job.error.value).toBe('fractionBits: too wide');
  });

  it('aborts the previous run and keeps running true until the newest run settles', async () => {
    const job = useCancellableJob();
    let firstSignal: AbortSignal | null = null;
    let finishSecond = (): void => {};
    const first = job.start((signal) => {
      firstSignal = signal;
      return new Promise((_, reject) => signal.addEventListener('abort', () => reject(new JobCancelledError())));
    });
    const second = job.start(() => new Promise<void>((resolve) => (finishSecond = resolve)));
    await first;
    expect(firstSignal!.aborted).toBe(true);
    expect(job.running.value).toBe(true);
    finishSecond();
    await second;
    expect(job.running.value).toBe(false);
  });
});
