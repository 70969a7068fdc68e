/**
 * Bode plot of the open loop: magnitude (dB) above, phase (degrees) below, log frequency axis
 * shared by both; analog prototype dashed, discrete loop solid; crossover and the −180° point
 * marked, with the margins written beside them.
 */
import type { EChartsCoreOption } from 'echarts/core';
import { CHART_COLORS } from './echarts.ts';
import { fmtHz } from '../lib/format.ts';
import { keptIndices } from './thinLine.ts';
import { flatExtent, type ChartView, type LayeredOption } from './layers.ts';

export interface BodeTrace {
  readonly label: string;
  readonly freqHz: readonly number[];
  readonly magnitudeDb: readonly number[];
  readonly phaseDeg: readonly number[];
  readonly style: 'analog' | 'discrete' | 'quantised';
  /** Overrides the style's colour (two releases overlaid in one plot). */
  readonly color?: string;
}

export interface BodeMarkers {
  readonly crossoverHz: number | null;
  readonly phaseMarginDeg: number | null;
  /** Where the phase reaches −180° (gain margin is read there). */
  readonly phaseCrossoverHz: number | null;
  readonly gainMarginDb: number | null;
  readonly nyquistHz: number | null;
}

const STYLE = {
  analog: { color: CHART_COLORS.analog, type: 'dashed' as const, width: 1.5 },
  discrete: { color: CHART_COLORS.float, type: 'solid' as const, width: 2 },
  quantised: { color: CHART_COLORS.fixed, type: 'dotted' as const, width: 1.5 },
};

/** A point a plot can draw: finite y, and x > 0 (a log axis) unless `fromZero` (a time axis). */
function drawable(x: number, y: number, fromZero: boolean): boolean {
  return (fromZero ? x >= 0 : x > 0) && Number.isFinite(y);
}

/** The drawable [x, y] points. */
export function pairs(x: readonly number[], y: readonly number[], fromZero = false): [number, number][] {
  const out: [number, number][] = [];
  const n = Math.min(x.length, y.length);
  for (let i = 0; i < n; i++) {
    const xi = x[i] as number;
    const yi = y[i] as number;
    if (drawable(xi, yi, fromZero)) out.push([xi, yi]);
  }
  return out;
}

/**
 * The same points as `pairs`, flat in one typed array (x0, y0, x1, y1, …), which ECharts reads as
 * two-dimensional data. ECharts deep-copies every option it is given, array by array, and walks each
 * point of plain data for old-style settings; a typed array it takes as one value. The Bode plot is
 * redrawn on every keystroke, and its six series of a few hundred [f, y] pairs each were most of that
 * copying.
 */
export function flatPairs(x: readonly number[], y: readonly number[]): Float64Array {
  const n = Math.min(x.length, y.length);
  const out = new Float64Array(2 * n);
  let k = 0;
  for (let i = 0; i < n; i++) {
    const xi = x[i] as number;
    const yi = y[i] as number;
    if (drawable(xi, yi, false)) {
      out[k++] = xi;
      out[k++] = yi;
    }
  }
  return k === out.length ? out : out.slice(0, k);
}

/**
 * How far (vertically, as a fraction of the axis span) a point left out may lie from the line drawn
 * without it: a ten-thousandth is under 0.1 px on a plot 1000 px tall, so the line looks the same.
 */
const THIN_FRACTION = 1e-4;

/** `flatPairs` of the points that bend the line on the log-frequency axis (thinLine.ts). */
function thinnedPairs(x: readonly number[], y: readonly number[], toleranceY: number): Float64Array {
  const all = flatPairs(x, y);
  const n = all.length / 2;
  const logX = new Float64Array(n);
  const ys = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    logX[i] = Math.log10(all[2 * i] as number);
    ys[i] = all[2 * i + 1] as number;
  }
  const kept = keptIndices(logX, ys, toleranceY);
  if (kept.length === n) return all;
  const out = new Float64Array(2 * kept.length);
  kept.forEach((i, k) => {
    out[2 * k] = all[2 * i] as number;
    out[2 * k + 1] = all[2 * i + 1] as number;
  });
  return out;
}

