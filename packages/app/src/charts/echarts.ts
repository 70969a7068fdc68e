/**
 * ECharts, registered piecemeal: only the line chart, the components the plots use and the
 * canvas renderer, so routes with charts stay small and the others carry none of it.
 */
import { use } from 'echarts/core';
import { LineChart, ScatterChart } from 'echarts/charts';
import {
  DataZoomComponent,
  GridComponent,
  LegendComponent,
  MarkLineComponent,
  MarkPointComponent,
  TitleComponent,
  TooltipComponent,
} from 'echarts/components';
import { CanvasRenderer } from 'echarts/renderers';

use([
  LineChart,
  ScatterChart,
  GridComponent,
  TooltipComponent,
  LegendComponent,
  DataZoomComponent,
  MarkLineComponent,
  MarkPointComponent,
  TitleComponent,
  CanvasRenderer,
]);

/** Screenshots in browser tests must not catch a half-drawn chart. */
export function chartAnimation(): boolean {
  return !(typeof navigator !== 'undefined' && navigator.webdriver);
}

export const CHART_COLORS = {
  float: '#2f7d6d',
  fixed: '#c05621',
  reference: '#6b7280',
  analog: '#8a6fb0',
  grid: '#e6e2d8',
  pass: '#2f855a',
  fail: '#c0392b',
  marker: '#b7791f',
} as const;
