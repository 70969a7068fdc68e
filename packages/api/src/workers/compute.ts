/**
 * The CPU-heavy work of the API, run inside worker threads (services/compute.ts) so requests on the
 * main event loop stay fast. Plain data in, plain data out; validation failures are returned, not
 * thrown, because an Error crossing the thread boundary keeps only its message.
 */
import { threadId, type MessagePort } from 'node:worker_threads';
import {
  FieldError,
  measurePlanAcquisition,
  isScenarioField,
  parseScenario,
  simulatePlan,
  tryPlanDesign,
  type AcquisitionComparison,
  type AnalysisResult,
  type SimOptions,
  type SimResult,
  type SpecIssue,
  warmupSequence,
  warmupSimulations,
} from '@loopwright/dsp';
import { encodeJson } from '../encodedJson.ts';
import { runHandoffTask, type HandoffOutcome, type HandoffTask } from './handoffTasks.ts';
import { movingBytes } from './movedBytes.ts';
import { mapSimParts, type EncodedSimParts } from './simHalves.ts';

export interface SimulationTask {
  readonly kind: 'simulation';
  /** A stored design's spec or a request body's (planned here, so parsed once more as it enters dsp). */
  readonly spec: unknown;
  readonly scenario: unknown;
  readonly options: Pick<SimOptions, 'mode' | 'buckets'>;
  /**
   * A half of a split 'both' run (services/compute.ts runSimulation): the answer is the result's
   * members, each run and the plan encoded on their own, for mergeSimResults on the event loop's thread.
   */
  readonly half?: boolean;
}

export type ComputeTask =
  | HandoffTask
  | { readonly kind: 'analysis'; readonly spec: unknown }
  | SimulationTask
  | {
      readonly kind: 'acquisition';
      readonly spec: unknown;
      /** Where the fraction done is posted (a number in (0, 1]) while the search runs; transferred in. */
      readonly progress?: MessagePort;
    };

export type ComputeFailure = { readonly ok: false; readonly issues: readonly SpecIssue[]; readonly prefix: 'spec' | 'scenario' };

/** threadId says which thread computed (0 is the main thread), for the tests and the log. */
export type ComputeOutcome = { readonly threadId: number } & (
  | HandoffOutcome
  | { readonly ok: true; readonly kind: 'analysis'; readonly analysis: AnalysisResult }
  /** The SimResult as UTF-8 JSON (encodedJson.ts): encoded here so the event loop only sends the bytes. */
  | {
      readonly ok: true;
      readonly kind: 'simulation';
      readonly simulationJson: Uint8Array;
      /** The threads of a split run's halves, float then bit-true (absent when one thread ran both). */
      readonly halvesOn?: readonly [number, number];
    }
  | { readonly ok: true; readonly kind: 'simulationHalf'; readonly half: EncodedSimParts }
  | { readonly ok: true; readonly kind: 'acquisition'; readonly acquisition: AcquisitionComparison }
  | ComputeFailure
);

/** Every task plans its spec (planDesign) and reads what it needs from that one result; a release is planned with its golden vectors (render/compute.ts). */
export function runComputeTask(task: ComputeTask): ComputeOutcome {
  if (task.kind === 'release' || task.kind === 'conformance') return withMovedFiles({ threadId, ...runHandoffTask(task) });
  const planned = task.kind === 'simulation' ? plannedForSimulation(task.spec) : tryPlanDesign(task.spec);
  if (!planned.ok) return { threadId, ok: false, issues: planned.issues, prefix: 'spec' };
  if (task.kind === 'analysis') return { threadId, ok: true, kind: 'analysis', analysis: planned.plan.analysis };
  if (task.kind === 'acquisition') return { threadId, ok: true, kind: 'acquisition', acquisition: acquisitionOf(planned.plan, task.progress) };
  const scenario = parseScenario(task.scenario);
  if (!scenario.ok) return { threadId, ok: false, issues: scenario.issues, prefix: 'scenario' };
  try {
    const result = simulatePlan(planned.plan, scenario.scenario, task.options);
    if (task.half) return encodedHalf(result);
    return { threadId, ok: true, kind: 'simulation', simulationJson: encodeJson(result) };
  } catch (err) {
    // Checks that need the spec and the scenario together (the input band, the record size) throw.
    if (err instanceof FieldError) return fieldFailure(err);
    throw err;
  }
}

/**
 * The last simulated spec's plan, kept by this thread: a split run plans its spec in both halves, and
 * a design is simulated again and again under other scenarios, each time re-planned (about 1.4 ms of
 * a core on the mains demo). planDesign is a pure function of the spec and its plan is frozen
 * (planDesign.ts deepFreeze), so the kept plan is the one a fresh planning would give; any other spec,
 * down to one bit of one number or the order of its members, is planned afresh.
 */
