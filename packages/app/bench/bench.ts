/**
 * App figures (not timed tests): the gzip size of the JavaScript the sign-in route loads, read from
 * the vite build manifest, and the analysis-update time — keystroke → worker analysis → redrawn plot —
 * measured in Debian's Chromium against the built app served by the API (tests/e2e harness).
 */
import fs from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { gzipSync } from 'node:zlib';
import { buildApp } from '../../../tests/e2e/harness/build.ts';
import { APP_DIST } from '../../../tests/e2e/harness/paths.ts';
import { startStack } from '../../../tests/e2e/harness/stack.ts';
import { launchBrowser, signIn } from '../../../tests/e2e/harness/browser.ts';
import { traceEditCpu, type EditCpu } from './editCpu.ts';
import { measureFirstAnalysis } from './firstAnalysis.ts';

const SIGN_IN_TARGET_KB = 200;

interface ManifestChunk {
  readonly file: string;
  readonly isEntry?: boolean;
  readonly imports?: readonly string[];
  readonly src?: string;
}

/** JS files loaded before any lazy route: the entry and its static imports, transitively. */
export async function signInJsFiles(distDir = APP_DIST): Promise<string[]> {
  const manifest = JSON.parse(await fs.readFile(path.join(distDir, '.vite', 'manifest.json'), 'utf8')) as Record<string, ManifestChunk>;
  const entry = Object.entries(manifest).find(([, c]) => c.isEntry)?.[0];
  if (!entry) throw new Error('the vite manifest has no entry chunk');
  const seen = new Set<string>();
  const walk = (key: string) => {
    if (seen.has(key)) return;
    seen.add(key);
    for (const imp of manifest[key]?.imports ?? []) walk(imp);
  };
  walk(entry);
  return [...seen].map((k) => manifest[k]!.file).filter((f) => f.endsWith('.js'));
}

export async function signInJsGzipBytes(distDir = APP_DIST): Promise<number> {
  let total = 0;
  for (const file of await signInJsFiles(distDir)) total += gzipSync(await fs.readFile(path.join(distDir, file)), { level: 9 }).length;
  return total;
}

function median(values: readonly number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = Math.floor(sorted.length / 2);
  return sorted.length % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2;
}

/**
 * The page-side measurement as source text: tsx would wrap a function literal's inner closures
 * in a helper that does not exist inside the page.
 *
 * The clock stops when the frame that shows the new analysis has been painted: each animation frame
 * looks at the margins text; in the first frame where it changed, a task posted from that frame's
 * animation callback runs once the frame's style, layout and paint are done (tasks queued during a
 * frame run after it). Only then, off the clock, the Bode plot's canvases (its two layers: the axes
 * beneath, drawn again only when they change, and the plot) are read back and compared with the
 * drawing before the edit: if they still hold the old drawing, the wait goes on frame by frame until
 * it changes, so the figure never ends before the new plot is on screen. `twoFramesMs` is the former
 * end point (two more frames after the one where the text changed), kept for comparison with older runs.
 */
export function editAndWait(value: string): string {
  return `(async () => {
    const input = document.querySelector('input[data-test="filter-damping"]');
    const cell = document.querySelector('[data-test="row-phase-margin-discrete"]');
    const canvases = [...document.querySelectorAll('[data-test="bode-chart"] canvas')];
    const drawing = () => canvases.map((canvas) => new Uint32Array(canvas.getContext('2d').getImageData(0, 0, canvas.width, canvas.height).data.buffer));
    const sameLayer = (a, b) => a.length === b.length && a.every((v, i) => v === b[i]);
    const sameDrawing = (a, b) => a.length === b.length && a.every((layer, k) => sameLayer(layer, b[k]));
    const before = cell.textContent;
    const drawnBefore = drawing();
    let twoFrames = null;
    const started = performance.now();
    input.value = ${JSON.stringify(value)};
    input.dispatchEvent(new Event('input', { bubbles: true }));
    const paintedMs = await new Promise((resolve, reject) => {
      const giveUp = setTimeout(() => reject(new Error('the Bode plot did not change within 10 s of the edit')), 10000);
      const afterThisFrame = (then) => {
        const channel = new MessageChannel();
        channel.port1.onmessage = () => then(performance.now() - started);
        channel.port2.postMessage(0);
      };
      const check = () => {
        if (cell.textContent === before) return requestAnimationFrame(check);
        if (twoFrames === null) {
          twoFrames = new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(() => r(performance.now() - started))));
        }
        afterThisFrame((ms) => {
          if (sameDrawing(drawing(), drawnBefore)) return requestAnimationFrame(check);
          clearTimeout(giveUp);
          resolve(ms);
        });
      };
      requestAnimationFrame(check);
    });
    return [paintedMs, await twoFrames];
  })()`;
}

