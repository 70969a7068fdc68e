import { defineStore } from 'pinia';
import { ref, shallowRef } from 'vue';
import type { LoopSpec, WordLengthResult } from '@loopwright/dsp';
import { jobWorker } from '../workers/dspClient.ts';
import type { WordLengthInput } from '../workers/dspJobs.ts';
import { useCancellableJob } from './cancellableJob.ts';

export const useWordLengthStore = defineStore('wordLength', () => {
  const result = shallowRef<WordLengthResult | null>(null);
  /** The spec the result belongs to (applying widths edits that spec's fields). */
  const forSpec = shallowRef<LoopSpec | null>(null);
  const stage = ref('');
  const { running, progress, error, start, cancel } = useCancellableJob();

  async function run(spec: LoopSpec, input: WordLengthInput): Promise<void> {
    await start(async (signal) => {
      const done = await jobWorker().run('wordLength', spec, input, {
        signal,
        onProgress: (fraction, label) => {
          progress.value = fraction;
          stage.value = label ?? '';
        },
      });
      result.value = done.output;
      forSpec.value = spec;
    });
  }

  return { result, forSpec, running, progress, stage, error, run, cancel };
});
