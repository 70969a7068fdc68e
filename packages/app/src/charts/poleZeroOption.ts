/**
 * z-plane of each second-order section: the unit circle, poles (×) and zeros (○) of the designed
 * (unquantised) section and of the section with quantised coefficients (OS3 Sec. 6.8, memory: a
 * pole that quantisation moves onto or outside the circle makes the filter unstable). One square
 * plot per section, side by side; scroll to zoom in on poles crowding z = 1.
 */
import type { EChartsCoreOption } from 'echarts/core';
import type { QuantizedFilter } from '@loopwright/dsp';
import { sectionPolesZeros } from '@loopwright/dsp';
import { CHART_COLORS, chartAnimation } from './echarts.ts';

/** A filled × (ECharts symbols are filled shapes). */
const CROSS = 'path://M2,0L5,3L8,0L10,2L7,5L10,8L8,10L5,7L2,10L0,8L3,5L0,2Z';
const CIRCLE_POINTS = 181;

function unitCircle(): [number, number][] {
  return Array.from({ length: CIRCLE_POINTS }, (_, i) => {
    const t = (2 * Math.PI * i) / (CIRCLE_POINTS - 1);
    return [Math.cos(t), Math.sin(t)];
  });
}

const xy = (roots: readonly { re: number; im: number }[]) => roots.map((r) => [r.re, r.im]);

export function poleZeroOption(filter: QuantizedFilter): EChartsCoreOption {
  const n = Math.max(filter.sections.length, 1);
  const widthPct = 100 / n;
  const grids = filter.sections.map((_, i) => ({ left: `${i * widthPct + 4}%`, width: `${widthPct - 8}%`, top: 70, bottom: 34, containLabel: false }));
  const series: object[] = [];
  filter.sections.forEach((s, i) => {
    const designed = sectionPolesZeros(s.reference);
    const quantised = sectionPolesZeros(s.quantized);
    const on = { xAxisIndex: i, yAxisIndex: i, animation: false };
    series.push({ ...on, type: 'line', name: 'Unit circle', data: unitCircle(), showSymbol: false, silent: true, lineStyle: { color: CHART_COLORS.reference, width: 1 }, color: CHART_COLORS.reference });
    series.push({ ...on, type: 'scatter', name: 'Poles, designed', data: xy(designed.poles), symbol: CROSS, symbolSize: 11, itemStyle: { color: CHART_COLORS.analog } });
    series.push({ ...on, type: 'scatter', name: 'Zeros, designed', data: xy(designed.zeros), symbol: 'emptyCircle', symbolSize: 11, itemStyle: { color: CHART_COLORS.analog, borderWidth: 1.5 } });
    series.push({ ...on, type: 'scatter', name: 'Poles, quantised', data: xy(quantised.poles), symbol: CROSS, symbolSize: 8, itemStyle: { color: CHART_COLORS.fixed } });
    series.push({ ...on, type: 'scatter', name: 'Zeros, quantised', data: xy(quantised.zeros), symbol: 'emptyCircle', symbolSize: 7, itemStyle: { color: CHART_COLORS.fixed, borderWidth: 1.5 } });
  });
  const axis = (i: number, name: string) => ({
    type: 'value',
    gridIndex: i,
    min: -1.25,
    max: 1.25,
    interval: 0.5,
    name,
    nameLocation: 'middle',
    nameGap: 22,
    axisLabel: { formatter: (v: number) => Number(v.toFixed(2)).toString() },
    splitLine: { lineStyle: { color: CHART_COLORS.grid } },
  });
  return {
    animation: chartAnimation(),
    title: filter.sections.map((s, i) => ({
      text: `Section ${s.index + 1}: ${s.stability}\npole radius ${s.poleRadius.toPrecision(8)}, designed ${s.referencePoleRadius.toPrecision(8)}`,
      left: `${i * widthPct + 4}%`,
      top: 24,
      textStyle: { fontSize: 11, fontWeight: 'normal', lineHeight: 14 },
    })),
    legend: { top: 0, data: ['Poles, designed', 'Zeros, designed', 'Poles, quantised', 'Zeros, quantised'] },
    tooltip: { trigger: 'item', formatter: (p: { seriesName: string; value: [number, number] }) => `${p.seriesName}<br/>z = ${p.value[0].toPrecision(10)} ${p.value[1] < 0 ? '−' : '+'} j${Math.abs(p.value[1]).toPrecision(10)}<br/>|z| = ${Math.hypot(p.value[0], p.value[1]).toPrecision(10)}` },
    grid: grids,
    xAxis: grids.map((_, i) => axis(i, 'Re z')),
    yAxis: grids.map((_, i) => axis(i, 'Im z')),
    dataZoom: grids.flatMap((_, i) => [{ type: 'inside', xAxisIndex: i, filterMode: 'none' }, { type: 'inside', yAxisIndex: i, filterMode: 'none' }]),
    series,
  };
}
