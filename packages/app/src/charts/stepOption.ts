/**
 * Phase error after a 1 rad phase step and after a 1 Hz frequency step (dsp's stepResponses: the
 * discrete loop as implemented, or the analog prototype for long spans), one above the other on a
 * shared time axis. A type-2 loop returns both to zero; a type-1 loop keeps a frequency-step error
 * of 2π/(K·F(0)) rad per Hz (G3 Ch. 2).
 */
import type { EChartsCoreOption } from 'echarts/core';
import type { StepResponses } from '@loopwright/dsp';
import { CHART_COLORS, chartAnimation } from './echarts.ts';
import { fmtEng, siTick } from '../lib/format.ts';
import { pairs } from './bodeOption.ts';

export function stepOption(s: StepResponses): EChartsCoreOption {
  const t = s.timeS;
  const series = [
    { name: 'After a 1 rad phase step', data: pairs(t, s.phaseStepErrorRad, true), xAxisIndex: 0, yAxisIndex: 0, color: CHART_COLORS.float },
    { name: 'After a 1 Hz frequency step', data: pairs(t, s.frequencyStepErrorRad, true), xAxisIndex: 1, yAxisIndex: 1, color: CHART_COLORS.fixed },
  ].map((x) => ({ ...x, type: 'line', showSymbol: false, animation: false, lineStyle: { width: 1.6, color: x.color }, markLine: { symbol: 'none', silent: true, label: { show: false }, data: [{ yAxis: 0 }], lineStyle: { color: CHART_COLORS.reference } } }));
  const grids = [
    { left: 70, right: 18, top: 34, height: '34%' },
    { left: 70, right: 18, top: '60%', bottom: 40 },
  ];
  return {
    animation: chartAnimation(),
    title: s.diverged ? { text: 'the loop is unstable: the error grows without bound', textStyle: { color: CHART_COLORS.fail, fontSize: 12 }, right: 10, top: 0 } : undefined,
    legend: { top: 0, left: 0 },
    tooltip: { trigger: 'axis', valueFormatter: (v: unknown) => (typeof v === 'number' ? fmtEng(v, 'rad', 4) : String(v)) },
    axisPointer: { link: [{ xAxisIndex: 'all' }] },
    grid: grids,
    xAxis: grids.map((_, i) => ({
      type: 'value',
      gridIndex: i,
      name: i === 1 ? `Time (${s.source === 'discrete' ? 'discrete loop' : 'analog prototype'})` : '',
      nameLocation: 'middle',
      nameGap: 24,
      min: 0,
      max: t[t.length - 1] ?? 1,
      axisLabel: { formatter: siTick('s') },
      axisPointer: { label: { formatter: ({ value }: { value: number }) => fmtEng(value, 's', 4) } },
      splitLine: { lineStyle: { color: CHART_COLORS.grid } },
    })),
    yAxis: grids.map((_, i) => ({
      type: 'value',
      gridIndex: i,
      name: 'Phase error',
      nameLocation: 'middle',
      nameGap: 52,
      scale: true,
      axisLabel: { formatter: siTick('rad') },
      splitLine: { lineStyle: { color: CHART_COLORS.grid } },
    })),
    dataZoom: [{ type: 'inside', xAxisIndex: [0, 1], filterMode: 'none' }],
    series,
  };
}
