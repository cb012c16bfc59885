/**
 * What a trend chart adds to its one band (trend-option.ts): further series on the same time
 * axis with one y axis per unit (never mm/s and g on one axis), the event strip along the top
 * of the plot (a symbol per event, its text shown on hover by the chart component), uploaded
 * captures marked on their values, and a tooltip that names each series' value in its unit.
 */
import { chartColours, formatValue, monoFont, sansFont } from './chart-theme.ts';
import type { ChartOption, LineSeriesOption, ScatterSeriesOption } from './echarts.ts';
import { formatDateTime } from '../../lib/format.ts';

type ChartTime = number | string;
const toMs = (t: ChartTime) => (typeof t === 'number' ? t : Date.parse(t));

/** A further series on the trend's time axis, in its own (shown) unit. */
export interface TrendExtraSeries {
  /** Stable id, e.g. `12:overall-velocity`. */
  id: string;
  name: string;
  /** The unit as shown (`mm/s`, `in/s`, `g`, `µm` …): series of one unit share an axis. */
  unit: string;
  colour: string;
  symbol: string;
  points: readonly { t: ChartTime; v: number; q?: 'ok' | 'suspect' | 'unusable' }[];
}

/** An event drawn on the strip along the top of the plot; its text shows on hover. */
export interface TrendStripEvent {
  /** Index in the caller's list of events, reported back on hover. */
  index: number;
  t: ChartTime;
  kind:
    'raised' | 'escalated' | 'acknowledged' | 'cleared' | 'finding' | 'limits' | 'upload' | 'other';
  label: string;
}

/** A capture from a file upload (a portable instrument), marked on its value. */
export interface TrendUploadMarker {
  /** Index in the caller's list of events, reported back on hover. */
  index: number;
  t: ChartTime;
  v: number;
  label: string;
}

/** Each event kind's symbol and colour on the strip: shape and colour both tell the kind. */
export const stripStyle: Record<
  TrendStripEvent['kind'],
  { symbol: string; colour: string; hollow?: boolean }
> = {
  raised: { symbol: 'triangle', colour: chartColours.alert },
  escalated: { symbol: 'triangle', colour: chartColours.danger },
  acknowledged: { symbol: 'circle', colour: chartColours.accent },
  cleared: { symbol: 'circle', colour: chartColours.ok, hollow: true },
  finding: { symbol: 'diamond', colour: chartColours.quality },
  limits: { symbol: 'rect', colour: chartColours.ink },
  upload: { symbol: 'pin', colour: chartColours.ink, hollow: true },
  other: { symbol: 'rect', colour: chartColours.inkMuted, hollow: true },
};

/** Series ids the tooltip and the hover box know. */
export const EVENT_STRIP_ID = 'event-strip';
export const UPLOADS_ID = 'uploads';
/** The plot's top edge when events are drawn, px; the strip's symbols are centred at STRIP_Y. */
export const STRIP_TOP = 44;
export const STRIP_Y = 26;
/** Width one extra right-hand y axis takes, px. */
const AXIS_WIDTH = 58;

/**
 * Adds the extra series (one y axis per unit: the primary's on the left, others on the
 * right), the event strip, the upload markers and a per-unit tooltip to a trend option.
 */
