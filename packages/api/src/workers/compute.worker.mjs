// Worker-thread entry for Piscina. Plain JavaScript on purpose: it registers tsx's ESM loader inside
// this thread (loader hooks of the parent do not reach worker threads under Vitest), then loads the
// TypeScript task module. A warm pool's thread warms up here: Piscina hands it no task before this
// module has loaded, so a task sent meanwhile waits for the warm-up.
import { workerData } from 'node:worker_threads';
import { register } from 'tsx/esm/api';

register();
const { runComputeTask, warmUpComputeThread } = await import('./compute.ts');
if (workerData?.warmUp === true) warmUpComputeThread();

export default runComputeTask;
