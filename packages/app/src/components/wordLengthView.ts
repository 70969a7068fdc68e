/** The word-length panel's curves and the spec edits that apply the cheapest widths. */
import type { EChartsCoreOption } from 'echarts/core';
import type { LoopSpec, WordLengthResult } from '@loopwright/dsp';
import { CHART_COLORS, chartAnimation } from '../charts/echarts.ts';

const finiteOrNull = (v: number | null): number | null => (v !== null && Number.isFinite(v) ? v : null);

/** Stability (1 stable, 0 not), phase margin and response error against coefficient width. */
export function coefficientCurveOption(r: WordLengthResult): EChartsCoreOption {
  const curve = r.coefficients.curve;
  const x = curve.map((p) => p.coefficientBits);
  const mark = r.coefficients.minBits;
  const markLine = mark === null ? undefined : { symbol: 'none', silent: true, data: [{ xAxis: String(mark), label: { formatter: `cheapest: ${mark} bits` } }], lineStyle: { color: CHART_COLORS.pass, width: 2 } };
  const grids = [
    { left: 64, right: 20, top: 30, height: '18%' },
    { left: 64, right: 20, top: '36%', height: '24%' },
    { left: 64, right: 20, top: '70%', height: '20%' },
  ];
  return {
    animation: chartAnimation(),
    tooltip: { trigger: 'axis' },
    axisPointer: { link: [{ xAxisIndex: 'all' }] },
    grid: grids,
    xAxis: grids.map((_, i) => ({ type: 'category', gridIndex: i, data: x.map(String), name: i === 2 ? 'Coefficient width (bits)' : '', nameLocation: 'middle', nameGap: 24, axisLabel: { show: i === 2 } })),
    yAxis: [
      { type: 'value', gridIndex: 0, min: 0, max: 1, interval: 1, name: 'Stable', nameLocation: 'middle', nameGap: 44, axisLabel: { formatter: (v: number) => (v === 1 ? 'yes' : 'no') } },
      { type: 'value', gridIndex: 1, name: 'Phase margin (°)', nameLocation: 'middle', nameGap: 44, scale: true },
      { type: 'log', gridIndex: 2, name: 'Response error (dB)', nameLocation: 'middle', nameGap: 44, logBase: 10 },
    ],
    series: [
      { type: 'line', step: 'middle', name: 'Stable', xAxisIndex: 0, yAxisIndex: 0, data: curve.map((p) => (p.stable ? 1 : 0)), color: CHART_COLORS.float, markLine },
      {
        type: 'line',
        name: 'Phase margin',
        xAxisIndex: 1,
        yAxisIndex: 1,
        data: curve.map((p) => finiteOrNull(p.phaseMarginDeg)),
        color: CHART_COLORS.float,
        markLine: r.reference.phaseMarginDeg === null ? markLine : { symbol: 'none', silent: true, data: [...(markLine?.data ?? []), { yAxis: r.reference.phaseMarginDeg, label: { formatter: 'unquantised' }, lineStyle: { color: CHART_COLORS.reference, type: 'dashed' } }] },
      },
      {
        type: 'line',
        name: 'Response error',
        xAxisIndex: 2,
        yAxisIndex: 2,
        data: curve.map((p) => {
          const v = finiteOrNull(p.maxDeviationDb);
          return v === null ? null : Math.max(v, 1e-6);
        }),
        color: CHART_COLORS.fixed,
        markLine: { symbol: 'none', silent: true, data: [{ yAxis: r.tolerances.responseDb, label: { formatter: `tolerance ${r.tolerances.responseDb} dB` } }], lineStyle: { color: CHART_COLORS.fail, type: 'dashed' } },
      },
    ],
  };
}

/** Steady-state phase error and jitter of the bit-true loop against data width. */
export function dataCurveOption(r: WordLengthResult): EChartsCoreOption | null {
  const d = r.data;
  if (!d) return null;
  const x = d.curve.map((p) => String(p.dataBits));
  const mark = d.minBits;
  return {
    animation: chartAnimation(),
    tooltip: { trigger: 'axis' },
    legend: { top: 0 },
    grid: { left: 64, right: 20, top: 30, bottom: 40 },
    xAxis: { type: 'category', data: x, name: 'Data width (bits)', nameLocation: 'middle', nameGap: 24 },
    yAxis: { type: 'value', name: 'Phase error (°)', nameLocation: 'middle', nameGap: 44, scale: true },
    series: [
      {
        type: 'line',
        name: 'Steady-state error',
        data: d.curve.map((p) => p.steadyStatePhaseErrorDeg),
        color: CHART_COLORS.fixed,
        markLine: mark === null ? undefined : { symbol: 'none', silent: true, data: [{ xAxis: String(mark), label: { formatter: `cheapest: ${mark} bits` } }], lineStyle: { color: CHART_COLORS.pass, width: 2 } },
      },
      { type: 'line', name: 'Jitter (RMS)', data: d.curve.map((p) => p.phaseJitterDeg), color: CHART_COLORS.analog },
    ],
  };
}

/**
 * Form edits that apply the cheapest widths found: coefficient width (and, for an explicit Q format,
 * the fraction bits the search used at that width) and data width.
 */
export function widthEdits(r: WordLengthResult, spec: LoopSpec): Record<string, string> {
  const edits: Record<string, string> = {};
  const minCoef = r.coefficients.minBits;
  if (minCoef !== null) {
    edits['fixedPoint.coefficientBits'] = String(minCoef);
    const point = r.coefficients.curve.find((p) => p.coefficientBits === minCoef);
    if (spec.fixedPoint.coefficientFractionBits !== 'auto' && point?.fractionBits != null) {
      edits['fixedPoint.coefficientFractionBits'] = String(point.fractionBits);
    }
  }
  if (r.data?.minBits != null) edits['fixedPoint.dataBits'] = String(r.data.minBits);
  return edits;
}
