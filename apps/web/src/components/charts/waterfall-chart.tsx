/**
 * A waterfall of recent spectra: each spectrum is drawn as a line shifted up and to the
 * right by its age, newest in front, filled with the paper colour so nearer traces hide
 * the ones behind (a 3-D look on a 2-D canvas; no WebGL). The left axis is the amplitude of
 * the front trace (every trace has the same scale, raised by its age), the right axis names
 * each capture's date, the top axis reads orders of the front trace's running speed. A
 * pointer over a trace reads out its line (frequency, order, amplitude, capture date); a span
 * in orders, zoom keys and a table of each spectrum's largest peaks serve the keyboard.
 */
import { useEffect, useMemo, useState } from 'react';
import { axisStyle, chartColours, formatValue, monoFont, zoomSliderStyle } from './chart-theme.ts';
import type { ChartOption, echarts, LineSeriesOption } from './echarts.ts';
import { largestPeaks, WATERFALL_TABLE_PEAKS } from './chart-values.ts';
import { manyValuesLine } from './line-series.ts';
import { useEChart } from './use-echart.ts';
import { ValuesTable, type ValuesColumn } from './values-table.tsx';
import { useChartZoom, zoomedExtent, ZoomKeys, type ZoomWindow } from './zoom-keys.tsx';
import { ChartCanvas } from './chart-canvas.tsx';
import {
  drawnAt,
  hzAndOrder,
  niceTicks,
  pickWaterfall,
  waterfallExtent,
  waterfallLayout,
  type WaterfallLayout,
  type WaterfallPick,
} from './waterfall-layout.ts';

export { waterfallExtent } from './waterfall-layout.ts';

export interface WaterfallTrace {
  /** When the spectrum was taken, as shown (readout, table). */
  label: string;
  /** The same, short, for the depth axis. */
  short: string;
  values: Float32Array;
  step: number;
  /** The capture's running speed (1×, Hz); null when not known. */
  shaftHz: number | null;
}

export interface WaterfallChartProps {
  /** Newest first. */
  traces: readonly WaterfallTrace[];
  axis: 'hz' | 'order';
  unit: string;
  /** How amplitudes are stated, e.g. "RMS". */
  scale: string;
  height?: number;
  ariaLabel: string;
}

/** Spans offered in orders of running speed (0 = the whole range). */
export const WATERFALL_ORDER_SPANS = [0, 5, 10, 20, 40] as const;

const sig4 = (v: number) => String(Number(v.toPrecision(4)));

