// Worker-thread entry for Piscina. Plain JavaScript on purpose: it registers tsx's ESM loader inside
// this thread (loader hooks of the parent do not reach worker threads under Vitest), then loads the
// TypeScript task module.
import { register } from 'tsx/esm/api';

register();
const { runComputeTask } = await import('./compute.ts');

export default runComputeTask;
