import { describe, expect, it } from 'vitest';
import { mainsSyncSpec } from '@loopwright/dsp';
import { keptIndices } from '../src/charts/thinLine.ts';
import { bodeOption, flatPairs } from '../src/charts/bodeOption.ts';
import { bodeMarkers, bodeTraces } from '../src/components/analysisView.ts';
import { analyzeJob } from '../src/workers/dspJobs.ts';

/** Largest vertical distance of any point from the polyline through the kept points (x increasing). */
function worstOffset(x: ArrayLike<number>, y: ArrayLike<number>, kept: readonly number[]): number {
  let worst = 0;
  for (let k = 0; k + 1 < kept.length; k++) {
    const a = kept[k]!;
    const b = kept[k + 1]!;
    for (let i = a + 1; i < b; i++) {
      const t = (x[i]! - x[a]!) / (x[b]! - x[a]!);
      worst = Math.max(worst, Math.abs(y[a]! + t * (y[b]! - y[a]!) - y[i]!));
    }
  }
  return worst;
}

describe('line thinning (Douglas–Peucker, DP73)', () => {
  it('keeps only the ends of points on one straight line', () => {
    // A straight line has no point off its chord (DP73).
    const x = [0, 1, 2, 3, 4, 5];
    expect(keptIndices(x, x.map((v) => 3 - 2 * v), 1e-9)).toEqual([0, 5]);
  });

  it('keeps the corner of a V and nothing else', () => {
    // The farthest point from the chord is the corner; both halves are then straight (DP73).
    const x = [0, 1, 2, 3, 4, 5, 6];
    const y = x.map((v) => Math.abs(v - 4));
    expect(keptIndices(x, y, 1e-9)).toEqual([0, 4, 6]);
  });

  it('keeps a point farther from the chord than the tolerance, and drops one within it', () => {
    // A point is dropped when it lies within the tolerance of the chord (DP73).
    const x = [0, 1, 2];
    const y = [0, 0.5, 0];
    expect(keptIndices(x, y, 0.4)).toEqual([0, 1, 2]);
    expect(keptIndices(x, y, 0.5)).toEqual([0, 2]);
  });

  it('leaves every point of a real Bode trace within the tolerance of the line it draws', () => {
    // The bound DP73 guarantees, checked point by point on the demo loop's magnitude and phase.
    const b = analyzeJob(mainsSyncSpec).analysis.bode;
    const logF = b.freqHz.map((f) => Math.log10(f));
    for (const [y, tolerance] of [[b.discreteMagnitudeDb, 0.03], [b.discretePhaseDeg, 0.05]] as const) {
      const kept = keptIndices(logF, y, tolerance);
      expect(kept[0]).toBe(0);
      expect(kept[kept.length - 1]).toBe(y.length - 1);
      expect(worstOffset(logF, y, kept)).toBeLessThanOrEqual(tolerance);
      expect(kept.length).toBeLessThan(y.length / 2);
    }
  });
});

describe('thinned Bode series', () => {
  it('draw only points of the analysis grid, and every grid point within a ten-thousandth of the axis span', () => {
    // What the plot may lose without a visible change: under 0.1 px on a plot 1000 px tall (common practice, no source).
    const a = analyzeJob(mainsSyncSpec).analysis;
    const traces = bodeTraces(a);
    const markers = bodeMarkers(a, mainsSyncSpec.sampleRateHz);
    const thin = bodeOption(traces, markers, { thin: true }).plot as { series: { data: Float64Array }[]; yAxis: { min: number }[] };
    const full = bodeOption(traces, markers).plot as { series: { data: Float64Array }[] };
    const finite = (v: readonly number[], floor = -Infinity) => v.filter((x) => Number.isFinite(x) && x > floor);
    const span = (v: number[]) => Math.max(...v) - Math.min(...v);
    const magSpan = span(traces.flatMap((t) => finite(t.magnitudeDb, thin.yAxis[0]!.min)));
    const phaseSpan = span(traces.flatMap((t) => finite(t.phaseDeg)));
    thin.series.forEach((s, index) => {
      const all = full.series[index]!.data;
      const grid = new Map<number, number>();
      for (let i = 0; i < all.length; i += 2) grid.set(all[i]!, i / 2);
      const kept: number[] = [];
      for (let i = 0; i < s.data.length; i += 2) {
        const at = grid.get(s.data[i]!);
        expect(at).toBeDefined();
        expect(s.data[i + 1]).toBe(all[2 * at! + 1]);
        kept.push(at!);
      }
      const x = Array.from({ length: all.length / 2 }, (_, i) => Math.log10(all[2 * i]!));
      const y = Array.from({ length: all.length / 2 }, (_, i) => all[2 * i + 1]!);
      expect(worstOffset(x, y, kept)).toBeLessThanOrEqual(1e-4 * (index % 2 === 0 ? magSpan : phaseSpan));
      expect(s.data.length).toBeLessThan(all.length);
    });
    expect(Array.from(full.series[0]!.data)).toEqual(Array.from(flatPairs(traces[0]!.freqHz, traces[0]!.magnitudeDb)));
  });
});
