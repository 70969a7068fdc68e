import { defineStore } from 'pinia';
import { ref, shallowRef } from 'vue';
import type { LoopSpec, WordLengthResult } from '@loopwright/dsp';
import { JobCancelledError, jobWorker } from '../workers/dspClient.ts';
import type { WordLengthInput } from '../workers/dspJobs.ts';

export const useWordLengthStore = defineStore('wordLength', () => {
  const result = shallowRef<WordLengthResult | null>(null);
  /** The spec the result belongs to (applying widths edits that spec's fields). */
  const forSpec = shallowRef<LoopSpec | null>(null);
  const running = ref(false);
  const progress = ref(0);
  const stage = ref('');
  const error = ref('');
  let controller: AbortController | null = null;

  async function run(spec: LoopSpec, input: WordLengthInput): Promise<void> {
    controller?.abort();
    const mine = new AbortController();
    controller = mine;
    running.value = true;
    progress.value = 0;
    error.value = '';
    try {
      const done = await jobWorker().run('wordLength', spec, input, {
        signal: mine.signal,
        onProgress: (fraction, label) => {
          progress.value = fraction;
          stage.value = label ?? '';
        },
      });
      result.value = done.output;
      forSpec.value = spec;
    } catch (cause) {
      if (!(cause instanceof JobCancelledError)) error.value = cause instanceof Error ? cause.message : String(cause);
    } finally {
      if (controller === mine) {
        running.value = false;
        controller = null;
      }
    }
  }

  function cancel(): void {
    controller?.abort();
  }

  return { result, forSpec, running, progress, stage, error, run, cancel };
});
