/** The word-length panel's curves and the spec edits that apply the cheapest widths. */
import type { EChartsCoreOption } from 'echarts/core';
import type { LoopSpec, WordLengthResult } from '@loopwright/dsp';
import { CHART_COLORS, chartAnimation } from '../charts/echarts.ts';
import { fieldAt } from '../form/specFields.ts';
import { fmtFixed, fmtSig, siTick } from '../lib/format.ts';

const finiteOrNull = (v: number | null): number | null => (v !== null && Number.isFinite(v) ? v : null);

/**
 * One x scale for every stacked chart of a curve: a value axis from the narrowest to the widest width
 * tried, one tick per bit, so a marker at a width sits at that width on every chart.
 */
function widthAxis(widths: readonly number[], gridIndex: number, name: string, labelled: boolean) {
  const min = Math.min(...widths);
  const max = Math.max(...widths);
  return {
    type: 'value',
    gridIndex,
    min,
    max,
    interval: max - min > 24 ? 2 : 1,
    name,
    nameLocation: 'middle',
    nameGap: 24,
    axisLabel: { show: labelled, formatter: (v: number) => String(v) },
    splitLine: { show: true, lineStyle: { color: CHART_COLORS.grid } },
  };
}

function cheapestMark(bits: number | null, labelled: boolean) {
  if (bits === null) return [];
  return [{ xAxis: bits, label: labelled ? { formatter: `cheapest: ${bits} bits`, position: 'end' } : { show: false }, lineStyle: { color: CHART_COLORS.pass, width: 2, type: 'solid' } }];
}

/** Stability (1 stable, 0 not), phase margin and response error against coefficient width. */
export function coefficientCurveOption(r: WordLengthResult): EChartsCoreOption {
  const curve = r.coefficients.curve;
  const x = curve.map((p) => p.coefficientBits);
  const mark = r.coefficients.minBits;
  const at = <T>(f: (p: (typeof curve)[number]) => T): [number, T][] => curve.map((p) => [p.coefficientBits, f(p)]);
  // The top chart's marker carries the label, just above the grid; no legend shares that band.
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
    xAxis: grids.map((_, i) => widthAxis(x, i, i === 2 ? 'Coefficient width (bits)' : '', i === 2)),
    yAxis: [
      { type: 'value', gridIndex: 0, min: 0, max: 1, interval: 1, name: 'Stable', nameLocation: 'middle', nameGap: 44, axisLabel: { formatter: (v: number) => (v === 1 ? 'yes' : 'no') } },
      { type: 'value', gridIndex: 1, name: 'Phase margin (°)', nameLocation: 'middle', nameGap: 44, scale: true },
      { type: 'log', gridIndex: 2, name: 'Response error', nameLocation: 'middle', nameGap: 44, logBase: 10, axisLabel: { formatter: siTick('dB', 2) } },
    ],
    series: [
      { type: 'line', step: 'middle', name: 'Stable', xAxisIndex: 0, yAxisIndex: 0, data: at((p) => (p.stable ? 1 : 0)), color: CHART_COLORS.float, markLine: { symbol: 'none', silent: true, data: cheapestMark(mark, true) } },
      {
        type: 'line',
        name: 'Phase margin',
        xAxisIndex: 1,
        yAxisIndex: 1,
        // An unstable loop has no phase margin: no point is drawn for it.
        data: at((p) => (p.stable ? finiteOrNull(p.phaseMarginDeg) : null)),
        color: CHART_COLORS.float,
        markLine: {
          symbol: 'none',
          silent: true,
          data: [
            ...cheapestMark(mark, false),
            ...(r.reference.phaseMarginDeg === null ? [] : [{ yAxis: r.reference.phaseMarginDeg, label: { formatter: 'unquantised', position: 'insideEndTop' }, lineStyle: { color: CHART_COLORS.reference, type: 'dashed' } }]),
          ],
        },
      },
      {
        type: 'line',
        name: 'Response error',
        xAxisIndex: 2,
        yAxisIndex: 2,
        data: at((p) => {
          const v = finiteOrNull(p.maxDeviationDb);
          return v === null ? null : Math.max(v, 1e-6);
        }),
        color: CHART_COLORS.fixed,
        markLine: {
          symbol: 'none',
          silent: true,
          data: [
            ...cheapestMark(mark, false),
            { yAxis: r.tolerances.responseDb, label: { formatter: `tolerance ${r.tolerances.responseDb} dB`, position: 'insideEndTop' }, lineStyle: { color: CHART_COLORS.fail, type: 'dashed' } },
          ],
        },
      },
    ],
  };
}

