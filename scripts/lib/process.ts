/**
 * Shutdown bookkeeping for the long-running scripts: whatever a script starts registers how to stop
 * it, and Ctrl-C, SIGTERM or a normal end stop everything in reverse order, once.
 */
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');

type Cleanup = () => Promise<void> | void;
const cleanups: Cleanup[] = [];
let shuttingDown: Promise<void> | undefined;

export function onShutdown(cleanup: Cleanup): void {
  cleanups.push(cleanup);
}

export function shutdown(): Promise<void> {
  shuttingDown ??= (async () => {
    for (const cleanup of cleanups.reverse()) {
      try {
        await cleanup();
      } catch (err) {
        process.stderr.write(`loopwright: while stopping: ${(err as Error).message}\n`);
      }
    }
  })();
  return shuttingDown;
}

for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP'] as const) {
  process.on(signal, () => {
    void shutdown().then(() => process.exit(130));
  });
}
