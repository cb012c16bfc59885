import { useState, type RefObject } from 'react';
import { Button } from '../ui/button.tsx';
import type { echarts } from './echarts.ts';

/**
 * Zoom and pan of a chart's x axis with buttons, for the keyboard (the wheel, drag and slider
 * need a pointer). Works on the chart's first dataZoom, in per cent of the whole range, and
 * says the window it shows.
 */
export function ZoomKeys({
  chartRef,
  label,
}: {
  chartRef: RefObject<echarts.ECharts | null>;
  /** What is zoomed, e.g. "spectrum". */
  label: string;
}) {
  const [shown, setShown] = useState<[number, number]>([0, 100]);
  const apply = (next: (s: number, e: number) => [number, number]) => {
    const chart = chartRef.current;
    if (!chart) return;
    const zoom = (
      chart.getOption().dataZoom as { start?: number; end?: number }[] | undefined
    )?.[0];
    const [s, e] = next(zoom?.start ?? 0, zoom?.end ?? 100);
    const start = Math.max(0, Math.min(s, 100));
    const end = Math.max(start + 0.5, Math.min(e, 100));
    chart.dispatchAction({ type: 'dataZoom', dataZoomIndex: 0, start, end });
    setShown([start, end]);
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
        Showing {pct(shown[0])}–{pct(shown[1])} of the range
      </span>
    </div>
  );
}
