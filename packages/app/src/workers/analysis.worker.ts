/// <reference lib="webworker" />
import type { FromWorker, ToWorker } from './protocol.ts';
import { runDspJob } from './dspJobs.ts';
import { errorText } from '../lib/errorText.ts';

const running = new Map<number, AbortController>();

function post(message: FromWorker): void {
  self.postMessage(message);
}

self.addEventListener('message', (event: MessageEvent<ToWorker>) => {
  const message = event.data;
  if (message.type === 'cancel') {
    running.get(message.id)?.abort();
    return;
  }
  void run(message);
});

async function run(message: Extract<ToWorker, { type: 'run' }>): Promise<void> {
  const controller = new AbortController();
  running.set(message.id, controller);
  const started = performance.now();
  try {
    const output = await runDspJob(message.job, message.spec, message.input, {
      signal: controller.signal,
      onProgress: (fraction, label) => post({ type: 'progress', id: message.id, fraction, ...(label ? { label } : {}) }),
    });
    post({ type: 'done', id: message.id, output, elapsedMs: performance.now() - started });
  } catch (cause) {
    const cancelled = controller.signal.aborted;
    const text = errorText(cause);
    post({ type: 'failed', id: message.id, message: cancelled ? 'Cancelled' : text, cancelled });
  } finally {
    running.delete(message.id);
  }
}
