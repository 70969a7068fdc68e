/**
 * Keeps a set of child processes running: each one is started, waited for until it serves, and
 * started again when it dies. A process that dies before it ever served is failing to start, not
 * crashing: after a few such attempts in a row the supervisor gives up and stops everything, instead
 * of looping. Stopping ends the processes in the reverse order they were added (the balancer before
 * the processes behind it), each with its stop signal and then SIGKILL after a grace period.
 */
import type { ChildProcess } from 'node:child_process';
import { isListeningMessage } from './messages.ts';

export interface SlotSpec {
  /** Shown in logs and given to the process (`api-1`, `nginx`). */
  readonly name: string;
  /** Starts the process (again). */
  start(): ChildProcess | Promise<ChildProcess>;
  /** Resolves once the process serves; rejects if it cannot (it exited, or took too long). */
  ready(child: ChildProcess): Promise<void>;
  readonly stopSignal?: NodeJS.Signals;
}

/** Start attempts in a row that may fail before the supervisor gives up. */
const START_ATTEMPTS = 3;
const RETRY_DELAY_MS = 1_000;
const STOP_GRACE_MS = 6_000;

interface Slot {
  readonly spec: SlotSpec;
  child: ChildProcess;
}

function stopSignalOf(spec: SlotSpec): NodeJS.Signals {
  return spec.stopSignal ?? 'SIGTERM';
}

export class Supervisor {
  private readonly slots: Slot[] = [];
  /** Processes started but not yet serving: a stop must end these too, or they outlive the supervisor. */
  private readonly starting = new Map<ChildProcess, SlotSpec>();
  /** The stops a stop() began of processes that were still starting. */
  private readonly ending = new Map<ChildProcess, Promise<void>>();
  /** Start-ups under way (first starts and restarts); a stop waits for them to give up. */
  private readonly startUps = new Set<Promise<unknown>>();
  private stopping: Promise<void> | undefined;

  constructor(
    private readonly log: (message: string) => void,
    /** Called once when a process cannot be (re)started; the supervisor has stopped the others. */
    private readonly onFatal: (message: string) => void,
  ) {}

  /** Starts each process and waits until all of them serve; throws (having started nothing lasting) if one cannot. */
  async add(specs: readonly SlotSpec[]): Promise<void> {
    const results = await Promise.allSettled(
      specs.map(async (spec) => {
        const slot: Slot = { spec, child: await this.tracked(this.startUntilReady(spec)) };
        // Registered as soon as it serves, so stop() ends it even when a sibling fails to start.
        this.slots.push(slot);
        this.watch(slot);
      }),
    );
    const failure = results.find((r): r is PromiseRejectedResult => r.status === 'rejected');
    if (failure) throw failure.reason;
  }

  get running(): readonly { name: string; pid: number | undefined }[] {
    return this.slots.map((s) => ({ name: s.spec.name, pid: s.child.pid }));
  }

  stop(): Promise<void> {
    this.stopping ??= (async () => {
      // A stop can come while a process is still starting (a SIGTERM during start-up, or just after a
      // crash): end it, and wait until its start-up has given up, before ending the serving ones.
      for (const [child, spec] of this.starting) this.ending.set(child, stopChild(child, stopSignalOf(spec)));
      await Promise.allSettled([...this.startUps]);
      for (const slot of [...this.slots].reverse()) await stopChild(slot.child, stopSignalOf(slot.spec));
    })();
    return this.stopping;
  }

  private async startUntilReady(spec: SlotSpec): Promise<ChildProcess> {
    let lastError = '';
    for (let attempt = 1; attempt <= START_ATTEMPTS; attempt += 1) {
      if (this.stopping) throw notStarted(spec);
      const child = await spec.start();
      const failure = await this.readyOrFailure(spec, child);
      if (this.stopping) {
        // It may have come up meanwhile: end it like a serving one, once, before giving up.
        await (this.ending.get(child) ?? stopChild(child, stopSignalOf(spec)));
        this.ending.delete(child);
        throw notStarted(spec);
      }
      if (!failure) return child;
      lastError = failure.message;
      await stopChild(child, 'SIGKILL');
      this.log(`${spec.name} did not start (attempt ${attempt} of ${START_ATTEMPTS}): ${lastError}`);
      if (attempt < START_ATTEMPTS) await new Promise((resolve) => setTimeout(resolve, RETRY_DELAY_MS));
    }
    throw new Error(`${spec.name} could not be started: ${lastError}`);
  }

