/**
 * A waterfall of recent spectra: each spectrum is drawn as a line shifted up and to the
 * right by its age, newest in front, filled with the paper colour so nearer traces hide
 * the ones behind (a 3-D look on a 2-D canvas; no WebGL). Zoom keys and a table of each
 * spectrum's largest peaks in the band shown serve the keyboard and screen readers.
 */
import { useEffect, useMemo } from 'react';
import { axisStyle, chartColours, formatValue, monoFont, zoomSliderStyle } from './chart-theme.ts';
import type { ChartOption, LineSeriesOption } from './echarts.ts';
import { largestPeaks, WATERFALL_TABLE_PEAKS } from './chart-values.ts';
import { useEChart } from './use-echart.ts';
import { ValuesTable, type ValuesColumn } from './values-table.tsx';
import { useChartZoom, zoomedExtent, ZoomKeys, type ZoomWindow } from './zoom-keys.tsx';
import { ChartCanvas } from './chart-canvas.tsx';

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

/** The front trace's axis: 0 to the last line of the longest spectrum. */
export function waterfallExtent(traces: readonly WaterfallTrace[]): [number, number] {
  let xMax = 0;
  for (const t of traces) xMax = Math.max(xMax, (t.values.length - 1) * t.step);
  return [0, xMax];
}

/**
 * The waterfall of the band `band` (the front trace's frequencies; all by default): each
 * older trace shifted right by a quarter of the band over the stack and up by its age, so a
 * zoom into a narrow band still shows every capture in it. The zoom works on a hidden second
 * x axis spanning the front trace's whole range; the chart redraws the band it chooses.
 */
export function buildWaterfallOption(
  p: WaterfallChartProps,
  band: readonly [number, number] = waterfallExtent(p.traces),
): ChartOption {
  const [, xMax] = waterfallExtent(p.traces);
  const [a, b] = band;
  const n = p.traces.length;
  // Scale to the median trace's largest line in the band, so one extreme capture (e.g.
  // clipped) does not flatten the rest; its peaks are cut at the top of the chart.
  const maxima = p.traces.map((t) => {
    let m = 0;
    const last = Math.min(t.values.length - 1, Math.ceil(b / t.step));
    for (let k = Math.max(0, Math.floor(a / t.step)); k <= last; k++) m = Math.max(m, t.values[k]!);
    return m;
  });
  const sorted = [...maxima].sort((x, y) => x - y);
  const yRef = sorted[Math.floor(sorted.length / 2)] || 1;
  const dy = (yRef * 0.5) / Math.max(1, Math.sqrt(n) / 2);
  const yTop = (n - 1) * dy + yRef * 1.4;
  const dx = ((b - a) * 0.25) / Math.max(1, n - 1);
  const series: LineSeriesOption[] = [];
  // Oldest drawn first (at the back).
  for (let i = n - 1; i >= 0; i--) {
    const t = p.traces[i]!;
    const first = Math.max(0, Math.floor(a / t.step));
    const last = Math.min(t.values.length - 1, Math.ceil(b / t.step));
    const data: [number, number][] = [];
    for (let k = first; k <= last; k++) data.push([k * t.step + i * dx, t.values[k]! + i * dy]);
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
    xAxis: [
      {
        type: 'value',
        name: p.axis === 'hz' ? 'Hz (front trace)' : 'order (front trace)',
        min: a,
        max: b + (n - 1) * dx,
        ...ax,
        axisLabel: {
          ...ax.axisLabel,
          hideOverlap: true,
          showMaxLabel: false,
          // Four significant digits, no trailing zeros ("30", "62.5").
          formatter: (v: number) => String(Number(v.toPrecision(4))),
        },
        splitLine: { show: false },
      },
      // What the zoom moves: the front trace's whole range, not drawn.
      { type: 'value', min: 0, max: xMax, show: false },
    ],
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
      { type: 'inside', xAxisIndex: 1, filterMode: 'none' },
      { type: 'slider', xAxisIndex: 1, ...zoomSliderStyle(), showDataShadow: false },
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
  const extent = useMemo(() => waterfallExtent(traces), [traces]);
  // Redraw the band the zoom chose; merged, so the zoom (and a slider drag) stays as it is.
  useEffect(() => {
    if (!chart) return;
    const band = zoomedExtent(extent, shown);
    const { dataZoom: _kept, ...drawn } = buildWaterfallOption(
      { traces, axis, unit, ariaLabel: '' },
      band,
    );
    chart.setOption(drawn, { replaceMerge: ['series'] });
  }, [chart, shown, extent, traces, axis, unit]);
  const xUnit = axis === 'hz' ? 'Hz' : 'order';
  return (
    <div className="flex flex-col gap-2">
      <ChartCanvas canvasRef={ref} ariaLabel={props.ariaLabel} height={props.height ?? 420} />
      <div className="px-2">
        <ZoomKeys
          chart={chart}
          shown={shown}
          label="waterfall"
          extent={extent}
          format={(v) => `${formatValue(v, 4)} ${xUnit}`}
        />
      </div>
      <WaterfallValues traces={traces} axis={axis} unit={unit} shown={shown} extent={extent} />
    </div>
  );
}

function WaterfallValues({
  traces,
  axis,
  unit,
  shown,
  extent,
}: {
  traces: readonly WaterfallTrace[];
  axis: 'hz' | 'order';
  unit: string;
  shown: ZoomWindow;
  extent: readonly [number, number];
}) {
  // The band is the zoom's window of the front trace's axis.
  const [from, to] = zoomedExtent(extent, shown);
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
