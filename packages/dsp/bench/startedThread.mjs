// Worker-thread entry of the started-thread first-call figure (analysis.ts): registers tsx's ESM
// loader inside the thread and loads the TypeScript body, as the API's compute threads do
// (packages/api/src/workers/compute.worker.mjs).
import { register } from 'tsx/esm/api';

register();
await import('./startedThread.ts');
