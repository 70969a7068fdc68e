import { defineStore } from 'pinia';
import { ref, shallowRef } from 'vue';
import type { LoopSpec } from '@loopwright/dsp';
import { analysisWorker } from '../workers/dspClient.ts';
import type { DesignAnalysis } from '../workers/dspJobs.ts';

/** How long typing must pause before the analysis runs again. */
export const ANALYSIS_DEBOUNCE_MS = 80;

/**
 * The live analysis of the spec being edited, computed in the browser's DSP worker. The newest
 * request wins: an answer for an older spec is dropped.
 */
export const useAnalysisStore = defineStore('analysis', () => {
  const result = shallowRef<DesignAnalysis | null>(null);
  const running = ref(false);
  const error = ref('');
  const lastRoundTripMs = ref<number | null>(null);
  /** Incremented after each fresh result: charts and tests watch it. */
  const generation = ref(0);
  let timer: ReturnType<typeof setTimeout> | null = null;
  let latest = 0;

  async function runNow(spec: LoopSpec): Promise<void> {
    const ticket = ++latest;
    running.value = true;
    const started = performance.now();
    try {
      const { output } = await analysisWorker().run('analyze', spec, null);
      if (ticket !== latest) return;
      result.value = output;
      error.value = '';
      lastRoundTripMs.value = performance.now() - started;
      // Visible to the browser's performance timeline (the app benchmark reads it).
      performance.measure('lw-analysis-round-trip', { start: started });
      generation.value++;
    } catch (cause) {
      if (ticket !== latest) return;
      error.value = cause instanceof Error ? cause.message : String(cause);
    } finally {
      if (ticket === latest) running.value = false;
    }
  }

  /** Schedule an analysis of this spec after a short pause in typing. */
  function request(spec: LoopSpec, delayMs = ANALYSIS_DEBOUNCE_MS): void {
    if (timer) clearTimeout(timer);
    running.value = true;
    timer = setTimeout(() => {
      timer = null;
      void runNow(spec);
    }, delayMs);
  }

  /** Forget the result (another design is opened, or the spec became invalid). */
  function clear(): void {
    if (timer) clearTimeout(timer);
    timer = null;
    latest++;
    running.value = false;
    result.value = null;
    error.value = '';
  }

  return { result, running, error, lastRoundTripMs, generation, request, runNow, clear };
});
