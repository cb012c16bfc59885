/**
 * A shaft-order vector (amplitude and phase against the tach pulse) over time: amplitude and
 * phase trended on two stacked grids, and the same captures on a polar plot (phase lag drawn
 * clockwise from the top, amplitude as the radius), the newest marked with a larger symbol.
 */
import { useMemo } from 'react';
import { axisStyle, chartColours, formatValue, monoFont } from './chart-theme.ts';
import { formatDateTime } from '../../lib/format.ts';
import type { ChartOption } from './echarts.ts';
import './echarts-polar.ts';
import { useEChart } from './use-echart.ts';
import { ChartCanvas } from './chart-canvas.tsx';

export interface VectorPoint {
  /** Epoch milliseconds. */
  t: number;
  amplitude: number;
  /** Phase lag, degrees 0–360. */
  phaseDeg: number;
}

interface VectorChartProps {
  points: readonly VectorPoint[];
  /** e.g. "mm/s RMS". */
  unit: string;
  ariaLabel: string;
  height?: number;
}

const timeLabel = (t: number) => formatDateTime(t);

export function buildVectorTrendOption(p: VectorChartProps): ChartOption {
  const ax = axisStyle();
  const amp = p.points.map((x) => [x.t, x.amplitude] as [number, number]);
  const ph = p.points.map((x) => [x.t, x.phaseDeg] as [number, number]);
  const xAxis = (gridIndex: number) => ({
    type: 'time' as const,
    gridIndex,
    ...ax,
    splitLine: { show: false },
    axisLabel: { ...ax.axisLabel, show: gridIndex === 1 },
  });
  return {
    animation: false,
    grid: [
      { left: 64, right: 24, top: 28, height: '38%' },
      { left: 64, right: 24, bottom: 36, height: '32%' },
    ],
    tooltip: {
      trigger: 'axis',
      textStyle: { fontFamily: monoFont, fontSize: 12 },
    },
    axisPointer: { link: [{ xAxisIndex: 'all' }] },
    xAxis: [xAxis(0), xAxis(1)],
    yAxis: [
      {
        type: 'value',
        gridIndex: 0,
        name: `Amplitude (${p.unit})`,
        min: 0,
        ...ax,
        axisLabel: { ...ax.axisLabel, formatter: (v: number) => formatValue(v) },
      },
      {
        type: 'value',
        gridIndex: 1,
        name: 'Phase lag (°)',
        min: 0,
        max: 360,
        interval: 90,
        ...ax,
      },
    ],
    series: [
      {
        name: 'Amplitude',
        type: 'line',
        xAxisIndex: 0,
        yAxisIndex: 0,
        data: amp,
        symbol: 'circle',
        symbolSize: 5,
        lineStyle: { color: chartColours.accent, width: 1.4 },
        itemStyle: { color: chartColours.accent },
        tooltip: { valueFormatter: (v) => `${formatValue(Number(v), 4)} ${p.unit}` },
      },
      {
        name: 'Phase lag',
        type: 'line',
        xAxisIndex: 1,
        yAxisIndex: 1,
        data: ph,
        symbol: 'rect',
        symbolSize: 5,
        lineStyle: { color: chartColours.compare, width: 1.2, type: 'dashed' },
        itemStyle: { color: chartColours.compare },
        tooltip: { valueFormatter: (v) => `${Number(v).toFixed(0)}°` },
      },
    ],
  };
}

export function buildVectorPolarOption(p: VectorChartProps): ChartOption {
  const ax = axisStyle();
  const last = p.points.length - 1;
  return {
    animation: false,
    polar: { radius: '72%', center: ['50%', '54%'] },
    angleAxis: {
      type: 'value',
      min: 0,
      max: 360,
      interval: 45,
      startAngle: 90,
      clockwise: true,
      axisLine: ax.axisLine,
      axisTick: ax.axisTick,
      axisLabel: { ...ax.axisLabel, formatter: (v: number) => `${v}°` },
      splitLine: ax.splitLine,
    },
    // The radius labels run up the 0° line: the unit is named above the chart and the outer
    // and centre labels are left out, so nothing sits on "0°" or on points at the centre.
    radiusAxis: {
      type: 'value',
      min: 0,
      splitNumber: 4,
      axisLine: ax.axisLine,
      axisLabel: {
        ...ax.axisLabel,
        showMinLabel: false,
        showMaxLabel: false,
        formatter: (v: number) => String(Number(v.toPrecision(3))),
      },
      splitLine: ax.splitLine,
    },
    tooltip: {
      trigger: 'item',
      textStyle: { fontFamily: monoFont, fontSize: 12 },
      formatter: (d) => {
        const item = d as unknown as { dataIndex: number };
        const x = p.points[item.dataIndex];
        return x
          ? `${timeLabel(x.t)}<br/>${formatValue(x.amplitude, 4)} ${p.unit} ∠ ${x.phaseDeg.toFixed(0)}°`
          : '';
      },
    },
    series: [
      {
        name: 'Vector',
        type: 'line',
        coordinateSystem: 'polar',
        data: p.points.map((x, i) => ({
          value: [x.amplitude, x.phaseDeg],
          symbolSize: i === last ? 12 : 6,
          symbol: i === last ? 'diamond' : 'circle',
          itemStyle: { color: i === last ? chartColours.danger : chartColours.accent },
        })),
        lineStyle: { color: chartColours.accent, width: 1, opacity: 0.6 },
      },
    ],
  };
}

export function VectorTrendChart(props: VectorChartProps) {
  const { points, unit } = props;
  const option = useMemo(
    () => buildVectorTrendOption({ points, unit, ariaLabel: '' }),
    [points, unit],
  );
  const { ref } = useEChart(option);
  return <ChartCanvas canvasRef={ref} ariaLabel={props.ariaLabel} height={props.height ?? 360} />;
}

export function VectorPolarChart(props: VectorChartProps) {
  const { points, unit } = props;
  const option = useMemo(
    () => buildVectorPolarOption({ points, unit, ariaLabel: '' }),
    [points, unit],
  );
  const { ref } = useEChart(option);
  return (
    <div>
      <p className="text-xs text-ink-muted">Radius: amplitude in {unit}</p>
      <ChartCanvas canvasRef={ref} ariaLabel={props.ariaLabel} height={props.height ?? 360} />
    </div>
  );
}
