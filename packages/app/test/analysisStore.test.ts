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
  beforeEach(() => {
    setActivePinia(createPinia());
    run.mockReset();
  });

  it('runs once after a burst of edits (debounced)', async () => {
    vi.useFakeTimers();
    run.mockResolvedValue({ output: { analysis: 'x' }, elapsedMs: 1 });
    const store = useAnalysisStore();
    store.request(mainsSyncSpec);
    store.request(mainsSyncSpec);
    store.request(ultrasonicSinglePoleSpec);
    await vi.advanceTimersByTimeAsync(500);
    expect(run).toHaveBeenCalledTimes(1);
    expect(run.mock.calls[0]![1]).toBe(ultrasonicSinglePoleSpec);
    vi.useRealTimers();
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
    expect(store.running).toBe(false);
    expect(store.generation).toBe(1);
  });

  it('shows a failure of the newest run', async () => {
    run.mockRejectedValueOnce(new Error('loop filter cannot be designed'));
    const store = useAnalysisStore();
    await store.runNow(mainsSyncSpec);
    expect(store.error).toBe('loop filter cannot be designed');
  });
});
