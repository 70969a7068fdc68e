import { defineStore } from 'pinia';
import { ref, shallowRef } from 'vue';
import type { LoopSpec } from '@loopwright/dsp';
import { analysisWorker } from '../workers/dspClient.ts';
import type { DesignAnalysis } from '../workers/dspJobs.ts';
import { errorText } from '../lib/errorText.ts';

/**
 * How often the first result is analysed and drawn again: the engine optimises a function only after it has
 * run several times, and one pass left the first edit at about 1.15 times the main-thread CPU of three
 * passes (A/B in Chromium, 11 fresh browsers each).
 */
const WARM_UP_PASSES = 3;

/** After the browser's current work (the frame that draws the result), or at once where it cannot tell. */
function whenIdle(callback: () => void): void {
  if (typeof requestIdleCallback === 'function') requestIdleCallback(callback, { timeout: 1000 });
  else setTimeout(callback, 0);
}

/**
 * The live analysis of the spec being edited, computed in the browser's DSP worker. A keystroke is
 * analysed at once when the worker is idle (an analysis takes a few ms, so no debounce delay is
 * added to the 50 ms keystroke-to-plot budget); edits made while it is busy are coalesced, and only
 * the newest runs next. The newest request wins: an answer for an older spec is dropped.
 *
 * The first edit after a design opens would meet every step of its path cold: the worker's planDesign,
 * Vue's patch of the result panels and ECharts' in-place update of the Bode plot are compiled and
 * tiered up on it, and Chromium's trace showed it taking about twice the main-thread time of a later
 * edit. So once the first result is drawn, the same spec is analysed and drawn again while the
 * browser is idle (WARM_UP_PASSES): the same numbers and pixels, no status change, no new generation.
 * An edit made before then, or while it runs, goes first and makes the warm-up moot.
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
      const first = result.value === null;
      result.value = output;
      if (first) whenIdle(() => void warmUp(spec, ticket, WARM_UP_PASSES));
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

  /**
   * Runs the path of an edit with the spec on screen, `passes` times one idle moment after another,
   * unless anything was asked for since `ticket`.
   */
  async function warmUp(spec: LoopSpec, ticket: number, passes: number): Promise<void> {
    if (ticket !== latest || inFlight || pending) return;
    const mine = ++latest;
    inFlight = true;
    try {
      const { output } = await analysisWorker().run('analyze', spec, null);
      if (mine === latest && !pending) {
        result.value = output;
        if (passes > 1) whenIdle(() => void warmUp(spec, mine, passes - 1));
      }
    } catch {
      // The same spec was analysed a moment ago: a failure now is the next request's to report.
    } finally {
      inFlight = false;
    }
    if (pending) void drain();
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
