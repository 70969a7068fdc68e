/**
 * The Bode plot is drawn in two layers (charts/layers.ts): its axes in a frame beneath, the traces on
 * top. The frame must draw exactly the plot's axes, in whatever state the plot is: thinned or not, a
 * trace hidden from the legend, zoomed. Both are real ECharts instances (server-side rendering, no
 * canvas); the expected axes are the ones ECharts makes for the plot itself.
 */
import { describe, expect, it } from 'vitest';
import { init, use } from 'echarts/core';
import { SVGRenderer } from 'echarts/renderers';
import '../src/charts/echarts.ts';
import { exampleSpecs } from '@loopwright/dsp';
import { bodeOption } from '../src/charts/bodeOption.ts';
import { axesSignature, chartView } from '../src/charts/layers.ts';
import { bodeMarkers, bodeTraces } from '../src/components/analysisView.ts';
import { analyzeJob } from '../src/workers/dspJobs.ts';

use([SVGRenderer]);

function charts() {
  const opts = { renderer: 'svg' as const, ssr: true, width: 640, height: 440 };
  return { plot: init(null, null, opts), frame: init(null, null, opts) };
}

describe('the Bode plot layers', () => {
  for (const { title, spec } of exampleSpecs) {
    it(`draws the plot's own axes in the frame beneath it (${title})`, () => {
      const a = analyzeJob(spec).analysis;
      const { plot, frame } = charts();
      try {
        for (const thin of [true, false]) {
          const layers = bodeOption(bodeTraces(a), bodeMarkers(a, spec.sampleRateHz), { thin });
          plot.setOption(layers.plot, { notMerge: true });
          const states: (string | null)[] = [];
          const check = () => {
            frame.setOption(layers.frame(chartView(plot)), { notMerge: true });
            const axes = axesSignature(plot);
            expect(axes).not.toBeNull();
            expect(axesSignature(frame)).toBe(axes);
            states.push(axes);
          };
          check();
          plot.dispatchAction({ type: 'legendUnSelect', name: bodeTraces(a)[0]!.label });
          check();
          plot.dispatchAction({ type: 'dataZoom', start: 20, end: 55 });
          check();
          plot.dispatchAction({ type: 'legendSelect', name: bodeTraces(a)[0]!.label });
          check();
          // The zoomed axes are other axes: the comparison above can tell axes apart.
          expect(states[2]).not.toBe(states[0]);
        }
      } finally {
        plot.dispose();
        frame.dispose();
      }
    });
  }
});
