/**
 * The supervisor's stop against real child processes (plain `node` that idles until signalled): a
 * stop that comes while a process is still starting, or restarting after a crash, must end that
 * process too before it resolves, or the process outlives the server (the server exits right after).
 * The expectations are the supervisor's contract (common practice for process supervisors, no source).
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { Supervisor, type SlotSpec } from '../src/processes/supervisor.ts';

function idler(): ChildProcess {
  return spawn(process.execPath, ['-e', 'setInterval(() => {}, 1000)'], { stdio: 'ignore' });
}

function exited(child: ChildProcess): boolean {
  return child.exitCode !== null || child.signalCode !== null;
}

/** A slot whose readiness the test decides: `serve()` makes the latest started child ready. */
function gatedSlot(name: string) {
  const started: ChildProcess[] = [];
  let serve: () => void = () => {};
  const spec: SlotSpec = {
    name,
    start: () => {
      const child = idler();
      started.push(child);
      return child;
    },
    ready: (child) =>
      new Promise<void>((resolve, reject) => {
        serve = resolve;
        child.once('exit', () => reject(new Error('exited before it served')));
      }),
  };
  return { spec, started, serve: () => serve() };
}

async function until(check: () => boolean): Promise<void> {
  for (let i = 0; i < 200 && !check(); i += 1) await new Promise((resolve) => setTimeout(resolve, 25));
}

describe('Supervisor.stop', () => {
  it('ends a process that is still starting, and resolves only once it has gone', async () => {
    const supervisor = new Supervisor(() => {}, () => {});
    const slot = gatedSlot('late');
    const adding = supervisor.add([slot.spec]).catch((err: Error) => err);
    await until(() => slot.started.length === 1);
    const stopped = supervisor.stop();
    // It comes up just after the stop began: it must not survive as a serving process nobody stops.
    slot.serve();
    await stopped;
    expect(exited(slot.started[0]!)).toBe(true);
    expect(String(await adding)).toMatch(/late: not started, the server is stopping/);
    expect(supervisor.running).toEqual([]);
  });

  it('ends a process restarting after a crash when the stop comes mid-restart', async () => {
    const supervisor = new Supervisor(() => {}, () => {});
    const slot = gatedSlot('crashy');
    const adding = supervisor.add([slot.spec]);
    await until(() => slot.started.length === 1);
    slot.serve();
    await adding;
    slot.started[0]!.kill('SIGKILL');
    await until(() => slot.started.length === 2);
    await supervisor.stop();
    expect(slot.started.map(exited)).toEqual([true, true]);
  });

  it('ends serving processes in the reverse order they were added', async () => {
    const supervisor = new Supervisor(() => {}, () => {});
    const order: string[] = [];
    const slot = (name: string): SlotSpec => ({
      name,
      start: () => {
        const child = idler();
        child.once('exit', () => order.push(name));
        return child;
      },
      ready: async () => {},
    });
    await supervisor.add([slot('backend')]);
    await supervisor.add([slot('balancer')]);
    await supervisor.stop();
    expect(order).toEqual(['balancer', 'backend']);
  });
});
