/**
 * A chart drawn as two stacked ECharts instances: the plot on top (its series, marker lines, legend,
 * tooltip and zoom, on axes whose lines, ticks, labels and grid lines are hidden) and, beneath it, the
 * frame (those axes drawn, with the axis names). ECharts redraws every part of a chart on each update;
 * the Bode plot is updated on every keystroke while its axes seldom change, and drawing them was about
 * a third of the update (axis layout, axis views, their paint). The frame is drawn again only when the
 * plot's axes changed (`axesSignature`).
 *
 * The frame's axes must come out exactly as the plot's: it is given the same axis options and, as
 * series it never shows, the corners of the data's extent on each grid (ECharts scales an axis from
 * the data's minimum and maximum only), of the traces the plot's legend shows, and the plot's zoom
 * window; ECharts then makes the same nice extents and ticks from the same numbers.
 */
import type { EChartsCoreOption } from 'echarts/core';

/** What the frame is drawn for: which series the plot's legend shows, and its x zoom window. */
export interface ChartView {
  shown(seriesName: string): boolean;
  /** The zoom window as percentages of the data's x extent (0 and 100 unzoomed). */
  readonly zoomPercent: readonly [number, number];
}

export interface LayeredOption {
  readonly plot: EChartsCoreOption;
  readonly frame: (view: ChartView) => EChartsCoreOption;
}

/**
 * The parts of an ECharts instance's model read here. They are not public API (ECharts 6.1), so each
 * is read defensively: anything missing makes the frame draw on every plot update, never go stale.
 */
interface ScaleLike {
  getExtent(): number[];
  getTicks(): { value: number }[];
}
interface ComponentLike {
  axis?: { scale?: ScaleLike };
  isSelected?(name: string): boolean;
  getPercentRange?(): number[];
}
interface ModelLike {
  getComponent(type: string, index?: number): ComponentLike | undefined;
}

function modelOf(chart: object): ModelLike | null {
  const getModel = (chart as { getModel?: () => ModelLike | undefined }).getModel;
  return typeof getModel === 'function' ? (getModel.call(chart) ?? null) : null;
}

/**
 * Every x and y axis's extent and tick values, as text; null when they cannot be read. Equal texts
 * mean the same axes: the same lines, ticks and labels at the same places.
 */
export function axesSignature(chart: object, axisCount = 2): string | null {
  const model = modelOf(chart);
  if (!model) return null;
  const parts: number[][] = [];
  for (const type of ['xAxis', 'yAxis']) {
    for (let i = 0; i < axisCount; i++) {
      const scale = model.getComponent(type, i)?.axis?.scale;
      if (typeof scale?.getExtent !== 'function' || typeof scale.getTicks !== 'function') return null;
      parts.push(scale.getExtent(), scale.getTicks().map((t) => t.value));
    }
  }
  return JSON.stringify(parts);
}

/** The plot's legend and zoom state, for its frame. */
export function chartView(chart: object): ChartView {
  const model = modelOf(chart);
  const legend = model?.getComponent('legend', 0);
  const range = model?.getComponent('dataZoom', 0)?.getPercentRange?.();
  return {
    shown: (name) => (typeof legend?.isSelected === 'function' ? legend.isSelected(name) : true),
    zoomPercent: range && range.length === 2 ? [range[0]!, range[1]!] : [0, 100],
  };
}

/** The smallest and largest x and y of flat (x0, y0, x1, y1, …) points, or null for none. */
export function flatExtent(points: Float64Array): { x: [number, number]; y: [number, number] } | null {
  if (points.length < 2) return null;
  let x0 = Infinity;
  let x1 = -Infinity;
  let y0 = Infinity;
  let y1 = -Infinity;
  for (let i = 0; i + 1 < points.length; i += 2) {
    const x = points[i] as number;
    const y = points[i + 1] as number;
    if (x < x0) x0 = x;
    if (x > x1) x1 = x;
    if (y < y0) y0 = y;
    if (y > y1) y1 = y;
  }
  return { x: [x0, x1], y: [y0, y1] };
}
