import { describe, expect, it } from 'vitest';
import { init, use } from 'echarts/core';
import { SVGRenderer } from 'echarts/renderers';
import '../src/charts/echarts.ts';
import { mainsSyncSpec } from '@loopwright/dsp';
import { bodeOption, flatPairs, pairs } from '../src/charts/bodeOption.ts';
import { bodeMarkers, bodeTraces } from '../src/components/analysisView.ts';
import { analyzeJob } from '../src/workers/dspJobs.ts';

/** The Bode plot's data goes to ECharts as flat typed arrays; they must hold exactly the points `pairs` keeps. */
describe('Bode series data', () => {
  it('keeps the same points as pairs, in order: x > 0 and a finite y only', () => {
    const x = [0, 1, 2, 3, 4, 5];
    const y = [1, -Infinity, 2, Number.NaN, 3, 4];
    expect(Array.from(flatPairs(x, y))).toEqual(pairs(x, y).flat());
    expect(Array.from(flatPairs([1, 2], [5]))).toEqual([1, 5]);
  });

  it('puts every trace of a real analysis on the plot, point for point', () => {
    const a = analyzeJob(mainsSyncSpec).analysis;
    const traces = bodeTraces(a);
    const option = bodeOption(traces, bodeMarkers(a, mainsSyncSpec.sampleRateHz)).plot as { series: { id: string; data: Float64Array }[] };
    expect(option.series).toHaveLength(2 * traces.length);
    traces.forEach((t, i) => {
      expect(Array.from(option.series[2 * i]!.data)).toEqual(pairs(t.freqHz, t.magnitudeDb).flat());
      expect(Array.from(option.series[2 * i + 1]!.data)).toEqual(pairs(t.freqHz, t.phaseDeg).flat());
    });
  });

  it('is accepted by ECharts with its development checks on, and drawn from the same points', () => {
    // Server-side rendering needs no canvas; vitest runs ECharts' development build, whose checks
    // refuse typed-array data without named dimensions (the e2e build runs it too).
    use([SVGRenderer]);
    const a = analyzeJob(mainsSyncSpec).analysis;
    const chart = init(null, null, { renderer: 'svg', ssr: true, width: 640, height: 440 });
    try {
      chart.setOption(bodeOption(bodeTraces(a), bodeMarkers(a, mainsSyncSpec.sampleRateHz)).plot);
      // The model is not public API; the test reads what the series holds from it all the same.
      const model = (chart as unknown as { getModel(): { getSeriesByIndex(i: number): { getData(): { count(): number; get(dim: string, i: number): unknown } } } }).getModel();
      const drawn = model.getSeriesByIndex(0).getData();
      const discrete = pairs(a.bode.freqHz, a.bode.discreteMagnitudeDb);
      expect(drawn.count()).toBe(discrete.length);
      expect([drawn.get('x', 10), drawn.get('y', 10)]).toEqual(discrete[10]);
      expect(chart.renderToSVGString()).toContain('<path');
    } finally {
      chart.dispose();
    }
  });
});
