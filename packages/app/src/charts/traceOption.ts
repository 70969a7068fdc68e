/**
 * Time traces of a simulation: phase error, demodulated output against the modulating signal, and
 * NCO frequency, float and bit-true overlaid on one shared, zoomable time axis. Each decimated
 * bucket is drawn as its minimum and maximum, so the envelope (and any glitch) stays visible.
 */
import type { EChartsCoreOption } from 'echarts/core';
import type { DecimatedTrace } from '@loopwright/dsp';
import { CHART_COLORS, chartAnimation } from './echarts.ts';
import { fmtEng, siTick } from '../lib/format.ts';

export interface TraceSet {
  readonly phaseErrorRad: DecimatedTrace;
  readonly filterOutput: DecimatedTrace;
  readonly ncoFrequencyHz: DecimatedTrace;
  /** A sweep's input frequency, drawn with the NCO's (both relative to the centre). */
  readonly inputFrequencyHz?: DecimatedTrace;
}

export interface TraceInput {
  readonly float: TraceSet | null;
  readonly bitTrue: TraceSet | null;
  /** [t, Hz] of the scenario's frequency offset. */
  readonly modulatingHz: readonly [number, number][] | null;
  readonly gainHzPerUnit: number;
  readonly centerHz: number;
}

/** Bucket envelope as a polyline: min then max at each bucket start, scaled and shifted. */
export function envelope(trace: DecimatedTrace, scale = 1, offset = 0): [number, number][] {
  const out: [number, number][] = [];
  const n = trace.bucketStartS.length;
  for (let k = 0; k < n; k++) {
    const t = trace.bucketStartS[k] as number;
    out.push([t, (trace.min[k] as number) * scale - offset]);
    out.push([t, (trace.max[k] as number) * scale - offset]);
  }
  return out;
}

type Row = 0 | 1 | 2;

const ROW_UNITS: Readonly<Record<Row, string>> = { 0: 'rad', 1: 'Hz', 2: 'Hz' };

function line(name: string, data: [number, number][] | readonly [number, number][], row: Row, color: string, type: 'solid' | 'dashed' = 'solid') {
  return {
    type: 'line',
    name,
    tooltip: { valueFormatter: (v: unknown) => (typeof v === 'number' ? fmtEng(v, ROW_UNITS[row], 5) : String(v)) },
    data,
    xAxisIndex: row,
    yAxisIndex: row,
    showSymbol: false,
    sampling: 'lttb',
    lineStyle: { width: 1.2, type, color },
    color,
    animation: false,
    large: true,
  };
}

export function traceOption(input: TraceInput): EChartsCoreOption {
  const series: object[] = [];
  const add = (label: string, set: TraceSet | null, color: string, type: 'solid' | 'dashed') => {
    if (!set) return;
    series.push(line(`${label}`, envelope(set.phaseErrorRad), 0, color, type));
    series.push(line(`${label}`, envelope(set.filterOutput, input.gainHzPerUnit), 1, color, type));
    series.push(line(`${label}`, envelope(set.ncoFrequencyHz, 1, input.centerHz), 2, color, type));
  };
  add('Float', input.float, CHART_COLORS.float, 'solid');
  add('Bit-true', input.bitTrue, CHART_COLORS.fixed, 'dashed');
  // The same input drives both loops: one input-frequency line.
  const inputHz = input.float?.inputFrequencyHz ?? input.bitTrue?.inputFrequencyHz;
  if (inputHz) series.push(line('Input frequency', envelope(inputHz, 1, input.centerHz), 2, CHART_COLORS.reference, 'solid'));
  if (input.modulatingHz) series.push(line('Modulating signal', input.modulatingHz, 1, CHART_COLORS.reference, 'solid'));
  const grids = [
    { left: 70, right: 20, top: 30, height: '22%' },
    { left: 70, right: 20, top: '37%', height: '22%' },
    { left: 70, right: 20, top: '67%', height: '22%' },
  ];
  // Units ride on the ticks with their SI prefix ("20 µs", "1.5 kHz"), so the names carry none.
  const yNames = ['Phase error', 'Demodulated', 'NCO − centre'];
  return {
    animation: chartAnimation(),
    legend: { top: 0, data: ['Float', 'Bit-true', ...(input.modulatingHz ? ['Modulating signal'] : []), ...(inputHz ? ['Input frequency'] : [])] },
    tooltip: { trigger: 'axis' },
    axisPointer: { link: [{ xAxisIndex: 'all' }] },
    grid: grids,
    xAxis: grids.map((_, i) => ({
      type: 'value',
      gridIndex: i,
      name: i === 2 ? 'Time' : '',
      nameLocation: 'middle',
      nameGap: 24,
      axisLabel: { show: i === 2, formatter: siTick('s') },
      axisPointer: { label: { formatter: ({ value }: { value: number }) => fmtEng(value, 's', 5) } },
      splitLine: { lineStyle: { color: CHART_COLORS.grid } },
      scale: true,
    })),
    yAxis: yNames.map((name, i) => ({
      type: 'value',
      gridIndex: i,
      name,
      nameLocation: 'middle',
      nameGap: 52,
      scale: true,
      splitLine: { lineStyle: { color: CHART_COLORS.grid } },
      axisLabel: { formatter: siTick(ROW_UNITS[i as Row]) },
    })),
    dataZoom: [
      { type: 'inside', xAxisIndex: [0, 1, 2], filterMode: 'none' },
      { type: 'slider', xAxisIndex: [0, 1, 2], bottom: 4, height: 16, filterMode: 'none' },
    ],
    series,
  };
}
