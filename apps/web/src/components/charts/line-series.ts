/**
 * A line of many values as the spectrum charts draw it: no point symbols, and down-sampled to
 * the largest value per pixel ('max'), so a narrow peak keeps its height at any zoom.
 */
import type { LineSeriesOption } from './echarts.ts';

export interface LineLook {
  color: string;
  width: number;
  opacity: number;
}

export function manyValuesLine(
  name: string,
  data: LineSeriesOption['data'],
  lineStyle: LineLook,
  more: LineSeriesOption = {},
): LineSeriesOption {
  return { name, type: 'line', data, showSymbol: false, sampling: 'max', lineStyle, ...more };
}
