/**
 * Talks to a DSP worker: numbered jobs, progress callbacks, cancellation. A job the worker
 * cannot stop in time (its loop never yields) is ended by restarting the worker.
 */
import type { LoopSpec } from '@loopwright/dsp';
import type { FromWorker, ToWorker } from './protocol.ts';
import type { DspJobInput, DspJobKind, DspJobOutput } from './dspJobs.ts';

export interface JobOptions {
  readonly onProgress?: (fraction: number, label?: string) => void;
  readonly signal?: AbortSignal;
}

export interface JobResult<T> {
  readonly output: T;
  readonly elapsedMs: number;
}

export class JobCancelledError extends Error {
  constructor() {
    super('Cancelled');
    this.name = 'JobCancelledError';
  }
}

interface Pending {
  resolve(result: JobResult<unknown>): void;
  reject(error: Error): void;
  onProgress?: (fraction: number, label?: string) => void;
  /** Cancel was asked for: a result that still arrives is dropped, as the person asked. */
  cancelled?: boolean;
}

export type WorkerFactory = () => Worker;

export interface DspClientOptions {
  /** Each worker this client starts warms up as it starts (jobServer.ts), off the first job's path. */
  readonly warmUp?: boolean;
}

/** How long a cancelled job may take to stop before its worker is restarted. */
const CANCEL_GRACE_MS = 400;

export class DspClient {
  private worker: Worker | null = null;
  private nextId = 1;
  private readonly pending = new Map<number, Pending>();

  constructor(
    private readonly factory: WorkerFactory,
    private readonly options: DspClientOptions = {},
  ) {}

  /** Starts the worker now, before any job, so its start (and warm-up) is done when the first job comes. */
  start(): void {
    this.ensureWorker();
  }

  run<K extends DspJobKind>(job: K, spec: LoopSpec, input: DspJobInput<K>, options: JobOptions = {}): Promise<JobResult<DspJobOutput<K>>> {
    const id = this.nextId++;
    const worker = this.ensureWorker();
    return new Promise<JobResult<DspJobOutput<K>>>((resolve, reject) => {
      if (options.signal?.aborted) {
        reject(new JobCancelledError());
        return;
      }
      const entry: Pending = { resolve: resolve as Pending['resolve'], reject };
      if (options.onProgress) entry.onProgress = options.onProgress;
      this.pending.set(id, entry);
      options.signal?.addEventListener('abort', () => this.cancel(id), { once: true });
      const message: ToWorker = { type: 'run', id, job, spec, input };
      worker.postMessage(message);
    });
  }

  dispose(): void {
    this.worker?.terminate();
    this.worker = null;
    for (const entry of this.pending.values()) entry.reject(new JobCancelledError());
    this.pending.clear();
  }

  private cancel(id: number): void {
    const asked = this.pending.get(id);
    if (!asked) return;
    asked.cancelled = true;
    this.worker?.postMessage({ type: 'cancel', id } satisfies ToWorker);
    setTimeout(() => {
      const entry = this.pending.get(id);
      if (!entry) return;
      // The job did not notice the signal: restart the worker; other jobs on it fail as cancelled.
      this.dispose();
    }, CANCEL_GRACE_MS);
  }

  private ensureWorker(): Worker {
    if (this.worker) return this.worker;
    const worker = this.factory();
    worker.addEventListener('message', (event: MessageEvent<FromWorker>) => this.receive(event.data));
    worker.addEventListener('error', (event) => this.fail(event.message || 'The analysis worker stopped'));
    this.worker = worker;
    if (this.options.warmUp) worker.postMessage({ type: 'warmUp' } satisfies ToWorker);
    return worker;
  }

  private receive(message: FromWorker): void {
    const entry = this.pending.get(message.id);
    if (!entry) return;
    if (message.type === 'progress') {
      entry.onProgress?.(message.fraction, message.label);
      return;
    }
    this.pending.delete(message.id);
    if (message.type === 'done' && !entry.cancelled) {
      entry.resolve({ output: message.output, elapsedMs: message.elapsedMs });
      return;
    }
    entry.reject(message.type === 'done' || message.cancelled ? new JobCancelledError() : new Error(message.message));
  }

  private fail(message: string): void {
    for (const entry of this.pending.values()) entry.reject(new Error(message));
    this.pending.clear();
    this.worker = null;
  }
}

const createWorker: WorkerFactory = () =>
  new Worker(new URL('./analysis.worker.ts', import.meta.url), { type: 'module', name: 'loopwright-dsp' });

let analysisClient: DspClient | null = null;
let jobClient: DspClient | null = null;
let secondJobClient: DspClient | null = null;

/**
 * The worker for analysis on every keystroke (kept free of long simulations). It warms up as it
 * starts, and main.ts starts it with the page, so it is warm by the time a design has loaded.
 */
export function analysisWorker(): DspClient {
  analysisClient ??= new DspClient(createWorker, { warmUp: true });
  return analysisClient;
}

/** A second worker for simulations and word-length searches, so analysis stays live meanwhile. */
export function jobWorker(): DspClient {
  jobClient ??= new DspClient(createWorker);
  return jobClient;
}

/**
 * The job workers a simulation may use: a second one where the machine has a second core, so a
 * 'both' run's two loops run side by side (splitSimulation.ts).
 */
export function simulationWorkers(): readonly [DspClient, DspClient?] {
  if ((globalThis.navigator?.hardwareConcurrency ?? 1) < 2) return [jobWorker()];
  secondJobClient ??= new DspClient(createWorker);
  return [jobWorker(), secondJobClient];
}
