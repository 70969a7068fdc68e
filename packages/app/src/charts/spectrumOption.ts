/**
 * The NCO output spectrum (dsp's ncoSpectrum: the table the hardware holds, read through the
 * truncated phase, Blackman–Harris window, Ha78) in dBc from 0 to fs/2, with the phase-truncation spur
 * estimate −6.02·P dBc and its worst case −6.02·P + 3.92 dBc (NS87) drawn across, and the largest
 * measured spur marked, so theory and this table's spectrum can be compared at a glance.
 */
import type { EChartsCoreOption } from 'echarts/core';
import type { NcoSpectrum } from '@loopwright/dsp';
import { CHART_COLORS, chartAnimation } from './echarts.ts';
import { fmtEng, fmtHz, siTick } from '../lib/format.ts';
import { pairs } from './bodeOption.ts';

export function spectrumOption(s: NcoSpectrum): EChartsCoreOption {
  const lines: object[] = [];
  if (s.spurEstimateDbc !== null) lines.push({ yAxis: s.spurEstimateDbc, label: { formatter: `spur estimate ${s.spurEstimateDbc.toFixed(1)} dBc (NS87)`, position: 'insideEndTop' }, lineStyle: { color: CHART_COLORS.marker, type: 'dashed' } });
  if (s.spurWorstDbc !== null) lines.push({ yAxis: s.spurWorstDbc, label: { formatter: `worst case ${s.spurWorstDbc.toFixed(1)} dBc`, position: 'insideStartTop' }, lineStyle: { color: CHART_COLORS.fail, type: 'dotted' } });
  const points = s.largestSpur ? [{ coord: [s.largestSpur.freqHz, s.largestSpur.levelDbc], value: `${s.largestSpur.levelDbc.toFixed(1)} dBc at ${fmtHz(s.largestSpur.freqHz, 4)}`, symbol: 'pin', symbolSize: 36, itemStyle: { color: CHART_COLORS.fixed }, label: { show: false } }] : [];
  const lowest = Math.min(...s.levelDbc.filter((v) => v > -199));
  return {
    animation: chartAnimation(),
    legend: { top: 0, data: ['NCO output'] },
    tooltip: { trigger: 'axis', valueFormatter: (v: unknown) => (typeof v === 'number' ? `${v.toFixed(1)} dBc` : String(v)) },
    grid: { left: 64, right: 20, top: 34, bottom: 42 },
    xAxis: {
      type: 'value',
      name: `Frequency (${s.points}-point FFT, tone at ${fmtHz(s.toneHz, 6)})`,
      nameLocation: 'middle',
      nameGap: 26,
      min: 0,
      max: s.freqHz[s.freqHz.length - 1] ?? 1,
      axisLabel: { formatter: siTick('Hz'), hideOverlap: true },
      axisPointer: { label: { formatter: ({ value }: { value: number }) => fmtEng(value, 'Hz', 5) } },
      splitLine: { lineStyle: { color: CHART_COLORS.grid } },
    },
    yAxis: {
      type: 'value',
      name: 'Level',
      nameLocation: 'middle',
      nameGap: 46,
      min: Math.max(-200, Math.floor((lowest - 5) / 20) * 20),
      max: 10,
      axisLabel: { formatter: (v: number) => `${Number(v.toPrecision(3))} dBc` },
      splitLine: { lineStyle: { color: CHART_COLORS.grid } },
    },
    dataZoom: [{ type: 'inside', filterMode: 'none' }],
    series: [
      {
        type: 'line',
        name: 'NCO output',
        data: pairs(s.freqHz, s.levelDbc, true),
        showSymbol: false,
        animation: false,
        sampling: 'max',
        lineStyle: { width: 1, color: CHART_COLORS.float },
        color: CHART_COLORS.float,
        markLine: { symbol: 'none', silent: true, data: lines },
        markPoint: { data: points },
      },
    ],
  };
}
