/**
 * Closed-loop phase transfer |H| = |L/(1+L)| and error transfer |E| = |1/(1+L)| in dB over the Bode
 * grid (G3 Ch. 2): |H| shows the loop bandwidth and its peaking, |E| how much of the input's phase
 * wander the loop leaves as phase error at each frequency. Analog prototype dashed, discrete solid.
 */
import type { EChartsCoreOption } from 'echarts/core';
import type { BodePlotData } from '@loopwright/dsp';
import { CHART_COLORS, chartAnimation } from './echarts.ts';
import { fmtHz, siTick } from '../lib/format.ts';
import { pairs } from './bodeOption.ts';

const ERROR_COLOR = '#3b6fb6';

export function closedLoopOption(b: BodePlotData): EChartsCoreOption {
  const line = (name: string, y: readonly number[], color: string, type: 'solid' | 'dashed') => ({
    type: 'line',
    name,
    data: pairs(b.freqHz, y),
    showSymbol: false,
    animation: false,
    lineStyle: { color, type, width: type === 'solid' ? 2 : 1.5 },
    color,
  });
  const series = [
    line('|H| closed loop, discrete', b.discreteClosedLoopDb, CHART_COLORS.float, 'solid'),
    line('|H| analog prototype', b.analogClosedLoopDb, CHART_COLORS.analog, 'dashed'),
    line('|E| error transfer, discrete', b.discreteErrorDb, ERROR_COLOR, 'solid'),
    line('|E| analog prototype', b.analogErrorDb, ERROR_COLOR, 'dashed'),
  ];
  // −3 dB of |H| is the usual closed-loop bandwidth mark (Og5); 0 dB for reference.
  (series[0] as Record<string, unknown>)['markLine'] = {
    symbol: 'none',
    silent: true,
    data: [
      { yAxis: -3, label: { formatter: '−3 dB', position: 'insideStartTop' }, lineStyle: { color: CHART_COLORS.marker, type: 'dashed' } },
      { yAxis: 0, label: { show: false }, lineStyle: { color: CHART_COLORS.reference } },
    ],
  };
  const lowest = Math.min(...[...b.discreteErrorDb, ...b.discreteClosedLoopDb].filter((v) => v > -160));
  return {
    animation: chartAnimation(),
    legend: { top: 0 },
    tooltip: { trigger: 'axis', valueFormatter: (v: unknown) => (typeof v === 'number' ? `${v.toFixed(2)} dB` : String(v)) },
    grid: { left: 58, right: 18, top: 48, bottom: 40 },
    xAxis: {
      type: 'log',
      name: 'Frequency',
      nameLocation: 'middle',
      nameGap: 24,
      axisLabel: { formatter: (v: number) => fmtHz(v, 3), hideOverlap: true },
      axisPointer: { label: { formatter: ({ value }: { value: number }) => fmtHz(value, 4) } },
      splitLine: { show: true, lineStyle: { color: CHART_COLORS.grid } },
    },
    yAxis: {
      type: 'value',
      name: 'Magnitude',
      nameLocation: 'middle',
      nameGap: 42,
      min: Math.max(-160, Math.floor((lowest - 10) / 20) * 20),
      axisLabel: { formatter: (v: number) => `${Number(v.toPrecision(3))} dB` },
      splitLine: { lineStyle: { color: CHART_COLORS.grid } },
    },
    dataZoom: [{ type: 'inside', filterMode: 'none' }],
    series,
  };
}
