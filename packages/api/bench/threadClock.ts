/**
 * How long the threads of the bench and of its MariaDB ran and how long they waited for a core, from
 * Linux's /proc/<pid>/task/<tid>/schedstat (three numbers: ns on a CPU, ns runnable on a run queue
 * without a CPU, time slices; the kernel's Documentation/scheduler/sched-stats.rst). On the shared
 * 2-core machine the other users' load shows up as that run-queue wait, so the wall time of a phase
 * less the wait of the threads it ran on is what the phase takes on cores of its own, waits for the
 * disk and the database included (which the process's own CPU time leaves out).
 */
import { readdirSync, readFileSync } from 'node:fs';

export interface ThreadTimes {
  /** ns on a CPU and ns waiting for one, of the calling (main) thread. */
  readonly mainCpuNs: number;
  readonly mainWaitNs: number;
  /** The same summed over every other thread of this process (libuv's pool: file writes, fsync). */
  readonly poolCpuNs: number;
  readonly poolWaitNs: number;
  /** The same summed over every thread of the database server. */
  readonly dbCpuNs: number;
  readonly dbWaitNs: number;
}

function schedstat(file: string): [number, number] {
  try {
    const [cpu, wait] = readFileSync(file, 'utf8').split(' ');
    return [Number(cpu), Number(wait)];
  } catch {
    // A thread that ended between the listing and the read.
    return [0, 0];
  }
}

function taskTotals(pid: number, skip: number): [number, number] {
  let cpu = 0;
  let wait = 0;
  let tasks: string[];
  try {
    tasks = readdirSync(`/proc/${pid}/task`);
  } catch {
    return [0, 0];
  }
  for (const tid of tasks) {
    if (Number(tid) === skip) continue;
    const [c, w] = schedstat(`/proc/${pid}/task/${tid}/schedstat`);
    cpu += c;
    wait += w;
  }
  return [cpu, wait];
}

/** Whether this system keeps the figures (a Linux with schedstat); without them every wait reads 0. */
export const threadClockAvailable = (() => {
  try {
    readFileSync('/proc/thread-self/schedstat', 'utf8');
    return true;
  } catch {
    return false;
  }
})();

export function threadTimes(dbPid: number | undefined): ThreadTimes {
  if (!threadClockAvailable) return { mainCpuNs: 0, mainWaitNs: 0, poolCpuNs: 0, poolWaitNs: 0, dbCpuNs: 0, dbWaitNs: 0 };
  const [mainCpuNs, mainWaitNs] = schedstat('/proc/thread-self/schedstat');
  const [poolCpuNs, poolWaitNs] = taskTotals(process.pid, process.pid);
  const [dbCpuNs, dbWaitNs] = dbPid === undefined ? [0, 0] : taskTotals(dbPid, -1);
  return { mainCpuNs, mainWaitNs, poolCpuNs, poolWaitNs, dbCpuNs, dbWaitNs };
}

/**
 * A phase's time on cores of its own, in ms: its wall time less its main thread's run-queue wait, and
 * less the other threads' wait for the share of the phase the main thread spent blocked on them (the
 * file store's writes, the database's answers). While the main thread computes, the other threads'
 * waits (the garbage collector's helpers, the database's background work) do not hold the phase up,
 * so they are not taken off. Never less than the main thread's CPU time, nor than the CPU time of
 * every thread of both processes spread over `cores` (threads that queue behind each other wait for
 * the phase's own work, not another user's).
 */
export function ownCoresMs(wallMs: number, from: ThreadTimes, to: ThreadTimes, cores: number): number {
  const ms = (ns: number) => ns / 1e6;
  const mainCpu = ms(to.mainCpuNs - from.mainCpuNs);
  const mainWait = ms(to.mainWaitNs - from.mainWaitNs);
  const allCpu = mainCpu + ms(to.poolCpuNs - from.poolCpuNs + to.dbCpuNs - from.dbCpuNs);
  const othersWait = ms(to.poolWaitNs - from.poolWaitNs + to.dbWaitNs - from.dbWaitNs);
  const blocked = wallMs > 0 ? Math.min(1, Math.max(0, 1 - (mainCpu + mainWait) / wallMs)) : 0;
  return Math.max(mainCpu, allCpu / cores, wallMs - mainWait - othersWait * blocked);
}
