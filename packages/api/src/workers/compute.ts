/**
 * The CPU-heavy work of the API, run inside worker threads (services/compute.ts) so requests on the
 * main event loop stay fast. Plain data in, plain data out; validation failures are returned, not
 * thrown, because an Error crossing the thread boundary keeps only its message.
 */
import { threadId } from 'node:worker_threads';
import { tryAnalyzeDesign, type AnalysisResult, type SpecIssue } from '@loopwright/dsp';

export type ComputeTask = { readonly kind: 'analysis'; readonly spec: unknown };

/** threadId says which thread computed (0 is the main thread), for the tests and the log. */
export type ComputeOutcome = { readonly threadId: number } & (
  | { readonly ok: true; readonly kind: 'analysis'; readonly analysis: AnalysisResult }
  | { readonly ok: false; readonly issues: readonly SpecIssue[] }
);

export function runComputeTask(task: ComputeTask): ComputeOutcome {
  const analysed = tryAnalyzeDesign(task.spec);
  return analysed.ok ? { threadId, ok: true, kind: 'analysis', analysis: analysed.result } : { threadId, ok: false, issues: analysed.issues };
}

export default runComputeTask;
