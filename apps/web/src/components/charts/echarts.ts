/**
 * ECharts through `echarts/core` with what every Turnstone chart uses (line and scatter
 * series, grid, tooltip, zoom, mark lines/areas, legend, canvas renderer). A chart that needs
 * more registers it beside itself (the vector charts' polar axes: `echarts-polar.ts`), so
 * the other charts' pages do not load it. Only the chart components import this module, and
 * only lazily loaded pages import them, so ECharts stays out of the first download.
 */
import * as echarts from 'echarts/core';
import { LineChart, ScatterChart } from 'echarts/charts';
import {
  DataZoomComponent,
  GridComponent,
  LegendComponent,
  MarkAreaComponent,
  MarkLineComponent,
  TooltipComponent,
} from 'echarts/components';
import { CanvasRenderer } from 'echarts/renderers';
import type { ComposeOption } from 'echarts/core';
import type { LineSeriesOption, ScatterSeriesOption } from 'echarts/charts';
import type {
  DataZoomComponentOption,
  GridComponentOption,
  LegendComponentOption,
  MarkAreaComponentOption,
  MarkLineComponentOption,
  PolarComponentOption,
  TooltipComponentOption,
} from 'echarts/components';

echarts.use([
  LineChart,
  ScatterChart,
  GridComponent,
  TooltipComponent,
  DataZoomComponent,
  LegendComponent,
  MarkLineComponent,
  MarkAreaComponent,
  CanvasRenderer,
]);

export type ChartOption = ComposeOption<
  | LineSeriesOption
  | ScatterSeriesOption
  | GridComponentOption
  | TooltipComponentOption
  | DataZoomComponentOption
  | LegendComponentOption
  | MarkLineComponentOption
  | MarkAreaComponentOption
  | PolarComponentOption
>;

export type { LineSeriesOption, ScatterSeriesOption };
export { echarts };
