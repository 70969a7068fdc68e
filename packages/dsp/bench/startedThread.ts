/**
 * The body of one started thread (analysis.ts startedThreadFirstCalls): imports the module graph,
 * runs the start-up warm-up the API's compute threads and the editor's worker run (warmupSequence:
 * the warm-up specs WARMUP_PASSES times, results dropped), says it is ready, and on the parent's
 * word makes the first analyzeDesign call of one demo spec. Times are this thread's CPU (Linux
 * /proc/thread-self/schedstat) and wall clock; each CPU reading follows a 1 ms wait so the
 * scheduler has booked the thread's time.
 */
import { readFileSync } from 'node:fs';
import { parentPort, workerData } from 'node:worker_threads';
import { analyzeDesign } from '../src/planDesign.ts';
import { exampleSpecs } from '../src/spec/examples.ts';
import { warmupSequence } from '../src/spec/warmupSpecs.ts';

const pause = new Int32Array(new SharedArrayBuffer(4));
function threadCpuMs(): number {
  Atomics.wait(pause, 0, 0, 1);
  return Number(readFileSync('/proc/thread-self/schedstat', 'utf8').split(' ')[0]) / 1e6;
}

const importedCpuMs = threadCpuMs();
const w0 = performance.now();
for (const spec of warmupSequence) analyzeDesign(spec as Parameters<typeof analyzeDesign>[0]);
const warmUpMs = performance.now() - w0;
const warmUpCpuMs = threadCpuMs() - importedCpuMs;

const example = exampleSpecs.find((e) => e.id === (workerData as { example: string }).example);
if (!example) throw new Error(`unknown example '${String((workerData as { example?: unknown }).example)}'`);
const port = parentPort!;
port.once('message', () => {
  const c0 = threadCpuMs();
  const t0 = performance.now();
  analyzeDesign(example.spec);
  const firstCallMs = performance.now() - t0;
  const firstCallCpuMs = threadCpuMs() - c0;
  port.postMessage({ importCpuMs: importedCpuMs, warmUpMs, warmUpCpuMs, firstCallMs, firstCallCpuMs });
});
port.postMessage('ready');
