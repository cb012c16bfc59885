/**
 * The trend chart: one band's values over time with its limit lines, baseline band, event
 * markers, a projection ahead of today, further series (one y axis per unit) and any extra
 * marker series. Shared by the Point page (trend) and the Limits screen (replay of proposed
 * levels over history).
 *
 * Everything is passed in plain data (types in trend-types.ts, the option in trend-option.ts):
 * times are epoch milliseconds or ISO strings, values are in `unit`. The chart comes with
 * keyboard zoom, its values as a table, and an event's text in a box while its symbol is
 * hovered or the event is made active from outside (a list of the events, for the keyboard).
 */
import { useEffect, useRef } from 'react';
import { formatValue } from './chart-theme.ts';
import { useBuiltOption } from './use-built-option.ts';
import { useEChart } from './use-echart.ts';
import { ValuesTable } from './values-table.tsx';
import { useZoomKeys, zoomedExtent, ZoomKeys } from './zoom-keys.tsx';
import { ChartCanvas } from './chart-canvas.tsx';
import {
  buildTrendOption,
  dateLabel,
  dateTimeLabel,
  displayUnit,
  toMs,
  type TrendChartPoint,
  type TrendChartProps,
} from './trend-option.ts';
import { EVENT_STRIP_ID, UPLOADS_ID } from './trend-series-option.ts';
import type { echarts } from './echarts.ts';

export type * from './trend-option.ts';
export { displayUnit };

export function TrendChart({
  ariaLabel,
  height = 320,
  activeEvent: active = null,
  onPointClick,
  onActiveEvent,
  onWindow,
  ...input
}: TrendChartProps) {
  // Rebuilt only when an input changes (pass memoised arrays), so a re-render keeps the zoom.
  const option = useBuiltOption(buildTrendOption, input);
  const handlers = useRef({ onPointClick, onActiveEvent, onWindow });
  useEffect(() => {
    handlers.current = { onPointClick, onActiveEvent, onWindow };
  });
  const { ref, chart } = useEChart(option, (chart) => {
    chart.on('click', (params) => {
      if (params.seriesIndex === 0 && typeof params.dataIndex === 'number')
        handlers.current.onPointClick?.(params.dataIndex);
    });
    const eventIndex = (params: { seriesId?: string; value?: unknown }) =>
      (params.seriesId === EVENT_STRIP_ID || params.seriesId === UPLOADS_ID) &&
      Array.isArray(params.value)
        ? Number(params.value[2])
        : null;
    chart.on('mouseover', (params) => {
      const i = eventIndex(params);
      if (i !== null) handlers.current.onActiveEvent?.(i);
    });
    chart.on('mouseout', (params) => {
      if (eventIndex(params) !== null) handlers.current.onActiveEvent?.(null);
    });
  });
  const zoom = useZoomKeys(chart, option);
  const { shown, extent } = zoom;
  const [from, to] = extent ? zoomedExtent(extent, shown) : [NaN, NaN];
  useEffect(() => {
    if (Number.isFinite(from) && Number.isFinite(to)) handlers.current.onWindow?.(from, to);
  }, [from, to]);
  const { events, points } = input;
  const activeEvent = active === null ? undefined : events?.[active];
  return (
    <div>
      <div className="relative">
        <ChartCanvas canvasRef={ref} ariaLabel={ariaLabel} height={height} />
        {activeEvent && chart && (
          <EventBox chart={chart} event={activeEvent} index={active!} events={events ?? []} />
        )}
      </div>
      {(input.zoom ?? true) && (
        <div className="mb-1 px-2">
          <ZoomKeys {...zoom} label="trend" format={(v) => dateLabel.format(v)} />
        </div>
      )}
      <TrendValues points={points} unit={displayUnit(input.unit)} name={input.name ?? 'Values'} />
    </div>
  );
}

/** The active event's time and text in a box beside its symbol; its symbol is highlighted. */
function EventBox({
  chart,
  event,
  index,
  events,
}: {
  chart: echarts.ECharts;
  event: NonNullable<TrendChartProps['events']>[number];
  index: number;
  events: NonNullable<TrendChartProps['events']>;
}) {
  const upload = event.v !== undefined;
  // the symbol's place in its series: uploads and strip events are counted apart
  const dataIndex = events.slice(0, index).filter((e) => (e.v !== undefined) === upload).length;
  const seriesId = upload ? UPLOADS_ID : EVENT_STRIP_ID;
  useEffect(() => {
    chart.dispatchAction({ type: 'highlight', seriesId, dataIndex });
    return () => chart.dispatchAction({ type: 'downplay', seriesId, dataIndex });
  }, [chart, seriesId, dataIndex]);
  const x = Number(chart.convertToPixel({ xAxisIndex: 0 }, toMs(event.t)));
  const width = chart.getWidth();
  const box = Math.min(280, width - 16);
  const left = Math.max(8, Math.min(x - box / 2, width - box - 8));
  const top = upload ? Number(chart.convertToPixel({ yAxisIndex: 0 }, event.v!)) + 10 : 36;
  return (
    <div
      role="tooltip"
      className="pointer-events-none absolute z-10 rounded-md border border-line-strong bg-surface px-2.5 py-1.5 text-xs text-ink shadow-sm"
      style={{ left, top: Math.min(top, chart.getHeight() - 70), width: box }}
    >
      <div className="font-mono text-ink-muted">{dateTimeLabel.format(toMs(event.t))}</div>
      <div>{event.label}</div>
    </div>
  );
}

const verdicts = { ok: 'OK', suspect: 'Suspect', unusable: 'Unusable' } as const;

/** The chart's values as a table, for the keyboard and screen readers. */
function TrendValues({
  points,
  unit,
  name,
}: {
  points: readonly TrendChartPoint[];
  unit: string;
  name: string;
}) {
  if (points.length === 0) return null;
  return (
    <ValuesTable
      summary={`Values as a table (${points.length})`}
      caption={`${name} in ${unit}, newest first`}
      label={`${name} values`}
      columns={[{ header: 'Taken' }, { header: unit, numeric: true }, { header: 'Quality' }]}
      rows={() =>
        [...points]
          .reverse()
          .map((p) => [dateTimeLabel.format(toMs(p.t)), formatValue(p.v), verdicts[p.q ?? 'ok']])
      }
    />
  );
}
