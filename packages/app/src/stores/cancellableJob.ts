import { ref } from 'vue';
import { JobCancelledError } from '../workers/dspClient.ts';
import { errorText } from '../lib/errorText.ts';

/**
 * The state every long job in the job worker shares (simulation, word-length search): one run at
 * a time, a new run aborts the one before, and only the newest run may clear `running`, so an
 * aborted run that settles late cannot mark its successor finished. For use inside a setup store.
 */
export function useCancellableJob() {
  const running = ref(false);
  const progress = ref(0);
  const error = ref('');
  let controller: AbortController | null = null;

  /**
   * Runs `job` with a fresh abort signal. A cancellation is not an error: it calls `onCancelled`
   * instead of setting `error`.
   */
  async function start(job: (signal: AbortSignal) => Promise<void>, onCancelled?: () => void): Promise<void> {
    controller?.abort();
    const mine = new AbortController();
    controller = mine;
    running.value = true;
    progress.value = 0;
    error.value = '';
    try {
      await job(mine.signal);
    } catch (cause) {
      if (cause instanceof JobCancelledError) onCancelled?.();
      else error.value = errorText(cause);
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

  return { running, progress, error, start, cancel };
}
