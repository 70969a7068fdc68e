/**
 * The worker side of the DSP protocol (protocol.ts), apart from the Worker global so a test can
 * serve jobs in-process: runs each job with an abort signal the matching cancel aborts, posts its
 * progress, and posts the output moving the buffers it may move (movableBuffers.ts).
 *
 * A warm-up message has the worker analyse dsp's warm-up specs (every filter kind and the other
 * branches a spec can take, WARMUP_PASSES times: warmupSequence; no demo spec) and drop the results,
 * so the first analysis of the user's design meets compiled code instead of the engine's first
 * compile and optimisation of every step (dsp bench: 34-40 ms for a first call in a fresh engine,
 * 1.5-4 ms after the warm-up). One spec per task: a
 * job sent meanwhile waits for one warm-up analysis at most and is answered as it would be without.
 */
import { warmupSequence, type LoopSpec } from '@loopwright/dsp';
import type { FromWorker, ToWorker } from './protocol.ts';
import { MOVABLE_OUTPUT_JOBS, analyzeJob, runDspJob } from './dspJobs.ts';
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
  let warmUps: LoopSpec[] = [];
  function warmUpNext(): void {
    const spec = warmUps.shift();
    if (!spec) return;
    try {
      analyzeJob(spec);
    } catch {
      // Nobody asked for this answer; a real job on the same path reports its own failure.
    }
    if (warmUps.length > 0) setTimeout(warmUpNext, 0);
  }
  return (message) => {
    if (message.type === 'cancel') running.get(message.id)?.abort();
    else if (message.type === 'warmUp') {
      if (warmUps.length > 0) return;
      warmUps = warmupSequence.map((spec) => spec as LoopSpec);
      setTimeout(warmUpNext, 0);
    } else void run(message);
  };
}
