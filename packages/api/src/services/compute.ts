import { availableParallelism } from 'node:os';
import type { MessagePort } from 'node:worker_threads';
import { Piscina } from 'piscina';
import type { ComputeOutcome, ComputeTask } from '../workers/compute.ts';
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
}

/**
 * A Piscina pool of worker threads for analyses and simulations. Threads start on first use and
 * idle ones exit, so tests and short runs pay nothing until they compute.
 */
export class ComputePool {
  private readonly pool: Piscina<ComputeTask, ComputeOutcome>;

  constructor(private readonly options: ComputePoolOptions) {
    this.pool = new Piscina({
      filename: WORKER_URL,
      minThreads: 0,
      maxThreads: Math.max(1, Math.min(options.threads, availableParallelism())),
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
    try {
      return await this.pool.run(task, transfer ? { signal, transferList: [...transfer] } : { signal });
    } catch (err) {
      if (timeout.aborted) {
        throw new AppError('timeout', `the computation took longer than ${Math.round(this.options.timeoutMs / 1000)} s and was stopped`, 503);
      }
      throw err;
    }
  }

  get threadCount(): number {
    return this.pool.threads.length;
  }

  async close(): Promise<void> {
    await this.pool.destroy();
  }
}
