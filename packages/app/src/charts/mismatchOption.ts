/** Golden against uploaded values of one vector column around the first mismatch (conformance page). */
import type { EChartsCoreOption } from 'echarts/core';
import type { MismatchWindow } from '../views/conformancePlot.ts';
import { CHART_COLORS, chartAnimation } from './echarts.ts';

export function mismatchOption(w: MismatchWindow): EChartsCoreOption {
  const at = (values: readonly (number | null)[]) => w.samples.map((s, i) => [s, values[i] ?? null]);
  const bad = w.mismatchSamples.map((s) => [s, w.uploaded[w.samples.indexOf(s)] ?? null]);
  return {
    animation: chartAnimation(),
    legend: { top: 0 },
    tooltip: { trigger: 'axis' },
    grid: { left: 80, right: 20, top: 34, bottom: 42 },
    xAxis: { type: 'value', name: 'Sample', nameLocation: 'middle', nameGap: 26, min: w.samples[0], max: w.samples[w.samples.length - 1], splitLine: { lineStyle: { color: CHART_COLORS.grid } } },
    yAxis: { type: 'value', name: `${w.column} (LSB)`, nameLocation: 'middle', nameGap: 62, scale: true, splitLine: { lineStyle: { color: CHART_COLORS.grid } } },
    series: [
      {
        type: 'line',
        name: 'Golden',
        step: 'end',
        data: at(w.golden),
        showSymbol: false,
        animation: false,
        lineStyle: { width: 2, color: CHART_COLORS.float },
        color: CHART_COLORS.float,
        markLine: { symbol: 'none', silent: true, data: [{ xAxis: w.firstSample, label: { formatter: `first mismatch, sample ${w.firstSample}` }, lineStyle: { color: CHART_COLORS.fail, type: 'dashed' } }] },
      },
      { type: 'line', name: 'Uploaded', step: 'end', data: at(w.uploaded), connectNulls: false, showSymbol: false, animation: false, lineStyle: { width: 1.5, type: 'dashed', color: CHART_COLORS.fixed }, color: CHART_COLORS.fixed },
      { type: 'scatter', name: 'Mismatch', data: bad, symbolSize: 9, animation: false, itemStyle: { color: CHART_COLORS.fail } },
    ],
  };
}