export function withTrendSeries(
  base: ChartOption,
  o: {
    primaryId: string;
    primaryUnit: string;
    extra: readonly TrendExtraSeries[];
    strip: readonly TrendStripEvent[];
    uploads: readonly TrendUploadMarker[];
  },
): ChartOption {
  const baseY = base.yAxis as Record<string, unknown>;
  const units = [o.primaryUnit];
  for (const s of o.extra) if (!units.includes(s.unit)) units.push(s.unit);
  const right = units.length - 1;
  const yAxis: Record<string, unknown>[] = units.map((unit, i) => ({
    ...baseY,
    name: unit,
    position: i === 0 ? 'left' : 'right',
    offset: i <= 1 ? 0 : (i - 1) * AXIS_WIDTH,
    // the primary's axis keeps its own maximum (unusable values cut at the top); the others
    // scale to their data
    max: i === 0 ? baseY.max : undefined,
    splitLine: i === 0 ? baseY.splitLine : { show: false },
    // a right-hand axis' unit sits right of its line, clear of the "Today" label above it
    nameTextStyle:
      i === 0
        ? baseY.nameTextStyle
        : { ...(baseY.nameTextStyle as object), align: 'left', padding: [0, 0, 0, 20] },
    alignTicks: false,
  }));
  // the event strip's own axis: 0..1, hidden, the strip at its top
  const stripAxis = yAxis.length;
  yAxis.push({ type: 'value', min: 0, max: 1, show: false });

  const unitOf = new Map<string, string>([[o.primaryId, o.primaryUnit]]);
  const series = [...(base.series as (LineSeriesOption | ScatterSeriesOption)[])];
  series[0] = { ...series[0], id: o.primaryId } as LineSeriesOption;
  for (const s of o.extra) {
    unitOf.set(s.id, s.unit);
    series.push({
      id: s.id,
      name: s.name,
      type: 'line',
      yAxisIndex: units.indexOf(s.unit),
      data: s.points.map((p) => [toMs(p.t), p.q === 'unusable' ? null : p.v]),
      connectNulls: false,
      showSymbol: s.points.length <= 200,
      symbol: s.symbol,
      symbolSize: 6,
      sampling: s.points.length > 3000 ? 'lttb' : undefined,
      lineStyle: { color: s.colour, width: 1.5 },
      itemStyle: { color: s.colour },
      emphasis: { focus: 'none' },
      z: 2,
    });
  }
  if (o.uploads.length > 0)
    series.push({
      id: UPLOADS_ID,
      name: 'Portable-instrument capture',
      type: 'scatter',
      data: o.uploads.map((u) => ({ value: [toMs(u.t), u.v, u.index], name: u.label })),
      symbol: 'pin',
      symbolSize: 16,
      symbolOffset: [0, '-45%'],
      itemStyle: {
        color: chartColours.surface,
        borderColor: chartColours.ink,
        borderWidth: 1.5,
      },
      tooltip: { show: false },
      z: 7,
    });
  if (o.strip.length > 0)
    series.push({
      id: EVENT_STRIP_ID,
      name: 'Events',
      type: 'scatter',
      yAxisIndex: stripAxis,
      data: o.strip.map((e) => {
        const s = stripStyle[e.kind];
        return {
          value: [toMs(e.t), 1, e.index],
          name: e.label,
          symbol: s.symbol,
          itemStyle: {
            color: s.hollow ? chartColours.surface : s.colour,
            borderColor: s.colour,
            borderWidth: 1.5,
          },
        };
      }),
      symbolSize: 11,
      // drawn above the plot's top edge (STRIP_Y), clear of the values and the "Today" label
      symbolOffset: [0, STRIP_Y - STRIP_TOP],
      clip: false,
      tooltip: { show: false },
      emphasis: { scale: 1.6 },
      z: 8,
    });

  const grid = base.grid as Record<string, number>;
  return {
    ...base,
    grid: {
      ...grid,
      top: o.strip.length > 0 ? STRIP_TOP : grid.top,
      right: 24 + right * AXIS_WIDTH,
    },
    yAxis: yAxis as ChartOption['yAxis'],
    series,
    tooltip: {
      ...(base.tooltip as object),
      valueFormatter: undefined,
      formatter: (raw: unknown) => tooltipText(raw, unitOf),
    },
  };
}

const dateTime = { format: (t: number) => formatDateTime(t) };
const escapeHtml = (s: string) =>
  s.replace(/[&<>"]/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;' })[c]!);

/** The axis tooltip: each value series' nearest value in its unit, with its time when it differs. */
function tooltipText(raw: unknown, unitOf: ReadonlyMap<string, string>): string {
  const params = (Array.isArray(raw) ? raw : [raw]) as {
    seriesId?: string;
    seriesName?: string;
    value?: unknown;
    color?: unknown;
    axisValue?: unknown;
  }[];
  const rows: string[] = [];
  let head: number | null = null;
  for (const p of params) {
    const unit = p.seriesId === undefined ? undefined : unitOf.get(p.seriesId);
    if (unit === undefined || !Array.isArray(p.value)) continue;
    const [t, v] = p.value as [number, number | null];
    head ??= t;
    const value = typeof v === 'number' ? `${formatValue(v)} ${unit}` : 'unusable capture';
    const when = t !== head ? ` <span style="opacity:.7">(${dateTime.format(t)})</span>` : '';
    const colour = typeof p.color === 'string' ? p.color : chartColours.ink;
    rows.push(
      `<div><span style="display:inline-block;width:8px;height:8px;border-radius:4px;background:${colour};margin-right:6px"></span>${escapeHtml(p.seriesName ?? '')}: <b style="font-family:${monoFont}">${value}</b>${when}</div>`,
    );
  }
  if (head === null) return '';
  return `<div style="font-family:${sansFont};font-size:12px"><div style="margin-bottom:2px">${dateTime.format(head)}</div>${rows.join('')}</div>`;
}
