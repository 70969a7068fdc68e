import { defineStore } from 'pinia';
import { ref, shallowRef } from 'vue';
import type { LoopSpec } from '@loopwright/dsp';
import { analysisWorker } from '../workers/dspClient.ts';
import type { DesignAnalysis } from '../workers/dspJobs.ts';
import { errorText } from '../lib/errorText.ts';

/**
 * The live analysis of the spec being edited, computed in the browser's DSP worker. A keystroke is
 * analysed at once when the worker is idle (an analysis takes a few ms, so no debounce delay is
 * added to the 50 ms keystroke-to-plot budget); edits made while it is busy are coalesced, and only
 * the newest runs next. The newest request wins: an answer for an older spec is dropped.
 */
export const useAnalysisStore = defineStore('analysis', () => {
  const result = shallowRef<DesignAnalysis | null>(null);
  const running = ref(false);
  const error = ref('');
  const lastRoundTripMs = ref<number | null>(null);
  /** Incremented after each fresh result: charts and tests watch it. */
  const generation = ref(0);
  let latest = 0;
  let inFlight = false;
  let pending: LoopSpec | null = null;

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
      error.value = errorText(cause);
    } finally {
      if (ticket === latest) running.value = false;
    }
  }

  /** Analyse this spec now, or as soon as the analysis in flight returns (only the newest waits). */
  function request(spec: LoopSpec): void {
    running.value = true;
    pending = spec;
    if (!inFlight) void drain();
  }

  async function drain(): Promise<void> {
    inFlight = true;
    try {
      while (pending) {
        const spec = pending;
        pending = null;
        await runNow(spec);
      }
    } finally {
      inFlight = false;
    }
  }

  /** Forget the result (another design is opened, or the spec became invalid). */
  function clear(): void {
    pending = null;
    latest++;
    running.value = false;
    result.value = null;
    error.value = '';
  }

  return { result, running, error, lastRoundTripMs, generation, request, runNow, clear };
});