/** The waterfall of the band `band` of the front trace's axis (all by default). */
export function buildWaterfallOption(
  p: WaterfallChartProps,
  band: readonly [number, number] = waterfallExtent(p.traces),
): ChartOption {
  const [, xMax] = waterfallExtent(p.traces);
  const L = waterfallLayout(p.traces, band);
  const { from: a, to: b, n, dx, dy, yTop } = L;
  const series: LineSeriesOption[] = [];
  // Oldest drawn first (at the back).
  for (let i = n - 1; i >= 0; i--) {
    const t = p.traces[i]!;
    const first = Math.max(0, Math.floor(a / t.step));
    const last = Math.min(t.values.length - 1, Math.ceil(b / t.step));
    const data: [number, number][] = [];
    for (let k = first; k <= last; k++) data.push([k * t.step + i * dx, t.values[k]! + i * dy]);
    const front = i === 0;
    series.push(
      manyValuesLine(
        t.label,
        data,
        {
          color: front ? chartColours.accent : chartColours.ink,
          width: front ? 1.3 : 0.8,
          opacity: front ? 1 : 0.35 + 0.5 * (1 - i / n),
        },
        {
          silent: true,
          areaStyle: { color: chartColours.surface, opacity: 1, origin: i * dy },
          z: n - i,
        },
      ),
    );
  }
  const ax = axisStyle();
  const xRight = b + (n - 1) * dx;
  const frontSpeed = p.axis === 'hz' ? (p.traces[0]?.shaftHz ?? null) : null;
  const amplitudeTicks = niceTicks(L.yRef * 1.4);
  const baselines = p.traces.map((_, i) => i * dy);
  return {
    animation: false,
    grid: { left: 64, right: 112, top: frontSpeed ? 48 : 28, bottom: 64 },
    xAxis: [
      {
        type: 'value',
        name: p.axis === 'hz' ? 'Hz (front trace)' : 'order (front trace)',
        nameLocation: 'middle',
        nameGap: 24,
        min: a,
        max: xRight,
        ...ax,
        axisLabel: { ...ax.axisLabel, hideOverlap: true, showMaxLabel: false, formatter: sig4 },
        splitLine: { show: false },
      },
      // What the zoom moves: the front trace's whole range, not drawn.
      { type: 'value', min: 0, max: xMax, show: false },
      // Orders of the front trace's running speed, over the Hz axis.
      {
        type: 'value',
        show: frontSpeed !== null,
        position: 'top',
        name: frontSpeed ? `order (1× = ${formatValue(frontSpeed, 4)} Hz)` : '',
        nameLocation: 'middle',
        nameGap: 22,
        min: frontSpeed ? a / frontSpeed : 0,
        max: frontSpeed ? xRight / frontSpeed : 1,
        ...ax,
        axisLabel: { ...ax.axisLabel, hideOverlap: true, showMaxLabel: false, formatter: sig4 },
        splitLine: { show: false },
      },
    ],
    yAxis: [
      {
        type: 'value',
        name: `${p.unit} ${p.scale} (front trace)`,
        nameLocation: 'middle',
        nameGap: 48,
        min: 0,
        max: yTop,
        ...ax,
        // Ticks over the front trace's height only: above it the traces are raised by age.
        axisTick: { ...ax.axisTick, customValues: amplitudeTicks },
        axisLabel: {
          ...ax.axisLabel,
          customValues: amplitudeTicks,
          formatter: (v: number) => formatValue(v, 3),
        },
        splitLine: { show: false },
      },
      {
        type: 'value',
        name: 'taken',
        nameLocation: 'start',
        nameGap: 22,
        position: 'right',
        min: 0,
        max: yTop,
        ...ax,
        axisLine: { ...ax.axisLine, onZero: false },
        axisTick: { ...ax.axisTick, customValues: baselines },
        axisLabel: {
          ...ax.axisLabel,
          customValues: baselines,
          hideOverlap: true,
          formatter: (v: number) => p.traces[Math.round(v / (dy || 1))]?.short ?? '',
        },
        splitLine: { show: false },
      },
    ],
    textStyle: { fontFamily: monoFont },
    dataZoom: [
      { type: 'inside', xAxisIndex: 1, filterMode: 'none' },
      { type: 'slider', xAxisIndex: 1, ...zoomSliderStyle(), showDataShadow: false },
    ],
    series,
  };
}

type Hover = WaterfallPick & { px: number; py: number };

/**
 * Follows the pointer over the chart and answers the line under it with the pixel where that
 * line is drawn (for the marker); null when off the plot.
 */
function useWaterfallHover(
  chart: echarts.ECharts | null,
  traces: readonly WaterfallTrace[],
  layout: WaterfallLayout,
): Hover | null {
  const [hover, setHover] = useState<Hover | null>(null);
  useEffect(() => {
    if (!chart) return;
    const zr = chart.getZr();
    // The front trace is the last series (drawn on top); its axes are the plot's.
    const on = { seriesIndex: traces.length - 1 };
    const onMove = (e: { offsetX: number; offsetY: number }) => {
      const px = [e.offsetX, e.offsetY];
      if (!chart.containPixel('grid', px)) return setHover(null);
      const [x, y] = chart.convertFromPixel(on, px) as number[];
      const p = pickWaterfall(traces, layout, x!, y!);
      if (!p) return setHover(null);
      const at = chart.convertToPixel(on, drawnAt(traces, layout, p.trace, p.line)) as number[];
      setHover({ ...p, px: at[0]!, py: at[1]! });
    };
    const onOut = () => setHover(null);
    zr.on('mousemove', onMove);
    zr.on('globalout', onOut);
    return () => {
      zr.off('mousemove', onMove);
      zr.off('globalout', onOut);
      setHover(null);
    };
  }, [chart, traces, layout]);
  return hover;
}

