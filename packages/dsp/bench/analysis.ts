/**
 * Benchmark of analyzeDesign on the demo examples (target: < 5 ms per spec, so the design editor can
 * re-analyse on every edit in a Web Worker). Reports figures; never fails a test run.
 */
import { analyzeDesign } from '../src/planDesign.ts';
import { exampleSpecs } from '../src/spec/examples.ts';
import { wordLengthSearch } from '../src/wordlength/wordLengthSearch.ts';

export const ANALYZE_TARGET_MS = 5;

export interface AnalysisBenchFigure {
  readonly example: string;
  readonly firstCallMs: number;
  readonly medianMs: number;
  readonly p95Ms: number;
  readonly targetMs: number;
  readonly met: boolean;
}

export function runAnalysisBench(runs = 300, warmup = 100): AnalysisBenchFigure[] {
  return exampleSpecs.map((e) => {
    const times: number[] = [];
    for (let i = 0; i < runs; i++) {
      const t0 = performance.now();
      analyzeDesign(e.spec);
      times.push(performance.now() - t0);
    }
    const steady = times.slice(warmup).sort((a, b) => a - b);
    const at = (q: number) => steady[Math.min(steady.length - 1, Math.floor(q * steady.length))]!;
    const medianMs = at(0.5);
    return { example: e.id, firstCallMs: times[0]!, medianMs, p95Ms: at(0.95), targetMs: ANALYZE_TARGET_MS, met: medianMs < ANALYZE_TARGET_MS };
  });
}

export interface WordLengthBenchFigure {
  readonly example: string;
  readonly coefficientsOnlyMs: number;
  readonly fullMs: number;
}

/** Word-length search times (second run of each, JIT warm); no target beyond "fits a worker with progress". */
export function runWordLengthBench(): WordLengthBenchFigure[] {
  return exampleSpecs.map((e) => {
    wordLengthSearch(e.spec);
    const t0 = performance.now();
    wordLengthSearch(e.spec, { data: false });
    const t1 = performance.now();
    wordLengthSearch(e.spec);
    const t2 = performance.now();
    return { example: e.id, coefficientsOnlyMs: t1 - t0, fullMs: t2 - t1 };
  });
}
