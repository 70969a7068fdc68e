/**
 * The Bode plot's tooltip lists the magnitude and the phase of every trace under one frequency; the
 * two share each trace's name, so each value must carry its unit or a phase of -170 reads as dB.
 * Expected text comes from the demo spec's own analysis (the values the tooltip shows).
 */
import { describe, expect, it } from 'vitest';
import { init, use } from 'echarts/core';
import { SVGRenderer } from 'echarts/renderers';
import '../src/charts/echarts.ts';
import { mainsSyncSpec } from '@loopwright/dsp';
import { bodeOption } from '../src/charts/bodeOption.ts';
import { bodeMarkers, bodeTraces } from '../src/components/analysisView.ts';
import { analyzeJob } from '../src/workers/dspJobs.ts';

use([SVGRenderer]);

describe('the Bode plot tooltip', () => {
  it('gives each magnitude in dB and each phase in degrees', () => {
    const a = analyzeJob(mainsSyncSpec).analysis;
    const traces = bodeTraces(a);
    const host = document.createElement('div');
    document.body.appendChild(host);
    const chart = init(host, null, { renderer: 'svg', width: 640, height: 440 });
    try {
      chart.setOption(bodeOption(traces, bodeMarkers(a, mainsSyncSpec.sampleRateHz)).plot);
      const index = 200;
      chart.dispatchAction({ type: 'showTip', seriesIndex: 0, dataIndex: index });
      const text = host.textContent ?? '';
      const first = traces[0]!;
      expect(text).toContain(`${first.magnitudeDb[index]!.toFixed(2)} dB`);
      expect(text).toContain(`${first.phaseDeg[index]!.toFixed(2)}°`);
    } finally {
      chart.dispose();
      host.remove();
    }
  });
});
