/**
 * Polar axes, registered by the charts that draw on them (the 1× vector): only their page
 * loads this part of ECharts.
 */
import { PolarComponent } from 'echarts/components';
import { echarts } from './echarts.ts';

echarts.use([PolarComponent]);
