/**
 * A waterfall of recent spectra: each spectrum is drawn as a line shifted up and to the
 * right by its age, newest in front, filled with the paper colour so nearer traces hide
 * the ones behind (a 3-D look on a 2-D canvas; no WebGL). Zoom keys and a table of each
 * spectrum's largest peaks in the band shown serve the keyboard and screen readers.
 */
import { useMemo } from 'react';
import { axisStyle, chartColours, formatValue, monoFont, zoomSliderStyle } from './chart-theme.ts';
import type { ChartOption, LineSeriesOption } from './echarts.ts';
import { largestPeaks, WATERFALL_TABLE_PEAKS } from './chart-values.ts';
import { useEChart } from './use-echart.ts';
import { ValuesTable, type ValuesColumn } from './values-table.tsx';
import { useChartZoom, xExtent, zoomedExtent, ZoomKeys, type ZoomWindow } from './zoom-keys.tsx';

export interface WaterfallTrace {
  /** When the spectrum was taken, as shown (legend, table). */
  label: string;
  values: Float32Array;
  step: number;
}

export interface WaterfallChartProps {
  /** Newest first. */
  traces: readonly WaterfallTrace[];
  axis: 'hz' | 'order';
  unit: string;
  height?: number;
  ariaLabel: string;
}

export function buildWaterfallOption(p: WaterfallChartProps): ChartOption {
  let xMax = 0;
  const maxima: number[] = [];
  for (const t of p.traces) {
    xMax = Math.max(xMax, (t.values.length - 1) * t.step);
    let m = 0;
    for (const v of t.values) m = Math.max(m, v);
    maxima.push(m);
  }
  const n = p.traces.length;
  // Scale to the median trace, so one extreme capture (e.g. clipped) does not flatten the
  // rest; its peaks are cut at the top of the chart.
  const sorted = [...maxima].sort((a, b) => a - b);
  const yRef = sorted[Math.floor(sorted.length / 2)] || 1;
  const dy = (yRef * 0.5) / Math.max(1, Math.sqrt(n) / 2);
  const yTop = (n - 1) * dy + yRef * 1.4;
  const dx = (xMax * 0.25) / Math.max(1, n - 1);
  const series: LineSeriesOption[] = [];
  // Oldest drawn first (at the back).
  for (let i = n - 1; i >= 0; i--) {
    const t = p.traces[i]!;
    const data: [number, number][] = new Array(t.values.length);
    for (let k = 0; k < t.values.length; k++)
      data[k] = [k * t.step + i * dx, t.values[k]! + i * dy];
    const front = i === 0;
    series.push({
      name: t.label,
      type: 'line',
      data,
      showSymbol: false,
      sampling: 'max',
      silent: true,
      lineStyle: {
        color: front ? chartColours.accent : chartColours.ink,
        width: front ? 1.3 : 0.8,
        opacity: front ? 1 : 0.35 + 0.5 * (1 - i / n),
      },
      areaStyle: { color: chartColours.surface, opacity: 1, origin: i * dy },
      z: n - i,
    });
  }
  const ax = axisStyle();
  return {
    animation: false,
    grid: { left: 56, right: 28, top: 20, bottom: 64 },
    xAxis: {
      type: 'value',
      name: p.axis === 'hz' ? 'Hz (front trace)' : 'order (front trace)',
      min: 0,
      max: xMax + (n - 1) * dx,
      ...ax,
      axisLabel: { ...ax.axisLabel, hideOverlap: true, showMaxLabel: false },
      splitLine: { show: false },
    },
    yAxis: {
      type: 'value',
      name: `${p.unit} (offset by age)`,
      min: 0,
      max: yTop,
      ...ax,
      axisLabel: { show: false },
      splitLine: { show: false },
    },
    textStyle: { fontFamily: monoFont },
    dataZoom: [
      { type: 'inside', xAxisIndex: 0, filterMode: 'none' },
      { type: 'slider', xAxisIndex: 0, ...zoomSliderStyle(), showDataShadow: false },
    ],
    series,
  };
}

export function WaterfallChart(props: WaterfallChartProps) {
  const { traces, axis, unit } = props;
  const option = useMemo(
    () => buildWaterfallOption({ traces, axis, unit, ariaLabel: '' }),
    [traces, axis, unit],
  );
  const { ref, chart } = useEChart(option);
  const shown = useChartZoom(chart, option);
  const xUnit = axis === 'hz' ? 'Hz' : 'order';
  return (
    <div className="flex flex-col gap-2">
      <div
        ref={ref}
        role="img"
        aria-label={props.ariaLabel}
        className="w-full"
        style={{ height: props.height ?? 420 }}
      />
      <div className="px-2">
        <ZoomKeys
          chart={chart}
          shown={shown}
          label="waterfall"
          extent={xExtent(option)}
          format={(v) => `${formatValue(v, 4)} ${xUnit}`}
        />
      </div>
      <WaterfallValues traces={traces} axis={axis} unit={unit} shown={shown} option={option} />
    </div>
  );
}

function WaterfallValues({
  traces,
  axis,
  unit,
  shown,
  option,
}: {
  traces: readonly WaterfallTrace[];
  axis: 'hz' | 'order';
  unit: string;
  shown: ZoomWindow;
  option: ChartOption;
}) {
  // The band is the window of the front trace (the axis's own frequencies), within its lines.
  let xMax = 0;
  for (const t of traces) xMax = Math.max(xMax, (t.values.length - 1) * t.step);
  const [lo, hi] = zoomedExtent(xExtent(option) ?? [0, xMax], shown);
  const from = Math.max(0, lo);
  const to = Math.min(xMax, hi);
  const xUnit = axis === 'hz' ? 'Hz' : 'order';
  const digits = axis === 'hz' ? 2 : 3;
  const band = `${formatValue(from, 4)} to ${formatValue(to, 4)} ${xUnit}`;
  const columns: ValuesColumn[] = [{ header: 'Taken' }];
  const ordinal = ['Largest', 'Second', 'Third', 'Fourth', 'Fifth'];
  for (let i = 0; i < WATERFALL_TABLE_PEAKS; i++) {
    columns.push(
      { header: `${ordinal[i] ?? `Peak ${i + 1}`} peak (${xUnit})`, numeric: true },
      { header: `Amplitude (${unit})`, numeric: true },
    );
  }
  return (
    <ValuesTable
      summary={`Largest peaks as a table (${traces.length} spectra, ${band})`}
      caption={`The ${WATERFALL_TABLE_PEAKS} largest peaks of each spectrum between ${band}, in ${unit}, newest first`}
      note={`Each spectrum's ${WATERFALL_TABLE_PEAKS} largest peaks between ${band} (the band shown for the front trace): line positions and values as drawn. Zoom to choose the band.`}
      label="Waterfall peaks"
      columns={columns}
      rows={() =>
        traces.map((t) => {
          const cells = [t.label];
          const peaks = largestPeaks(t.values, t.step, from, to);
          for (let i = 0; i < WATERFALL_TABLE_PEAKS; i++) {
            const p = peaks[i];
            cells.push(p ? p.x.toFixed(digits) : '—', p ? formatValue(p.value, 4) : '—');
          }
          return cells;
        })
      }
    />
  );
}
