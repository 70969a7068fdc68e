/**
 * A simulation on the job workers. A 'both' run is a float and a bit-true loop that share only their
 * input (mergeSimResults, packages/dsp), so with a second worker each loop runs in one, on its own
 * core, and the run takes as long as the slower loop instead of the two together.
 */
import { mergeSimResults, type LoopSpec, type Scenario } from '@loopwright/dsp';
import { JobCancelledError, type DspClient, type JobOptions, type JobResult } from './dspClient.ts';
import type { SimulationOutput } from './dspJobs.ts';

/**
 * With one worker the run is one job; with two, one half each, merged. Cancelling stops both halves;
 * a half that fails stops the other, and the error is the float half's before the bit-true half's
 * (the checks the one-job run makes first), a cancellation only when nothing else failed.
 */
export async function simulateOn(workers: readonly [DspClient, DspClient?], spec: LoopSpec, scenario: Scenario, options: JobOptions = {}): Promise<JobResult<SimulationOutput>> {
  const [first, second] = workers;
  if (!second) return first.run('simulate', spec, scenario, options);
  const stop = new AbortController();
  const { signal } = options;
  if (signal?.aborted) throw new JobCancelledError();
  signal?.addEventListener('abort', () => stop.abort(), { once: true });
  // The run is as far along as its slower half.
  const fractions = [0, 0];
  const half = (client: DspClient, mode: 'float' | 'bit-true', k: 0 | 1) =>
    client
      .run('simulateHalf', spec, { scenario, mode }, {
        signal: stop.signal,
        onProgress: (fraction) => {
          fractions[k] = fraction;
          options.onProgress?.(Math.min(...fractions));
        },
      })
      .catch((cause: unknown) => {
        stop.abort();
        throw cause;
      });
  const settled = await Promise.allSettled([half(first, 'float', 0), half(second, 'bit-true', 1)]);
  if (signal?.aborted) throw new JobCancelledError();
  const failed = settled.find((s) => s.status === 'rejected' && !(s.reason instanceof JobCancelledError)) ?? settled.find((s) => s.status === 'rejected');
  if (failed) throw (failed as PromiseRejectedResult).reason;
  const [float, bitTrue] = settled.map((s) => (s as PromiseFulfilledResult<JobResult<SimulationOutput>>).value) as [JobResult<SimulationOutput>, JobResult<SimulationOutput>];
  return {
    output: { result: mergeSimResults(float.output.result, bitTrue.output.result), offsetHz: float.output.offsetHz },
    elapsedMs: Math.max(float.elapsedMs, bitTrue.elapsedMs),
  };
}
