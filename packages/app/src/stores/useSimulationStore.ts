import { defineStore } from 'pinia';
import { ref, shallowRef } from 'vue';
import type { LoopSpec, Scenario } from '@loopwright/dsp';
import { simulationWorkers } from '../workers/dspClient.ts';
import { simulateOn } from '../workers/splitSimulation.ts';
import type { SimulationOutput } from '../workers/dspJobs.ts';
import { useCancellableJob } from './cancellableJob.ts';

/** One simulation at a time in the job workers (one loop in each where there are two), with progress and cancel. */
export const useSimulationStore = defineStore('simulation', () => {
  const output = shallowRef<SimulationOutput | null>(null);
  const elapsedMs = ref<number | null>(null);
  const cancelled = ref(false);
  const { running, progress, error, start, cancel } = useCancellableJob();

  async function run(spec: LoopSpec, scenario: Scenario): Promise<void> {
    cancelled.value = false;
    await start(
      async (signal) => {
        const done = await simulateOn(simulationWorkers(), spec, scenario, {
          signal,
          onProgress: (fraction) => (progress.value = fraction),
        });
        output.value = done.output;
        elapsedMs.value = done.elapsedMs;
        progress.value = 1;
      },
      () => (cancelled.value = true),
    );
  }

  return { output, running, progress, error, elapsedMs, cancelled, run, cancel };
});