function finiteSpan(arrays: readonly (readonly number[])[], floor = -Infinity): number {
  let lo = Infinity;
  let hi = -Infinity;
  for (const a of arrays) {
    for (const v of a) {
      if (!Number.isFinite(v) || v <= floor) continue;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  }
  return hi > lo ? hi - lo : 0;
}

function markerLines(m: BodeMarkers, axis: 'mag' | 'phase'): object[] {
  const lines: object[] = [];
  if (m.crossoverHz !== null) {
    const text = axis === 'phase' && m.phaseMarginDeg !== null ? `PM ${m.phaseMarginDeg.toFixed(1)}°` : `fc ${fmtHz(m.crossoverHz, 3)}`;
    lines.push({ xAxis: m.crossoverHz, label: { formatter: text, position: 'insideEndTop' }, lineStyle: { color: CHART_COLORS.marker } });
  }
  if (m.phaseCrossoverHz !== null) {
    const text = axis === 'mag' && m.gainMarginDb !== null ? `GM ${m.gainMarginDb.toFixed(1)} dB` : '−180°';
    lines.push({ xAxis: m.phaseCrossoverHz, label: { formatter: text, position: 'insideEndBottom' }, lineStyle: { color: CHART_COLORS.fail, type: 'dashed' } });
  }
  if (m.nyquistHz !== null) {
    lines.push({ xAxis: m.nyquistHz, label: { formatter: 'fs/2', position: 'insideEndTop' }, lineStyle: { color: CHART_COLORS.reference, type: 'dotted' } });
  }
  lines.push(axis === 'mag' ? { yAxis: 0, label: { show: false } } : { yAxis: -180, label: { show: false } });
  return lines;
}

/**
 * Lower limit of the magnitude axis: a bilinear zero at Nyquist sends the discrete response to the
 * dB floor there; showing that would squash everything else, so the axis stops 40 dB below the
 * lowest point above MAG_FLOOR_DB (and never below it).
 */
const MAG_FLOOR_DB = -160;

export function magnitudeAxisMin(traces: readonly BodeTrace[]): number {
  let lowest = Infinity;
  for (const t of traces) for (const v of t.magnitudeDb) if (v > MAG_FLOOR_DB && v < lowest) lowest = v;
  if (!Number.isFinite(lowest)) return MAG_FLOOR_DB;
  return Math.max(MAG_FLOOR_DB, Math.floor((lowest - 10) / 20) * 20);
}

const GRID_LEFT_PX = 62;
const GRID_RIGHT_PX = 30;

export interface BodeOptionSettings {
  /**
   * Draw only the points that bend each line (`thinnedPairs`): the same picture, but the axis tooltip
   * and its highlighted points snap to the points drawn, so a plot being hovered wants every point.
   */
  readonly thin?: boolean;
}

/** The axis options that decide an axis's scale, the same in the plot and its frame (layers.ts). */
function scaleAxes(magMin: number) {
  return {
    xAxis: [0, 1].map((gridIndex) => ({ type: 'log', gridIndex })),
    yAxis: [
      { type: 'value', gridIndex: 0, min: magMin },
      { type: 'value', gridIndex: 1 },
    ],
  };
}

// Fixed margins, with room for the axis names and for the widest end label of a log axis (seven
// characters, '100 kHz'): ECharts' default outer-bounds layout measures every axis label a second
// time on each redraw only to shrink the grid until they fit, about a fifth of an in-place update
// of this plot in Chromium's trace, and it made the plot's width change with the sample rate.
const GRID = [
  { left: GRID_LEFT_PX, right: GRID_RIGHT_PX, top: 28, height: '36%', outerBoundsMode: 'none' },
  { left: GRID_LEFT_PX, right: GRID_RIGHT_PX, top: '58%', bottom: 36, outerBoundsMode: 'none' },
];

/** The plot's axes carry its scales and pointer labels; the frame draws everything else of them. */
const HIDDEN_AXIS_PARTS = { axisLine: { show: false }, axisTick: { show: false }, axisLabel: { show: false }, splitLine: { show: false }, minorSplitLine: { show: false } };

/**
 * The plot's parts that do not change from one update to the next are the same objects each time
 * (constants, or the last value built for the same input): LwChart's mergeSeries hands ECharts only
 * the series and the parts that are new objects, and ECharts merges nothing else into its model.
 */
const PLOT_TOOLTIP = { trigger: 'axis', axisPointer: { type: 'cross' } };
/**
 * A trace's magnitude and phase share its name, and the axis tooltip lists both under one frequency:
 * each value carries its unit (series-level formatters, which the axis tooltip reads per series).
 */
const withUnit = (unit: string) => ({ valueFormatter: (v: unknown) => (typeof v === 'number' ? `${v.toFixed(2)}${unit}` : String(v)) });
const MAGNITUDE_TOOLTIP = withUnit(' dB');
const PHASE_TOOLTIP = withUnit('°');
const PLOT_AXIS_POINTER = { link: [{ xAxisIndex: 'all' }] };
const PLOT_X_AXES = scaleAxes(0).xAxis.map((a) => ({ ...a, ...HIDDEN_AXIS_PARTS, axisPointer: { label: { formatter: ({ value }: { value: number }) => fmtHz(value, 4) } } }));
const PLOT_ZOOM = [{ type: 'inside', xAxisIndex: [0, 1], filterMode: 'none' }];

interface Reused<T> {
  key?: string;
  value?: T;
}
const lastLegend: Reused<object> = {};
const lastPlotYAxes: Reused<object[]> = {};

function reused<T>(slot: Reused<T>, key: string, build: () => T): T {
  if (slot.key !== key || slot.value === undefined) {
    slot.key = key;
    slot.value = build();
  }
  return slot.value;
}

/**
 * The Bode plot as two layers (layers.ts): the traces, marker lines, legend, tooltip and zoom in the
 * plot; the axes' lines, ticks, labels, grid lines and names in the frame beneath it.
 */
export function bodeOption(traces: readonly BodeTrace[], markers: BodeMarkers, settings: BodeOptionSettings = {}): LayeredOption {
  const magMin = magnitudeAxisMin(traces);
  // The spans of what the axes show (the data's, at most the axes' own): the tolerances stay under them.
  const magTolerance = settings.thin ? THIN_FRACTION * finiteSpan(traces.map((t) => t.magnitudeDb), magMin) : 0;
  const phaseTolerance = settings.thin ? THIN_FRACTION * finiteSpan(traces.map((t) => t.phaseDeg)) : 0;
  const extents: { name: string; grid: number; extent: ReturnType<typeof flatExtent> }[] = [];
  const series = traces.flatMap((t, index) => {
    const lineStyle = t.color ? { ...STYLE[t.style], color: t.color } : STYLE[t.style];
    // ECharts reads typed-array data only with its dimensions named (flatPairs: x, y per point).
    const common = { type: 'line', name: t.label, showSymbol: false, lineStyle, color: lineStyle.color, animation: false, dimensions: ['x', 'y'] };
    const first = index === 0;
    const magnitude = settings.thin ? thinnedPairs(t.freqHz, t.magnitudeDb, magTolerance) : flatPairs(t.freqHz, t.magnitudeDb);
    const phase = settings.thin ? thinnedPairs(t.freqHz, t.phaseDeg, phaseTolerance) : flatPairs(t.freqHz, t.phaseDeg);
    extents.push({ name: t.label, grid: 0, extent: flatExtent(magnitude) }, { name: t.label, grid: 1, extent: flatExtent(phase) });
    return [
      {
        ...common,
        // Ids let an update replace each trace in place (LwChart mergeSeries).
        id: `${t.label}/magnitude`,
        xAxisIndex: 0,
        yAxisIndex: 0,
        tooltip: MAGNITUDE_TOOLTIP,
        data: magnitude,
        ...(first ? { markLine: { symbol: 'none', silent: true, data: markerLines(markers, 'mag') } } : {}),
      },
      {
        ...common,
        id: `${t.label}/phase`,
        xAxisIndex: 1,
        yAxisIndex: 1,
        tooltip: PHASE_TOOLTIP,
        data: phase,
        ...(first ? { markLine: { symbol: 'none', silent: true, data: markerLines(markers, 'phase') } } : {}),
      },
    ];
  });
  const scales = scaleAxes(magMin);
  const hzLabel = { formatter: (v: number) => fmtHz(v, 3), hideOverlap: true };
  const labels = traces.map((t) => t.label);
  const plot = {
    // Never animated, not only under test (chartAnimation): the editor redraws this plot on every
    // keystroke, and a second of sliding axis labels and marker lines after each one would show the
    // new figures late and keep the main thread painting while the next edit is analysed.
    animation: false,
    legend: reused(lastLegend, JSON.stringify(labels), () => ({ top: 0, data: labels })),
    tooltip: PLOT_TOOLTIP,
    axisPointer: PLOT_AXIS_POINTER,
    grid: GRID,
    xAxis: PLOT_X_AXES,
    yAxis: reused(lastPlotYAxes, String(magMin), () => scales.yAxis.map((a) => ({ ...a, ...HIDDEN_AXIS_PARTS }))),
    dataZoom: PLOT_ZOOM,
    series,
  };
  const frame = (view: ChartView): EChartsCoreOption => ({
    animation: false,
    grid: GRID,
    xAxis: scales.xAxis.map((a, i) => ({
      ...a,
      name: i === 1 ? 'Frequency' : '',
      nameLocation: 'middle',
      nameGap: 22,
      axisLabel: hzLabel,
      splitLine: { show: true, lineStyle: { color: CHART_COLORS.grid } },
      minorSplitLine: { show: true, lineStyle: { color: '#f1eee7' } },
    })),
    yAxis: scales.yAxis.map((a, i) => ({
      ...a,
      name: i === 0 ? 'Magnitude (dB)' : 'Phase (°)',
      nameLocation: 'middle',
      nameGap: 40,
      ...(i === 0 ? { axisLabel: { showMinLabel: false } } : {}),
      splitLine: { lineStyle: { color: CHART_COLORS.grid } },
    })),
    dataZoom: [{ type: 'inside', xAxisIndex: [0, 1], filterMode: 'none', disabled: true, start: view.zoomPercent[0], end: view.zoomPercent[1] }],
    series: [0, 1].map((grid) => ({
      type: 'line',
      xAxisIndex: grid,
      yAxisIndex: grid,
      silent: true,
      showSymbol: false,
      animation: false,
      lineStyle: { opacity: 0 },
      data: extentCorners(extents.filter((e) => e.grid === grid && view.shown(e.name)).map((e) => e.extent)),
    })),
  });
  return { plot, frame };
}

/** Two points holding the smallest and the largest x and y of all the extents. */
function extentCorners(extents: readonly ReturnType<typeof flatExtent>[]): [number, number][] {
  let x0 = Infinity;
  let x1 = -Infinity;
  let y0 = Infinity;
  let y1 = -Infinity;
  for (const e of extents) {
    if (!e) continue;
    x0 = Math.min(x0, e.x[0]);
    x1 = Math.max(x1, e.x[1]);
    y0 = Math.min(y0, e.y[0]);
    y1 = Math.max(y1, e.y[1]);
  }
  return x0 <= x1 ? [[x0, y0], [x1, y1]] : [];
}
