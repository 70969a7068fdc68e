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

/**
 * After the frame that paints what was just applied: the next animation frame, then a task (tasks queued
 * in a frame run once it is drawn). A page not shown gets no frames; the timer goes on without one.
 */
function afterPaint(): Promise<void> {
  return new Promise((resolve) => {
    const unseen = setTimeout(resolve, NO_FRAME_MS);
    if (typeof requestAnimationFrame !== 'function') return;
    requestAnimationFrame(() => {
      clearTimeout(unseen);
      setTimeout(resolve, 0);
    });
  });
}

/** How long a warm-up pass waits for a frame before it goes on without one (a hidden page). */
const NO_FRAME_MS = 200;

/**
 * The live analysis of the spec being edited, computed in the browser's DSP worker. A keystroke is
 * analysed at once when the worker is idle (an analysis takes a few ms, so no debounce delay is
 * added to the 50 ms keystroke-to-plot budget); edits made while it is busy are coalesced, and only
 * the newest runs next. The newest request wins: an answer for an older spec is dropped.
 *
 * The first edit after a design opens would meet every step of its path cold: the worker's planDesign,
 * Vue's patch of the result panels and ECharts' in-place update of the Bode plot are compiled and
 * tiered up on it, and Chromium's trace showed it taking about twice the main-thread time of a later
 * edit. So once the first result is drawn, the same spec is analysed and drawn again, one pass after
 * the frame that painted the one before (WARM_UP_PASSES): the same numbers and pixels, no new
 * generation. The status stays "Analysing…" until the passes are done, so the page says it is up to
 * date once an edit meets a warm path. Passes spread over idle moments instead kept the page busy for
 * longer and an edit made right after "up to date" met one of them in the worker or on the main thread
 * (traced: the first edit waited about 10 ms for a warm-up analysis). An edit made meanwhile is
 * analysed at once (the worker takes it right after a pass it is in) and ends the warm-up: that pass's
 * answer is dropped.
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
    let warming = false;
    try {
      const { output } = await analysisWorker().run('analyze', spec, null);
      if (ticket !== latest) return;
      const first = result.value === null;
      result.value = output;
      error.value = '';
      lastRoundTripMs.value = performance.now() - started;
      // Visible to the browser's performance timeline (the app benchmark reads it).
      performance.measure('lw-analysis-round-trip', { start: started });
      generation.value++;
      // Not awaited: an edit made meanwhile is drained (and sent to the worker) at once.
      warming = first;
      if (warming) void warmUp(spec, ticket);
    } catch (cause) {
      if (ticket !== latest) return;
      error.value = errorText(cause);
    } finally {
      if (ticket === latest && !warming) running.value = false;
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
   * Runs the path of an edit with the spec on screen, WARM_UP_PASSES times, each after the frame that
   * painted the last; stops as soon as anything was asked for since `ticket`, whose status it then leaves
   * to that request.
   */
  async function warmUp(spec: LoopSpec, ticket: number): Promise<void> {
    try {
      for (let pass = 0; pass < WARM_UP_PASSES; pass++) {
        await afterPaint();
        if (ticket !== latest) return;
        const { output } = await analysisWorker().run('analyze', spec, null);
        if (ticket !== latest) return;
        result.value = output;
      }
    } catch {
      // The same spec was analysed a moment ago: a failure now is the next request's to report.
    } finally {
      if (ticket === latest) running.value = false;
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
