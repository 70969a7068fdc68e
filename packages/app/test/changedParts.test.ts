/**
 * The editor's Bode plot is updated in place on each keystroke with only what changed. Expected
 * values are the options the test builds; the chart itself is checked to draw the same picture from
 * the parts as from the whole option, both merged in place into the same first drawing.
 */
import { describe, expect, it } from 'vitest';
import { init, use } from 'echarts/core';
import { SVGRenderer } from 'echarts/renderers';
import '../src/charts/echarts.ts';
import { mainsSyncSpec } from '@loopwright/dsp';
import { bodeOption } from '../src/charts/bodeOption.ts';
import { axesSignature } from '../src/charts/layers.ts';
import { changedParts } from '../src/charts/changedParts.ts';
import { bodeMarkers, bodeTraces } from '../src/components/analysisView.ts';
import { analyzeJob } from '../src/workers/dspJobs.ts';

use([SVGRenderer]);

describe('the parts of an option that changed', () => {
  it('are the series and the parts that are new objects; a part gone asks for the whole option', () => {
    const grid = { left: 10 };
    const last = { grid, legend: { data: ['a'] }, series: [1] };
    const patch = changedParts({ grid, legend: { data: ['a', 'b'] }, series: [2] }, last);
    expect(patch).toEqual({ legend: { data: ['a', 'b'] }, series: [2] });
    expect(changedParts({ grid, series: [2] }, last)).toBeNull();
  });

  it('draw the Bode plot of a new damping as the whole option does', () => {
    const plotOf = (damping: number) => {
      const spec = { ...mainsSyncSpec, filter: { ...mainsSyncSpec.filter, damping } };
      const a = analyzeJob(spec).analysis;
      return bodeOption(bodeTraces(a), bodeMarkers(a, spec.sampleRateHz), { thin: true }).plot;
    };
    const first = plotOf(0.707);
    const next = plotOf(0.5);
    const patch = changedParts(next, first)!;
    // The damping moves the traces and the markers, not the tooltip, grids or x axes.
    expect(Object.keys(patch)).toContain('series');
    expect(Object.keys(patch)).not.toContain('tooltip');
    expect(Object.keys(patch)).not.toContain('xAxis');
    const opts = { renderer: 'svg' as const, ssr: true, width: 640, height: 440 };
    const patched = init(null, null, opts);
    const whole = init(null, null, opts);
    try {
      // Both updated in place from the same first drawing: one with the parts, one with the whole option.
      for (const chart of [patched, whole]) chart.setOption(first);
      patched.setOption(patch, { replaceMerge: ['series'] });
      whole.setOption(next, { replaceMerge: ['series'] });
      expect(axesSignature(patched)).toBe(axesSignature(whole));
      // Element ids name the zrender instance (zr0-…, zr1-…) and number its style classes in the
      // order they were made; the drawing is the rest.
      const drawing = (chart: typeof whole) => chart.renderToSVGString().replace(/zr\d+-/g, 'zr-').replace(/zr-cls-\d+/g, 'zr-cls');
      expect(drawing(patched)).toBe(drawing(whole));
    } finally {
      patched.dispose();
      whole.dispose();
    }
  });
});
