import { defineStore } from 'pinia';
import { ref, shallowRef } from 'vue';
import type { LoopSpec, Scenario } from '@loopwright/dsp';
import { JobCancelledError, jobWorker } from '../workers/dspClient.ts';
import type { SimulationOutput } from '../workers/dspJobs.ts';

/** One simulation at a time in the job worker, with progress and cancel. */
export const useSimulationStore = defineStore('simulation', () => {
  const output = shallowRef<SimulationOutput | null>(null);
  const running = ref(false);
  const progress = ref(0);
  const error = ref('');
  const elapsedMs = ref<number | null>(null);
  const cancelled = ref(false);
  let controller: AbortController | null = null;

  async function run(spec: LoopSpec, scenario: Scenario): Promise<void> {
    controller?.abort();
    const mine = new AbortController();
    controller = mine;
    running.value = true;
    progress.value = 0;
    error.value = '';
    cancelled.value = false;
    try {
      const done = await jobWorker().run('simulate', spec, scenario, {
        signal: mine.signal,
        onProgress: (fraction) => (progress.value = fraction),
      });
      output.value = done.output;
      elapsedMs.value = done.elapsedMs;
      progress.value = 1;
    } catch (cause) {
      if (cause instanceof JobCancelledError) cancelled.value = true;
      else error.value = cause instanceof Error ? cause.message : String(cause);
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

  return { output, running, progress, error, elapsedMs, cancelled, run, cancel };
});