async function measureAnalysisUpdate(rounds: number): Promise<{ updateMs: number[]; twoFramesMs: number[]; roundTripMs: number[]; cpu: EditCpu; first: Awaited<ReturnType<typeof measureFirstAnalysis>> }> {
  const stack = await startStack();
  let browser: Awaited<ReturnType<typeof launchBrowser>> | null = null;
  try {
    const first = await measureFirstAnalysis(stack.baseUrl, FIRST_ANALYSIS_ROUNDS);
    browser = await launchBrowser();
    const page = await browser.newPage();
    await signIn(page, stack.baseUrl, 'designer@example.test');
    await page.click('a.design:has-text("Mains sync PI loop")');
    await page.waitForSelector('[data-test="bode-chart"] canvas');
    await page.waitForSelector('[data-test="analysis-status"]:has-text("up to date")');
    const updateMs: number[] = [];
    const twoFramesMs: number[] = [];
    for (let i = 0; i < rounds; i++) {
      const damping = (0.5 + 0.02 * (i % 10)).toFixed(2);
      const [painted, twoFrames] = (await page.evaluate(editAndWait(damping))) as [number, number];
      updateMs.push(painted);
      twoFramesMs.push(twoFrames);
    }
    const roundTripMs = (await page.evaluate("performance.getEntriesByName('lw-analysis-round-trip').map((e) => e.duration)")) as number[];
    // The same edits again under Chromium's tracing, which slows the page a little: only its CPU
    // figures are kept, never its times.
    const cpu = await traceEditCpu(page, rounds, async (i) => {
      await page.evaluate(editAndWait((0.5 + 0.02 * ((i + 5) % 10)).toFixed(2)));
    });
    return { updateMs, twoFramesMs, roundTripMs: roundTripMs.slice(-rounds), cpu, first };
  } finally {
    await browser?.close();
    await stack.stop();
  }
}

/** Issue 16: keystroke to redrawn plot on this 2-core machine, median and worst of the edits. */
const ANALYSIS_UPDATE_TARGET_MS = 30;
const ANALYSIS_UPDATE_WORST_TARGET_MS = 50;
/** Fresh browsers per variant for the first analysis after the design page loads (firstAnalysis.ts). */
const FIRST_ANALYSIS_ROUNDS = 5;

export async function runAppBench(): Promise<object> {
  buildApp();
  const bytes = await signInJsGzipBytes();
  const signInJsGzipKb = Math.round((bytes / 1024) * 10) / 10;
  const { updateMs, twoFramesMs, roundTripMs, cpu, first } = await measureAnalysisUpdate(15);
  const firstOf = (variant: 'warm' | 'unwarmed', key: 'answeredMs' | 'roundTripMs') => Math.round(median(first.filter((r) => r.variant === variant).map((r) => r[key])) * 10) / 10;
  return {
    signInJsGzipKb,
    signInJsGzipTargetKb: SIGN_IN_TARGET_KB,
    signInJsMet: signInJsGzipKb < SIGN_IN_TARGET_KB,
    signInJsFiles: (await signInJsFiles()).length,
    analysisUpdateMs: Math.round(median(updateMs) * 10) / 10,
    analysisUpdateTargetMs: ANALYSIS_UPDATE_TARGET_MS,
    analysisUpdateWorstTargetMs: ANALYSIS_UPDATE_WORST_TARGET_MS,
    analysisUpdateMet: median(updateMs) < ANALYSIS_UPDATE_TARGET_MS && Math.max(...updateMs) < ANALYSIS_UPDATE_WORST_TARGET_MS,
    analysisUpdateNote:
      'median and worst of 15 edits of filter.damping on the demo mains-sync loop, the first after the page loaded included: edit → worker analysis → painted frame with the new margins text and a changed Bode canvas',
    analysisUpdateMaxMs: Math.round(Math.max(...updateMs) * 10) / 10,
    analysisUpdateFirstMs: Math.round(updateMs[0]! * 10) / 10,
    analysisUpdateFirstNote:
      'the first edit alone: it also makes the design dirty (the "unsaved" tag appears, Save is enabled), and it is the one a cold path or a warm-up still running would slow',
    analysisUpdateTwoFramesMs: Math.round(median(twoFramesMs) * 10) / 10,
    analysisUpdateTwoFramesMaxMs: Math.round(Math.max(...twoFramesMs) * 10) / 10,
    analysisUpdateTwoFramesNote: 'the former end point (two animation frames after the one where the text changed, about 33 ms of waiting at 60 Hz), for comparison with older runs',
    analysisWorkerRoundTripMs: Math.round(median(roundTripMs) * 10) / 10,
    analysisRedrawTaskCpuMs: Math.round(median(cpu.redrawTaskMs) * 10) / 10,
    analysisWorkerCpuMs: Math.round(median(cpu.workerMs) * 10) / 10,
    analysisCpuNote: `medians of thread CPU time over ${cpu.redrawTaskMs.length} more edits traced by Chromium, less moved by other load than the times: the main-thread task that takes the worker's answer, patches the result panels and redraws the Bode plot, and the analysis worker's tasks`,
    firstAnalysisAnsweredMs: firstOf('warm', 'answeredMs'),
    firstAnalysisRoundTripMs: firstOf('warm', 'roundTripMs'),
    firstAnalysisUnwarmedAnsweredMs: firstOf('unwarmed', 'answeredMs'),
    firstAnalysisUnwarmedRoundTripMs: firstOf('unwarmed', 'roundTripMs'),
    firstAnalysisNote: `medians of ${FIRST_ANALYSIS_ROUNDS} fresh browsers each, the design editor of the demo mains-sync loop opened by its address: answered = navigation start to the first analysis reaching the page, round trip = its request to its answer; unwarmed = the same build with its worker started at the first job and the warm-up dropped (an init script), alternated with the warm rounds`,
    loadAverage1m: Math.round(os.loadavg()[0]! * 100) / 100,
  };
}
