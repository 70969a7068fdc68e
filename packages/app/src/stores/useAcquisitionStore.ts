import { defineStore } from 'pinia';
import { ref, shallowRef } from 'vue';
import type { AcquisitionComparison, LoopSpec } from '@loopwright/dsp';
import { jobWorker } from '../workers/dspClient.ts';
import { useCancellableJob } from './cancellableJob.ts';

/** The measured acquisition figures of the spec in the editor, one search at a time, with progress and cancel. */
export const useAcquisitionStore = defineStore('acquisition', () => {
  const result = shallowRef<AcquisitionComparison | null>(null);
  /** The spec the result belongs to (a later edit makes it stale). */
  const forSpec = shallowRef<LoopSpec | null>(null);
  const elapsedMs = ref<number | null>(null);
  const cancelled = ref(false);
  const { running, progress, error, start, cancel } = useCancellableJob();

  async function run(spec: LoopSpec): Promise<void> {
    cancelled.value = false;
    await start(
      async (signal) => {
        const done = await jobWorker().run('acquire', spec, null, { signal, onProgress: (fraction) => (progress.value = fraction) });
        result.value = done.output;
        forSpec.value = spec;
        elapsedMs.value = done.elapsedMs;
        progress.value = 1;
      },
      () => (cancelled.value = true),
    );
  }

  return { result, forSpec, elapsedMs, cancelled, running, progress, error, run, cancel };
});