export function WaterfallChart(props: WaterfallChartProps) {
  const { traces, axis, unit, scale } = props;
  const option = useMemo(
    () => buildWaterfallOption({ traces, axis, unit, scale, ariaLabel: '' }),
    [traces, axis, unit, scale],
  );
  const { ref, chart } = useEChart(option);
  const shown = useChartZoom(chart, option);
  const extent = useMemo(() => waterfallExtent(traces), [traces]);
  const [bFrom, bTo] = zoomedExtent(extent, shown);
  const layout = useMemo(() => waterfallLayout(traces, [bFrom, bTo]), [traces, bFrom, bTo]);
  // Redraw the band the zoom chose; merged, so the zoom (and a slider drag) stays as it is.
  useEffect(() => {
    if (!chart) return;
    const { dataZoom: _kept, ...drawn } = buildWaterfallOption(
      { traces, axis, unit, scale, ariaLabel: '' },
      [layout.from, layout.to],
    );
    chart.setOption(drawn, { replaceMerge: ['series'] });
  }, [chart, layout, traces, axis, unit, scale]);
  const hover = useWaterfallHover(chart, traces, layout);
  const xUnit = axis === 'hz' ? 'Hz' : 'order';
  const frontSpeed = traces[0]?.shaftHz ?? null;
  // An order span needs the running speed on a Hz axis.
  const orderUnit = axis === 'order' ? 1 : frontSpeed;
  const spanTo = (orders: number) => {
    if (!chart) return;
    const end = orders === 0 || !orderUnit ? 100 : (orders * orderUnit * 100) / (extent[1] || 1);
    chart.dispatchAction({ type: 'dataZoom', dataZoomIndex: 0, start: 0, end: Math.min(100, end) });
  };
  return (
    <div className="flex flex-col gap-2">
      <HoverReadout hover={hover} traces={traces} axis={axis} unit={unit} scale={scale} />
      <div className="relative">
        <ChartCanvas canvasRef={ref} ariaLabel={props.ariaLabel} height={props.height ?? 440} />
        {hover && (
          <span
            aria-hidden
            className="pointer-events-none absolute size-2.5 -translate-x-1/2 -translate-y-1/2 rounded-full border-2 border-status-danger bg-surface"
            style={{ left: hover.px, top: hover.py }}
          />
        )}
      </div>
      <p className="px-2 text-xs text-ink-muted">
        Every trace has the same amplitude scale; each older one is raised by{' '}
        <span className="font-mono">
          {formatValue(layout.dy, 3)} {unit}
        </span>{' '}
        and moved right by{' '}
        <span className="font-mono">
          {formatValue(layout.dx, 3)} {xUnit}
        </span>
        .
      </p>
      <div className="flex flex-wrap items-center gap-3 px-2">
        <label className="flex items-center gap-1.5 text-xs text-ink-muted">
          Span
          <select
            className="rounded border border-line bg-surface px-1.5 py-1 text-xs text-ink"
            defaultValue={0}
            onChange={(e) => spanTo(Number(e.target.value))}
          >
            {WATERFALL_ORDER_SPANS.map((o) => (
              <option key={o} value={o} disabled={o > 0 && !orderUnit}>
                {o === 0 ? 'Whole range' : `0–${o} orders`}
              </option>
            ))}
          </select>
        </label>
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

/** The line under the pointer, stated in words (also for screen readers, politely). */
function HoverReadout({
  hover,
  traces,
  axis,
  unit,
  scale,
}: {
  hover: Hover | null;
  traces: readonly WaterfallTrace[];
  axis: 'hz' | 'order';
  unit: string;
  scale: string;
}) {
  const t = hover ? traces[hover.trace] : undefined;
  const where = hover && t ? hzAndOrder(hover.x, axis, t.shaftHz) : null;
  return (
    <p
      aria-live="polite"
      data-testid="waterfall-readout"
      className="min-h-5 px-2 font-mono text-xs text-ink"
    >
      {hover && t && where ? (
        <>
          <span className="font-sans text-ink-muted">Taken</span> {t.label} ·{' '}
          {where.hz === null ? '— Hz' : `${formatValue(where.hz, 4)} Hz`} ·{' '}
          {where.order === null ? 'order —' : `${formatValue(where.order, 3)}×`} ·{' '}
          {formatValue(hover.amplitude, 3)} {unit} {scale}
        </>
      ) : (
        <span className="font-sans text-ink-muted">
          Point at a trace to read its frequency, order, amplitude and date.
        </span>
      )}
    </p>
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
