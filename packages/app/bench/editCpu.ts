/**
 * Where an edit's time goes, as CPU time of the threads that do the work (Chromium's trace: each
 * task's thread time), which the machine's other load changes far less than the wall-clock figures:
 * the worker's analysis, and the main-thread task that takes its answer, patches the result panels
 * and redraws the Bode plot (ECharts' in-place update and paint).
 */
import type { Page } from 'playwright-core';

interface TraceEvent {
  readonly name: string;
  readonly ph: string;
  readonly pid: number;
  readonly tid: number;
  readonly ts: number;
  readonly dur?: number;
  readonly tdur?: number;
  readonly args?: { readonly name?: string; readonly data?: { readonly type?: string; readonly functionName?: string } };
}

export interface EditCpu {
  /** Thread CPU of the main-thread task that applied each edit's analysis and redrew the plot (ms). */
  readonly redrawTaskMs: number[];
  /** Thread CPU of the analysis worker's tasks between each edit and its redraw (ms). */
  readonly workerMs: number[];
}

/** Runs `edit` for each round under Chromium's tracing and reads the per-edit CPU figures from the trace. */
export async function traceEditCpu(page: Page, rounds: number, edit: (round: number) => Promise<void>): Promise<EditCpu> {
  const cdp = await page.context().newCDPSession(page);
  const events: TraceEvent[] = [];
  // The protocol types each event as a string map; the fields read here are the trace format's.
  cdp.on('Tracing.dataCollected', (batch) => events.push(...(batch.value as unknown as TraceEvent[])));
  await cdp.send('Tracing.start', { categories: 'devtools.timeline,disabled-by-default-devtools.timeline', transferMode: 'ReportEvents' });
  for (let i = 0; i < rounds; i++) await edit(i);
  const complete = new Promise((resolve) => cdp.once('Tracing.tracingComplete', resolve));
  await cdp.send('Tracing.end');
  await complete;
  await cdp.detach();
  return editCpuOf(events);
}

const thread = (e: TraceEvent): string => `${e.pid}:${e.tid}`;
const isTask = (e: TraceEvent): boolean => e.ph === 'X' && e.name === 'RunTask';
const within = (outer: TraceEvent, inner: TraceEvent): boolean => inner.ts >= outer.ts && inner.ts <= outer.ts + (outer.dur ?? 0);

export function editCpuOf(events: readonly TraceEvent[]): EditCpu {
  const names = new Map<string, string>();
  const counts = new Map<string, number>();
  for (const e of events) {
    if (e.ph === 'M' && e.name === 'thread_name' && e.args?.name) names.set(thread(e), e.args.name);
    counts.set(thread(e), (counts.get(thread(e)) ?? 0) + 1);
  }
  // The page's renderer main thread is the busiest one of that name (other renderers idle).
  const main = [...names].filter(([, n]) => n === 'CrRendererMain').sort((a, b) => (counts.get(b[0]) ?? 0) - (counts.get(a[0]) ?? 0))[0]?.[0];
  const workers = new Set([...names].filter(([, n]) => n.startsWith('DedicatedWorker')).map(([k]) => k));
  const onMain = events.filter((e) => thread(e) === main);
  const inputs = onMain.filter((e) => e.name === 'EventDispatch' && e.args?.data?.type === 'input').map((e) => e.ts).sort((a, b) => a - b);
  const mainTasks = onMain.filter(isTask).sort((a, b) => a.ts - b.ts);
  const messages = onMain.filter((e) => e.name === 'HandlePostMessage');
  // The bench's own end-of-frame probes arrive as messages too (editAndWait's MessageChannel).
  const probes = onMain.filter((e) => e.name === 'FunctionCall' && e.args?.data?.functionName === 'channel.port1.onmessage');
  const workerTasks = events.filter((e) => workers.has(thread(e)) && isTask(e));
  const redrawTaskMs: number[] = [];
  const workerMs: number[] = [];
  inputs.forEach((t0, i) => {
    const next = inputs[i + 1] ?? Infinity;
    const redraw = mainTasks.find((task) => task.ts > t0 && task.ts < next && messages.some((m) => within(task, m)) && !probes.some((p) => within(task, p)));
    if (!redraw) return;
    redrawTaskMs.push((redraw.tdur ?? 0) / 1000);
    workerMs.push(workerTasks.filter((w) => w.ts >= t0 && w.ts < redraw.ts).reduce((sum, w) => sum + (w.tdur ?? 0), 0) / 1000);
  });
  return { redrawTaskMs, workerMs };
}