  /** Waits until the child serves (undefined) or cannot (the error); a stop meanwhile ends the wait. */
  private async readyOrFailure(spec: SlotSpec, child: ChildProcess): Promise<Error | undefined> {
    if (this.stopping) return undefined;
    this.starting.set(child, spec);
    try {
      await spec.ready(child);
      return undefined;
    } catch (err) {
      return err as Error;
    } finally {
      this.starting.delete(child);
    }
  }

  private tracked<T>(startUp: Promise<T>): Promise<T> {
    this.startUps.add(startUp);
    const settled = () => this.startUps.delete(startUp);
    startUp.then(settled, settled);
    return startUp;
  }

  private watch(slot: Slot): void {
    slot.child.once('exit', (code, signal) => {
      if (this.stopping) return;
      this.log(`${slot.spec.name} (pid ${slot.child.pid}) exited (${signal ?? `code ${code}`}); starting it again`);
      this.tracked(this.startUntilReady(slot.spec)).then(
        (child) => {
          slot.child = child;
          this.log(`${slot.spec.name} is back (pid ${child.pid})`);
          this.watch(slot);
        },
        (err: unknown) => {
          if (this.stopping) return;
          void this.stop().then(() => this.onFatal((err as Error).message));
        },
      );
    });
  }
}

function notStarted(spec: SlotSpec): Error {
  return new Error(`${spec.name}: not started, the server is stopping`);
}

function hasExited(child: ChildProcess): boolean {
  return child.exitCode !== null || child.signalCode !== null;
}

function stopChild(child: ChildProcess, signal: NodeJS.Signals): Promise<void> {
  if (hasExited(child) || child.pid === undefined) return Promise.resolve();
  return new Promise((resolve) => {
    const timer = setTimeout(() => child.kill('SIGKILL'), STOP_GRACE_MS);
    child.once('exit', () => {
      clearTimeout(timer);
      resolve();
    });
    child.kill(signal);
  });
}

/** Rejects when the child exits first, or after `timeoutMs`. */
function exitOrTimeout(child: ChildProcess, what: string, timeoutMs: number): { promise: Promise<never>; cancel(): void } {
  let timer: NodeJS.Timeout | undefined;
  let onExit: ((code: number | null, signal: NodeJS.Signals | null) => void) | undefined;
  const promise = new Promise<never>((_, reject) => {
    onExit = (code, signal) => reject(new Error(`exited (${signal ?? `code ${code}`}) before ${what}`));
    child.once('exit', onExit);
    timer = setTimeout(() => reject(new Error(`not ${what} within ${Math.round(timeoutMs / 1000)} s`)), timeoutMs);
  });
  return {
    promise,
    cancel() {
      clearTimeout(timer);
      if (onExit) child.off('exit', onExit);
    },
  };
}

/** The port a serving process (src/serve.ts) reports over IPC once it listens. */
export async function listeningPort(child: ChildProcess, timeoutMs: number): Promise<number> {
  const failed = exitOrTimeout(child, 'it listened', timeoutMs);
  let onMessage: ((message: unknown) => void) | undefined;
  try {
    return await Promise.race([
      new Promise<number>((resolve) => {
        onMessage = (message) => {
          if (isListeningMessage(message)) resolve(message.port);
        };
        child.on('message', onMessage);
      }),
      failed.promise,
    ]);
  } finally {
    failed.cancel();
    if (onMessage) child.off('message', onMessage);
  }
}

/**
 * Resolves once `check` holds, polling every 100 ms, for a process that says nothing over IPC (nginx);
 * rejects when the process exits first or after `timeoutMs`.
 */
export async function pollUntil(child: ChildProcess, what: string, timeoutMs: number, check: () => Promise<boolean>): Promise<void> {
  const failed = exitOrTimeout(child, what, timeoutMs);
  failed.promise.catch(() => {});
  try {
    for (;;) {
      if (hasExited(child)) throw new Error(`exited (${child.signalCode ?? `code ${child.exitCode}`}) before ${what}`);
      if (await check()) return;
      await Promise.race([new Promise((resolve) => setTimeout(resolve, 100)), failed.promise]);
    }
  } finally {
    failed.cancel();
  }
}