let lastSimulated: { readonly key: string; readonly planned: Extract<ReturnType<typeof tryPlanDesign>, { ok: true }> } | null = null;

function plannedForSimulation(spec: unknown): ReturnType<typeof tryPlanDesign> {
  const key = plainKey(spec);
  if (key !== null && lastSimulated?.key === key) return lastSimulated.planned;
  const planned = tryPlanDesign(spec);
  if (key !== null && planned.ok) lastSimulated = { key, planned };
  return planned;
}

/**
 * Text that tells plain data apart exactly (−0, NaN and the infinities, undefined members, member
 * order); null for anything else (a Date, a typed array), which is never kept.
 */
function plainKey(value: unknown): string | null {
  if (value === null) return 'N';
  switch (typeof value) {
    case 'number':
      return Object.is(value, -0) ? 'n-0' : `n${value}`;
    case 'string':
      return JSON.stringify(value);
    case 'boolean':
      return value ? 'T' : 'F';
    case 'undefined':
      return 'U';
    case 'object':
      break;
    default:
      return null;
  }
  const parts: string[] = [];
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const k = plainKey(value[i]);
      if (k === null) return null;
      parts.push(k);
    }
    return `[${parts.join(',')}]`;
  }
  if (Object.getPrototypeOf(value) !== Object.prototype) return null;
  for (const [name, member] of Object.entries(value as Record<string, unknown>)) {
    const k = plainKey(member);
    if (k === null) return null;
    parts.push(`${JSON.stringify(name)}:${k}`);
  }
  return `{${parts.join(',')}}`;
}

/** A rendered release's file bytes go to the event loop's thread moved, not copied (movedBytes.ts). */
function withMovedFiles(outcome: ComputeOutcome): ComputeOutcome {
  return outcome.ok && outcome.kind === 'release' ? movingBytes(outcome, outcome.rendered.files.map((f) => f.bytes)) : outcome;
}

/**
 * The JSON of the last bit-true plan a half answered with: the plan of a kept spec (plannedForSimulation)
 * is the same frozen object run after run, so its text is too (54 kB of the mains demo, 0.4 ms of
 * the slower half to encode); each answer gets a copy, since the answer's bytes are moved away.
 */
let lastPlanJson: { readonly plan: object; readonly bytes: Uint8Array } | null = null;

function encodedMember(member: unknown, plan: unknown): Uint8Array {
  if (member !== plan || typeof plan !== 'object' || plan === null || !Object.isFrozen(plan)) return encodeJson(member);
  if (lastPlanJson?.plan !== plan) lastPlanJson = { plan, bytes: encodeJson(plan) };
  return lastPlanJson.bytes.slice();
}

/** The members of a half run, its run and plan encoded here and moved to the event loop's thread. */
function encodedHalf(result: SimResult): ComputeOutcome {
  const half: EncodedSimParts = mapSimParts(result, (member) => encodedMember(member, result.plan));
  const bytes = [half.float, half.bitTrue, half.plan].filter((b): b is Uint8Array => b !== undefined);
  return movingBytes({ threadId, ok: true, kind: 'simulationHalf', half }, bytes);
}

/** Estimates beside the measurement; progress is posted at most every 2 % so the port stays quiet. */
function acquisitionOf(plan: Parameters<typeof simulatePlan>[0], port: MessagePort | undefined): AcquisitionComparison {
  let sent = 0;
  const onProgress = port
    ? (fraction: number) => {
        if (fraction - sent < 0.02 && fraction < 1) return;
        sent = fraction;
        port.postMessage(fraction);
      }
    : undefined;
  try {
    return measurePlanAcquisition(plan, onProgress ? { onProgress } : {});
  } finally {
    port?.close();
  }
}

function fieldFailure(err: FieldError): ComputeFailure & { readonly threadId: number } {
  return { threadId, ok: false, issues: [{ field: err.field, message: err.message }], prefix: isScenarioField(err.field) ? 'scenario' : 'spec' };
}

/**
 * Analyses the warm-up specs (dsp warmupSequence: every filter kind and the other branches a spec can
 * take, WARMUP_PASSES times), then runs dsp's warm-up simulations (every scenario kind, as one task
 * and, the first, as the two halves of a split run), each as a task would, and drops the answers, so
 * this thread's first real analysis or simulation runs compiled code (the dsp bench's started-thread
 * first call). No demo spec is among them.
 */
export function warmUpComputeThread(): void {
  for (const spec of warmupSequence) runComputeTask({ kind: 'analysis', spec });
  warmupSimulations.forEach(({ spec, scenario }, i) => {
    const task: SimulationTask = { kind: 'simulation', spec, scenario, options: { mode: 'both' } };
    runComputeTask(task);
    if (i === 0) for (const mode of ['float', 'bit-true'] as const) runComputeTask({ ...task, options: { mode }, half: true });
  });
}

export default runComputeTask;
