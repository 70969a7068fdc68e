import { availableParallelism } from 'node:os';
import type { MessagePort } from 'node:worker_threads';
import { Piscina } from 'piscina';
import { mergeSimResults } from '@loopwright/dsp';
import type { ComputeOutcome, ComputeTask, SimulationTask } from '../workers/compute.ts';
import { mapSimParts } from '../workers/simHalves.ts';
import { encodedJsonOf, encodedObject } from '../encodedJson.ts';
import { AppError } from '../errors.ts';

const WORKER_URL = new URL('../workers/compute.worker.mjs', import.meta.url).href;

export interface ComputePoolOptions {
  readonly threads: number;
  /** Longest a task may run before its worker is terminated. */
  readonly timeoutMs: number;
  /** Tasks waiting beyond this are refused with 503 rather than queued without bound. */
  readonly maxQueue: number;
  /**
   * Lowers each thread's scheduling priority by this much (Piscina's niceIncrement through
   * @napi-rs/nice; on Linux nice() applies to the calling thread only, so the event loop keeps its
   * own). Default 0.
   */
  readonly niceIncrement?: number;
  /**
   * Start every thread with the pool and keep it: each runs the start-up warm-up (workers/compute.ts
   * warmUpComputeThread) before it takes a task, so the first analysis of a user's spec meets
   * compiled code instead of paying the thread's start and the engine's first compiles. A task sent
   * meanwhile waits for the warm-up and is answered as on a cold thread. Default false: threads start
   * on first use and idle ones exit.
   */
  readonly warm?: boolean;
}

/**
 * A Piscina pool of worker threads for analyses and simulations. Threads start on first use and
 * idle ones exit, so tests and short runs pay nothing until they compute; a `warm` pool (the
 * server's) starts them all at once, warms them up, and keeps them.
 */
export class ComputePool {
  private readonly pool: Piscina<ComputeTask, ComputeOutcome>;
  private readonly maxThreads: number;
  /** Tasks handed to the pool and not yet settled, running or queued. */
  private inFlight = 0;

  constructor(private readonly options: ComputePoolOptions) {
    this.maxThreads = Math.max(1, Math.min(options.threads, availableParallelism()));
    this.pool = new Piscina({
      filename: WORKER_URL,
      minThreads: options.warm ? this.maxThreads : 0,
      maxThreads: this.maxThreads,
      workerData: { warmUp: options.warm === true },
      idleTimeout: 30_000,
      maxQueue: options.maxQueue,
      niceIncrement: options.niceIncrement ?? 0,
    });
  }

  /**
   * `cancel` (e.g. the client went away) stops the task; so does the time limit. `transfer` lists the
   * task's MessagePorts (a progress channel), which move to the worker thread.
   */
  async run(task: ComputeTask, cancel?: AbortSignal, transfer?: readonly MessagePort[]): Promise<ComputeOutcome> {
    if (this.pool.queueSize >= this.options.maxQueue) {
      throw new AppError('server_busy', 'the server is busy computing; try again shortly', 503);
    }
    const timeout = AbortSignal.timeout(this.options.timeoutMs);
    const signal = cancel ? AbortSignal.any([timeout, cancel]) : timeout;
    this.inFlight++;
    try {
      return await this.pool.run(task, transfer ? { signal, transferList: [...transfer] } : { signal });
    } catch (err) {
      if (timeout.aborted) {
        throw new AppError('timeout', `the computation took longer than ${Math.round(this.options.timeoutMs / 1000)} s and was stopped`, 503);
      }
      throw err;
    } finally {
      this.inFlight--;
    }
  }

  /**
   * A simulation. A 'both' run is its float and its bit-true loop, which share only their input
   * (mergeSimResults), so when two threads are idle it runs as two tasks, one loop each, on two
   * cores, merged here into the bytes the one task would have sent. Otherwise, and whenever a task
   * waits, it is one task as before: a half only starts on an idle thread, so it never takes a queue
   * place and a full queue refuses what it refused before. Cancelling stops both halves; a half that
   * fails stops the other, and the answer is the first failure (a field failure before a thrown one,
   * the float half's before the bit-true half's: the checks the sequential run makes first).
   */
  async runSimulation(task: SimulationTask, cancel?: AbortSignal): Promise<ComputeOutcome> {
    if ((task.options.mode ?? 'both') !== 'both' || this.maxThreads - this.inFlight < 2) return this.run(task, cancel);
    const stop = new AbortController();
    const signal = cancel ? AbortSignal.any([cancel, stop.signal]) : stop.signal;
    let thrown: { readonly error: unknown } | null = null;
    const half = (mode: 'float' | 'bit-true') =>
      this.run({ ...task, options: { ...task.options, mode }, half: true }, signal).then(
        (outcome) => {
          if (!outcome.ok) stop.abort();
          return outcome;
        },
        (error: unknown) => {
          thrown ??= { error };
          stop.abort();
          throw error;
        },
      );
    const settled = await Promise.allSettled([half('float'), half('bit-true')]);
    const outcomes = settled.flatMap((s) => (s.status === 'fulfilled' ? [s.value] : []));
    const failure = outcomes.find((o) => !o.ok);
    if (failure) return failure;
    if (thrown) throw (thrown as { readonly error: unknown }).error;
    const [floatHalf, bitTrueHalf] = outcomes.map((o) => {
      if (!o.ok || o.kind !== 'simulationHalf') throw new Error('compute pool answered a simulation half with another kind');
      return o;
    }) as [Extract<ComputeOutcome, { kind: 'simulationHalf' }>, Extract<ComputeOutcome, { kind: 'simulationHalf' }>];
    const merged = mergeSimResults(mapSimParts(floatHalf.half, wrap), mapSimParts(bitTrueHalf.half, wrap));
    return { threadId: floatHalf.threadId, ok: true, kind: 'simulation', simulationJson: encodedObject({ ...merged }).bytes, halvesOn: [floatHalf.threadId, bitTrueHalf.threadId] };
  }

  /** Threads the pool may run at once (options.threads, at most the cores). */
  get threadLimit(): number {
    return this.maxThreads;
  }

  get threadCount(): number {
    return this.pool.threads.length;
  }

  async close(): Promise<void> {
    await this.pool.destroy();
  }
}


/** A half's encoded member as EncodedJson, which encodedObject writes as it is. */
const wrap = (bytes: unknown) => encodedJsonOf(bytes as Uint8Array);
