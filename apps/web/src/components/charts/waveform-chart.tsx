/**
 * A time waveform in g. When the capture clipped, the ADC rails are drawn as solid lines
 * with labels, so the flattened peaks can be seen against them.
 */
import { useMemo } from 'react';
import { axisStyle, chartColours, formatValue, monoFont, zoomSliderStyle } from './chart-theme.ts';
import type { ChartOption } from './echarts.ts';
import { useEChart } from './use-echart.ts';

export interface WaveformChartProps {
  values: Float32Array;
  sampleRateHz: number;
  /** ADC rails in g, drawn when `showRails`. */
  rails: { lowG: number; highG: number };
  showRails: boolean;
  height?: number;
  ariaLabel: string;
}

export function buildWaveformOption(p: WaveformChartProps): ChartOption {
  const dtMs = 1000 / p.sampleRateHz;
  const data: [number, number][] = new Array(p.values.length);
  for (let i = 0; i < p.values.length; i++) {
    const v = p.values[i]!;
    data[i] = [i * dtMs, v];
  }
  const ax = axisStyle();
  const railLines = p.showRails
    ? [
        { y: p.rails.highG, text: `ADC rail +${formatValue(p.rails.highG)} g` },
        { y: p.rails.lowG, text: `ADC rail ${formatValue(p.rails.lowG)} g` },
      ].map((r) => ({
        yAxis: r.y,
        name: r.text,
        label: {
          formatter: r.text,
          position: 'insideEndTop' as const,
          color: chartColours.danger,
          fontFamily: monoFont,
          fontSize: 11,
        },
        lineStyle: { color: chartColours.danger, type: 'solid' as const, width: 1.5 },
      }))
    : [];
  const yLimit = p.showRails ? Math.max(Math.abs(p.rails.lowG), p.rails.highG) * 1.08 : undefined;
  return {
    animation: false,
    grid: { left: 64, right: 28, top: 20, bottom: 64 },
    tooltip: {
      trigger: 'axis',
      textStyle: { fontFamily: monoFont, fontSize: 12 },
      valueFormatter: (v) => (typeof v === 'number' ? `${formatValue(v, 4)} g` : String(v)),
    },
    xAxis: {
      type: 'value',
      name: 'ms',
      min: 0,
      max: (p.values.length - 1) * dtMs,
      ...ax,
      axisLabel: { ...ax.axisLabel, formatter: (v: number) => formatValue(v), hideOverlap: true },
      splitLine: { show: false },
    },
    yAxis: {
      type: 'value',
      name: 'g',
      min: yLimit !== undefined ? -yLimit : undefined,
      max: yLimit,
      ...ax,
      axisLabel: { ...ax.axisLabel, formatter: (v: number) => formatValue(v) },
    },
    dataZoom: [
      { type: 'inside', xAxisIndex: 0, filterMode: 'none' },
      { type: 'slider', xAxisIndex: 0, ...zoomSliderStyle() },
    ],
    series: [
      {
        name: 'Acceleration',
        type: 'line',
        data,
        showSymbol: false,
        sampling: 'lttb',
        lineStyle: { color: chartColours.accent, width: 1 },
        itemStyle: { color: chartColours.accent },
        markLine: railLines.length
          ? { symbol: ['none', 'none'], silent: true, animation: false, data: railLines }
          : undefined,
      },
    ],
  };
}

export function WaveformChart(props: WaveformChartProps) {
  const { values, sampleRateHz, rails, showRails } = props;
  const option = useMemo(
    () => buildWaveformOption({ values, sampleRateHz, rails, showRails, ariaLabel: '' }),
    [values, sampleRateHz, rails, showRails],
  );
  const { ref } = useEChart(option);
  return (
    <div
      ref={ref}
      role="img"
      aria-label={props.ariaLabel}
      className="w-full"
      style={{ height: props.height ?? 300 }}
    />
  );
}
