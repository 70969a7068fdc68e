/**
 * The worker side of the DSP protocol (protocol.ts), apart from the Worker global so a test can
 * serve jobs in-process: runs each job with an abort signal the matching cancel aborts, posts its
 * progress, and posts the output moving the buffers it may move (movableBuffers.ts).
 */
import type { FromWorker, ToWorker } from './protocol.ts';
import { MOVABLE_OUTPUT_JOBS, runDspJob } from './dspJobs.ts';
import { movableBuffers } from './movableBuffers.ts';
import { errorText } from '../lib/errorText.ts';

export type PostToPage = (message: FromWorker, transfer: Transferable[]) => void;

export function dspJobServer(post: PostToPage): (message: ToWorker) => void {
  const running = new Map<number, AbortController>();
  async function run(message: Extract<ToWorker, { type: 'run' }>): Promise<void> {
    const controller = new AbortController();
    running.set(message.id, controller);
    const started = performance.now();
    try {
      const output = await runDspJob(message.job, message.spec, message.input, {
        signal: controller.signal,
        onProgress: (fraction, label) => post({ type: 'progress', id: message.id, fraction, ...(label ? { label } : {}) }, []),
      });
      post({ type: 'done', id: message.id, output, elapsedMs: performance.now() - started }, MOVABLE_OUTPUT_JOBS.has(message.job) ? movableBuffers(output) : []);
    } catch (cause) {
      const cancelled = controller.signal.aborted;
      post({ type: 'failed', id: message.id, message: cancelled ? 'Cancelled' : errorText(cause), cancelled }, []);
    } finally {
      running.delete(message.id);
    }
  }
  return (message) => {
    if (message.type === 'cancel') running.get(message.id)?.abort();
    else void run(message);
  };
}
