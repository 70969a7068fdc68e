import type { EChartsCoreOption } from 'echarts/core';

/**
 * What an in-place update (merge, series replaced by id) hands ECharts: the series and every other
 * top-level part that is not the very object handed last time; null when a part the last option had
 * is gone, which only the whole option can say. Builders keep unchanged parts as the same objects
 * (bodeOption), and ECharts merges nothing it was not given into its model.
 */
export function changedParts(next: EChartsCoreOption, last: EChartsCoreOption): EChartsCoreOption | null {
  for (const key of Object.keys(last)) if (!(key in next)) return null;
  const patch: EChartsCoreOption = {};
  for (const [key, value] of Object.entries(next)) if (key === 'series' || value !== last[key]) patch[key] = value;
  return patch;
}