/** Steady-state phase error and jitter of the bit-true loop against data width, with the predicted roundoff SNR on the right. */
export function dataCurveOption(r: WordLengthResult): EChartsCoreOption | null {
  const d = r.data;
  if (!d) return null;
  const x = d.curve.map((p) => p.dataBits);
  return {
    animation: chartAnimation(),
    tooltip: { trigger: 'axis' },
    // The legend sits at the bottom, so the marker's label above the grid has the top band to itself.
    legend: { bottom: 0 },
    grid: { left: 64, right: 64, top: 30, bottom: 64 },
    xAxis: widthAxis(x, 0, 'Data width (bits)', true),
    yAxis: [
      { type: 'value', name: 'Phase error (°)', nameLocation: 'middle', nameGap: 44, scale: true },
      // The noise model's prediction at each width (no simulation): 6 dB more per bit.
      { type: 'value', name: 'Roundoff SNR (dB)', nameLocation: 'middle', nameGap: 44, scale: true, position: 'right', splitLine: { show: false } },
    ],
    series: [
      {
        type: 'line',
        name: 'Steady-state error',
        data: d.curve.map((p) => [p.dataBits, p.steadyStatePhaseErrorDeg]),
        color: CHART_COLORS.fixed,
        markLine: { symbol: 'none', silent: true, data: cheapestMark(d.minBits, true) },
      },
      { type: 'line', name: 'Jitter (RMS)', data: d.curve.map((p) => [p.dataBits, p.phaseJitterDeg]), color: CHART_COLORS.analog },
      {
        type: 'line',
        name: 'Predicted roundoff SNR',
        yAxisIndex: 1,
        lineStyle: { type: 'dashed' },
        data: d.curve.map((p) => [p.dataBits, finiteOrNull(p.predictedSnrDb)]),
        color: CHART_COLORS.reference,
      },
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

/** "Coefficient width 17 bits, data width 14 bits": the edits in the form's own labels and units. */
export function widthEditsText(edits: Readonly<Record<string, string>>): string {
  return Object.entries(edits)
    .map(([path, value], i) => {
      const field = fieldAt(path);
      const label = field ? (i === 0 ? field.label : field.label.toLowerCase()) : path;
      return `${label} ${value}${field?.unit === 'bits' ? ' bits' : ''}`;
    })
    .join(', ');
}

export interface WidthVerdictRow {
  readonly key: string;
  readonly width: string;
  readonly result: 'passes' | 'fails';
  readonly reason: string;
  /** Predicted roundoff SNR and jitter at a data width ('' for coefficient widths). */
  readonly snr: string;
}

/** "74.5 dB, 0.018° RMS": the noise model's SNR and jitter at a data width. */
function predictedNoiseText(p: { readonly predictedSnrDb: number | null; readonly predictedPhaseJitterDeg: number | null }): string {
  if (p.predictedSnrDb === null || p.predictedPhaseJitterDeg === null) return 'loop does not settle';
  return `${fmtFixed(p.predictedSnrDb, 1, 'dB')}, ${fmtSig(p.predictedPhaseJitterDeg, 2)}° RMS`;
}

/** A reason list as one sentence: "Unstable; phase margin off by 3.10° …" with a capital and a full stop. */
function sentence(reasons: readonly string[]): string {
  const text = reasons.join('; ');
  return text ? `${text.charAt(0).toUpperCase()}${text.slice(1)}.` : '';
}

/**
 * Why each width tried passes or fails, in the search's own words (its per-point reasons). A width that
 * passes below a wider one that fails is not taken: the search's cheapest width is the one from which
 * every wider width passes, so the row says which wider width fails.
 */
export function widthVerdictRows(r: WordLengthResult): WidthVerdictRow[] {
  const rows = <P extends { readonly passes: boolean; readonly reasons: readonly string[] }>(
    curve: readonly P[],
    width: (p: P) => number,
    kind: string,
    minBits: number | null,
    snr: (p: P) => string = () => '',
  ): WidthVerdictRow[] =>
    curve.map((p) => {
      const bits = width(p);
      const widerFail = p.passes && (minBits === null || bits < minBits) ? curve.filter((q) => !q.passes && width(q) > bits).map(width).pop() : undefined;
      const reason = !p.passes
        ? sentence(p.reasons)
        : widerFail === undefined
          ? 'Meets every criterion.'
          : `Meets every criterion, but ${widerFail} bits fails, so the search does not take a width below ${widerFail + 1} bits.`;
      return { key: `${kind}${bits}`, width: `${kind} ${bits} bits`, result: p.passes ? 'passes' : 'fails', reason, snr: snr(p) };
    });
  return [
    ...rows(r.coefficients.curve, (p) => p.coefficientBits, 'Coefficients', r.coefficients.minBits),
    ...rows(r.data?.curve ?? [], (p) => p.dataBits, 'Data', r.data?.minBits ?? null, predictedNoiseText),
  ];
}
