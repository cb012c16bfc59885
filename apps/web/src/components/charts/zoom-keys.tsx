import { useEffect, useState } from 'react';
import { Button } from '../ui/button.tsx';
import type { ChartOption, echarts } from './echarts.ts';

/** The window of a chart's x axis that is shown, in per cent of the whole range. */
export interface ZoomWindow {
  start: number;
  end: number;
}

const whole: ZoomWindow = { start: 0, end: 100 };

interface ZoomEventRange {
  start?: number;
  end?: number;
}

/**
 * Follows the x-axis window of a chart's first dataZoom, whatever moved it: the zoom keys,
 * the mouse wheel or a drag inside the chart (ECharts sends those as a `batch`), or the
 * slider. `option` is the chart's current option: a new one (new data) puts the chart back
 * on the window the option opens with, so the window is read from it again.
 */
export function useChartZoom(chart: echarts.ECharts | null, option: ChartOption): ZoomWindow {
  const [zoom, setZoom] = useState(() => ({ option, shown: openingWindow(option) }));
  if (zoom.option !== option) setZoom({ option, shown: openingWindow(option) });
  useEffect(() => {
    if (!chart) return;
    const onZoom = (params: unknown) => {
      const p = params as ZoomEventRange & { batch?: ZoomEventRange[] };
      let range: ZoomEventRange | undefined = p.batch?.[0] ?? p;
      if (typeof range.start !== 'number' || typeof range.end !== 'number') {
        // Set by value, not per cent: ask the chart (copies the option, so only then).
        range = (chart.getOption().dataZoom as ZoomEventRange[] | undefined)?.[0];
      }
      const start = range?.start ?? 0;
      const end = range?.end ?? 100;
      setZoom((z) =>
        z.shown.start === start && z.shown.end === end ? z : { ...z, shown: { start, end } },
      );
    };
    chart.on('datazoom', onZoom);
    return () => {
      chart.off('datazoom', onZoom);
    };
  }, [chart]);
  return zoom.option === option ? zoom.shown : openingWindow(option);
}

/**
 * What {@link ZoomKeys} reads of a chart whose option fixes its x extent: the chart, the
 * window shown ({@link useChartZoom}) and that extent.
 */
export function useZoomKeys(chart: echarts.ECharts | null, option: ChartOption) {
  return { chart, shown: useChartZoom(chart, option), extent: xExtent(option) };
}

/** The window an option opens on: its first dataZoom's start/end, or its values on the axis. */
export function openingWindow(option: ChartOption): ZoomWindow {
  const dz = (Array.isArray(option.dataZoom) ? option.dataZoom[0] : option.dataZoom) as
    | (ZoomEventRange & { startValue?: unknown; endValue?: unknown; xAxisIndex?: unknown })
    | undefined;
  if (!dz) return whole;
  let { start = 0, end = 100 } = dz;
  const axes = Array.isArray(option.xAxis) ? option.xAxis : [option.xAxis];
  const axis = axes[typeof dz.xAxisIndex === 'number' ? dz.xAxisIndex : 0] as
    { min?: unknown; max?: unknown } | undefined;
  const min = axis?.min;
  const max = axis?.max;
  if (typeof min === 'number' && typeof max === 'number' && max > min) {
    const pct = (v: number) => Math.max(0, Math.min(100, ((v - min) / (max - min)) * 100));
    if (typeof dz.startValue === 'number') start = pct(dz.startValue);
    if (typeof dz.endValue === 'number') end = pct(dz.endValue);
  }
  return start === 0 && end === 100 ? whole : { start, end };
}

/** The x axis's fixed extent in an option, when it sets a numeric min and max. */
export function xExtent(option: ChartOption): [number, number] | undefined {
  const x = (Array.isArray(option.xAxis) ? option.xAxis[0] : option.xAxis) as
    { min?: unknown; max?: unknown } | undefined;
  return typeof x?.min === 'number' && typeof x.max === 'number' ? [x.min, x.max] : undefined;
}

/** The shown window in axis values, given the axis's whole extent. */
export function zoomedExtent(extent: readonly [number, number], w: ZoomWindow): [number, number] {
  const [lo, hi] = extent;
  return [lo + ((hi - lo) * w.start) / 100, lo + ((hi - lo) * w.end) / 100];
}

/**
 * Zoom and pan of a chart's x axis with buttons, for the keyboard (the wheel, drag and slider
 * need a pointer), and a live line saying the window shown — also after a zoom by pointer.
 * Works on the chart's first dataZoom, in per cent of the whole range; given the axis's
 * `extent`, it also states the window in the axis's own terms (e.g. "120–480 Hz").
 */
export function ZoomKeys({
  chart,
  shown,
  label,
  extent,
  format,
}: {
  chart: echarts.ECharts | null;
  /** From {@link useChartZoom} on the same chart. */
  shown: ZoomWindow;
  /** What is zoomed, e.g. "spectrum". */
  label: string;
  /** The x axis's whole range, in its values (ms, Hz, epoch ms …). */
  extent?: readonly [number, number];
  /** One axis value as text with its unit, e.g. `v => \`${v} Hz\``. */
  format?: (v: number) => string;
}) {
  const apply = (next: (s: number, e: number) => [number, number]) => {
    if (!chart) return;
    const [s, e] = next(shown.start, shown.end);
    const start = Math.max(0, Math.min(s, 100));
    const end = Math.max(start + 0.5, Math.min(e, 100));
    // Answered by a 'datazoom' event, which moves `shown`.
    chart.dispatchAction({ type: 'dataZoom', dataZoomIndex: 0, start, end });
  };
  const zoomBy = (f: number) =>
    apply((s, e) => {
      const mid = (s + e) / 2;
      const half = Math.min(50, ((e - s) * f) / 2);
      const lo = Math.max(0, Math.min(mid - half, 100 - 2 * half));
      return [lo, lo + 2 * half];
    });
  const pan = (d: number) =>
    apply((s, e) => {
      const w = e - s;
      const lo = Math.max(0, Math.min(s + d * w, 100 - w));
      return [lo, lo + w];
    });
  const pct = (v: number) => `${Math.round(v)} %`;
  return (
    <div
      role="group"
      aria-label={`Zoom the ${label}`}
      className="flex flex-wrap items-center gap-1.5"
    >
      <Button size="sm" onClick={() => zoomBy(0.5)}>
        Zoom in
      </Button>
      <Button size="sm" onClick={() => zoomBy(2)}>
        Zoom out
      </Button>
      <Button size="sm" onClick={() => pan(-0.5)} aria-label="Move left">
        ←
      </Button>
      <Button size="sm" onClick={() => pan(0.5)} aria-label="Move right">
        →
      </Button>
      <Button size="sm" onClick={() => apply(() => [0, 100])}>
        Whole range
      </Button>
      <span role="status" className="text-xs text-ink-muted">
        Showing {pct(shown.start)}–{pct(shown.end)} of the range
        {described(shown, extent, format)}
      </span>
    </div>
  );
}

function described(
  shown: ZoomWindow,
  extent: readonly [number, number] | undefined,
  format: ((v: number) => string) | undefined,
) {
  if (!extent || !format) return '';
  const [lo, hi] = zoomedExtent(extent, shown);
  return `: ${format(lo)} to ${format(hi)}`;
}
