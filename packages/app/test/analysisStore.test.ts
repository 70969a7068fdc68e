import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { mainsSyncSpec, ultrasonicSinglePoleSpec } from '@loopwright/dsp';

const run = vi.fn();
vi.mock('../src/workers/dspClient.ts', () => ({ analysisWorker: () => ({ run }) }));

const { useAnalysisStore } = await import('../src/stores/useAnalysisStore.ts');

function deferred<T>() {
  let resolve!: (v: T) => void;
  const promise = new Promise<T>((r) => (resolve = r));
  return { promise, resolve };
}

describe('analysis store', () => {
  beforeEach(async () => {
    // A warm-up an earlier test left scheduled runs now, before the mock is reset.
    await new Promise((resolve) => setTimeout(resolve, 20));
    setActivePinia(createPinia());
    run.mockReset();
  });

  it('analyses the first edit at once and, of a burst made meanwhile, only the newest', async () => {
    const first = deferred<unknown>();
    run.mockReturnValueOnce(first.promise).mockResolvedValue({ output: 'newest', elapsedMs: 1 });
    const store = useAnalysisStore();
    store.request(mainsSyncSpec);
    expect(run).toHaveBeenCalledTimes(1);
    store.request(mainsSyncSpec);
    store.request(ultrasonicSinglePoleSpec);
    first.resolve({ output: 'first', elapsedMs: 1 });
    await vi.waitFor(() => expect(store.running).toBe(false));
    expect(run).toHaveBeenCalledTimes(2);
    expect(run.mock.calls[1]![1]).toBe(ultrasonicSinglePoleSpec);
    expect(store.result).toBe('newest');
  });

  it('keeps the newest answer when an older one arrives late', async () => {
    const slow = deferred<unknown>();
    const fast = deferred<unknown>();
    run.mockReturnValueOnce(slow.promise).mockReturnValueOnce(fast.promise);
    const store = useAnalysisStore();
    const first = store.runNow(mainsSyncSpec);
    const second = store.runNow(ultrasonicSinglePoleSpec);
    fast.resolve({ output: 'new', elapsedMs: 1 });
    await second;
    slow.resolve({ output: 'old', elapsedMs: 1 });
    await first;
    expect(store.result).toBe('new');
    // The first result's warm-up (its passes fail here: the mock has no more answers) ends the run.
    await vi.waitFor(() => expect(store.running).toBe(false));
    expect(store.generation).toBe(1);
  });

  it('shows a failure of the newest run', async () => {
    run.mockRejectedValueOnce(new Error('loop filter cannot be designed'));
    const store = useAnalysisStore();
    await store.runNow(mainsSyncSpec);
    expect(store.error).toBe('loop filter cannot be designed');
  });

  it('analyses and draws the first result three more times, one after another, reading "running" until then, with no new generation', async () => {
    const third = deferred<unknown>();
    run
      .mockResolvedValueOnce({ output: 'first', elapsedMs: 1 })
      .mockResolvedValueOnce({ output: 'warm', elapsedMs: 1 })
      .mockReturnValueOnce(third.promise)
      .mockResolvedValue({ output: 'warm', elapsedMs: 1 });
    const store = useAnalysisStore();
    await store.runNow(mainsSyncSpec);
    expect(store.result).toBe('first');
    expect(store.running).toBe(true);
    await vi.waitFor(() => expect(run).toHaveBeenCalledTimes(3));
    // One pass at a time: the next waits for this one's answer.
    await new Promise((resolve) => setTimeout(resolve, 20));
    expect(run).toHaveBeenCalledTimes(3);
    expect(store.running).toBe(true);
    third.resolve({ output: 'warm', elapsedMs: 1 });
    await vi.waitFor(() => expect(run).toHaveBeenCalledTimes(4));
    await new Promise((resolve) => setTimeout(resolve, 20));
    expect(run).toHaveBeenCalledTimes(4);
    expect(store.result).toBe('warm');
    expect(run.mock.calls.every((call) => call[1] === mainsSyncSpec)).toBe(true);
    expect(store.running).toBe(false);
    expect(store.generation).toBe(1);
  });

  it('sends an edit made during the warm-up to the worker at once, ends the warm-up and drops its answer', async () => {
    const warm = deferred<unknown>();
    const edited = deferred<unknown>();
    run.mockResolvedValueOnce({ output: 'first', elapsedMs: 1 }).mockReturnValueOnce(warm.promise).mockReturnValueOnce(edited.promise);
    const store = useAnalysisStore();
    store.request(mainsSyncSpec);
    await vi.waitFor(() => expect(run).toHaveBeenCalledTimes(2));
    store.request(ultrasonicSinglePoleSpec);
    expect(run).toHaveBeenCalledTimes(3);
    expect(run.mock.calls[2]![1]).toBe(ultrasonicSinglePoleSpec);
    warm.resolve({ output: 'warm', elapsedMs: 1 });
    await new Promise((resolve) => setTimeout(resolve, 20));
    expect(store.result).toBe('first');
    expect(store.running).toBe(true);
    edited.resolve({ output: 'edited', elapsedMs: 1 });
    await vi.waitFor(() => expect(store.running).toBe(false));
    await new Promise((resolve) => setTimeout(resolve, 20));
    expect(run).toHaveBeenCalledTimes(3);
    expect(store.result).toBe('edited');
    expect(store.generation).toBe(2);
  });

  it('skips the warm-up when an edit comes before its first pass', async () => {
    run.mockResolvedValue({ output: 'answer', elapsedMs: 1 });
    const store = useAnalysisStore();
    await store.runNow(mainsSyncSpec);
    store.request(ultrasonicSinglePoleSpec);
    await vi.waitFor(() => expect(store.running).toBe(false));
    await new Promise((resolve) => setTimeout(resolve, 20));
    expect(run).toHaveBeenCalledTimes(2);
  });
});
