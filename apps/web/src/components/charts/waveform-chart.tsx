/**
 * A time waveform in g. When the capture clipped, the ADC rails are drawn as solid lines
 * with labels, so the flattened peaks can be seen against them. Zoom keys and a values
 * table of the window shown serve the keyboard and screen readers.
 */
import { useMemo } from 'react';
import { axisStyle, chartColours, formatValue, monoFont, zoomSliderStyle } from './chart-theme.ts';
import type { ChartOption } from './echarts.ts';
import { useEChart } from './use-echart.ts';
import { WAVEFORM_TABLE_ROWS, waveformRows } from './chart-values.ts';
import { ValuesTable } from './values-table.tsx';
import { useZoomKeys, zoomedExtent, ZoomKeys, type ZoomWindow } from './zoom-keys.tsx';
import { ChartCanvas } from './chart-canvas.tsx';

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
    // Filtering to the window makes the line's down-sampling (LTTB) count only the samples
    // shown: zoomed in, every sample is drawn, not a thinning of the whole capture.
    dataZoom: [
      { type: 'inside', xAxisIndex: 0, filterMode: 'filter' },
      { type: 'slider', xAxisIndex: 0, ...zoomSliderStyle(), filterMode: 'filter' },
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
  const { ref, chart } = useEChart(option);
  const zoom = useZoomKeys(chart, option);
  return (
    <div className="flex flex-col gap-2">
      <ChartCanvas canvasRef={ref} ariaLabel={props.ariaLabel} height={props.height ?? 300} />
      <div className="px-2">
        <ZoomKeys {...zoom} label="waveform" format={(v) => `${formatValue(v, 4)} ms`} />
      </div>
      <WaveformValues values={values} sampleRateHz={sampleRateHz} shown={zoom.shown} />
    </div>
  );
}

function WaveformValues({
  values,
  sampleRateHz,
  shown,
}: {
  values: Float32Array;
  sampleRateHz: number;
  shown: ZoomWindow;
}) {
  const dtMs = 1000 / sampleRateHz;
  const [fromMs, toMs] = zoomedExtent([0, (values.length - 1) * dtMs], shown);
  const first = Math.ceil(fromMs / dtMs - 1e-9);
  const last = Math.floor(toMs / dtMs + 1e-9);
  const inWindow = Math.max(0, Math.min(values.length - 1, last) - Math.max(0, first) + 1);
  const thinned = inWindow > WAVEFORM_TABLE_ROWS;
  const span = `${formatValue(fromMs, 4)} to ${formatValue(toMs, 4)} ms`;
  return (
    <ValuesTable
      summary={`Values as a table (${Math.min(inWindow, WAVEFORM_TABLE_ROWS)} rows, ${span})`}
      caption={`Acceleration in g from ${span}, ${inWindow} samples${thinned ? `, each row the largest of about ${Math.round(inWindow / WAVEFORM_TABLE_ROWS)} samples` : ''}`}
      note={
        thinned
          ? `${inWindow} samples in the window shown: each row is the sample of largest magnitude in a run of about ${Math.round(inWindow / WAVEFORM_TABLE_ROWS)}, so peaks are kept. Zoom in to read every sample.`
          : `Every sample in the window shown (${inWindow}).`
      }
      label="Waveform values"
      columns={[
        { header: 'Sample', numeric: true },
        { header: 'Time (ms)', numeric: true },
        { header: 'Acceleration (g)', numeric: true },
      ]}
      rows={() =>
        waveformRows(values, first, last).rows.map((r) => [
          String(r.index),
          (r.index * dtMs).toFixed(3),
          formatValue(r.value, 4),
        ])
      }
    />
  );
}
