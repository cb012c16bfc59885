/** The trend chart's data types (see trend-option.ts, which builds its option from them). */
import type { TrendExtraSeries } from './trend-series-option.ts';
export type { TrendExtraSeries };

/** A time as epoch milliseconds or an ISO 8601 string. */
export type ChartTime = number | string;

/** One value of the trend. */
export interface TrendChartPoint {
  t: ChartTime;
  v: number;
  /** Quality verdict of the capture; `suspect` points are hollow, `unusable` crossed. */
  q?: 'ok' | 'suspect' | 'unusable';
}

/** A horizontal level line (e.g. alert or danger). */
export interface TrendLimitLine {
  value: number;
  /** `alert`: dashed, amber; `danger`: solid, red, thicker; `other`: dotted, ink. */
  level: 'alert' | 'danger' | 'other';
  /** Text on the line; defaults to "Alert 7.10 mm/s" etc. */
  label?: string;
  /** Draw lighter (e.g. the current levels behind proposed ones). */
  muted?: boolean;
}

/** A horizontal band, e.g. baseline mean ± 2σ. */
export interface TrendBaselineBand {
  low: number;
  high: number;
  label?: string;
}

/**
 * An event at one time: alert raised, acknowledged, finding, limit change (a vertical line and
 * a symbol on the strip along the top), or a capture uploaded from a portable instrument's
 * file (`v` set: a pin on its value).
 */
export interface TrendEventMarker {
  t: ChartTime;
  kind:
    'raised' | 'escalated' | 'acknowledged' | 'cleared' | 'finding' | 'limits' | 'upload' | 'other';
  /** Shown in the label and tooltip. */
  label: string;
  /** An upload's value, where its pin is drawn. */
  v?: number;
}

/** A dashed projection from the latest value to the projected crossing (may lie ahead of today). */
export interface TrendProjectionLine {
  from: { t: ChartTime; v: number };
  to: { t: ChartTime; v: number };
  /** e.g. "Alert projected 14 Mar 2027". */
  label?: string;
}

/** Extra markers drawn as a scatter series, e.g. where a replayed limit set would have raised alerts. */
export interface TrendMarkerSeries {
  name: string;
  points: { t: ChartTime; v: number; label?: string }[];
  shape: 'triangle' | 'diamond' | 'circle' | 'rect' | 'pin';
  tone: 'alert' | 'danger' | 'accent' | 'ink' | 'quality';
}

export interface TrendChartProps {
  /** The values, oldest first. */
  points: readonly TrendChartPoint[];
  /** Unit of the values, e.g. `mm/s`, `g`, `um` (shown as µm). */
  unit: string;
  /** Series name in the tooltip and legend. @default 'Value' */
  name?: string;
  limits?: readonly TrendLimitLine[];
  baseline?: TrendBaselineBand | null;
  events?: readonly TrendEventMarker[];
  projection?: TrendProjectionLine | null;
  markerSeries?: readonly TrendMarkerSeries[];
  /** Further series on the same time axis (one y axis per unit); limits belong to `points`. */
  extraSeries?: readonly TrendExtraSeries[];
  /** The main series' id (for the tooltip) and colour. */
  seriesId?: string;
  colour?: string;
  /** Draws a "today" line at this time; the x axis extends to include it and the projection. */
  now?: number;
  /** Time window to show; by default the data, today and the projection. */
  range?: { from?: ChartTime; to?: ChartTime };
  /** Pixel height. @default 320 */
  height?: number;
  /** Accessible name of the chart. */
  ariaLabel: string;
  /** Show a zoom slider under the chart. @default true */
  zoom?: boolean;
  /** Called with the analysis index when a value is clicked. */
  onPointClick?: (index: number) => void;
  /** The event (index in `events`) whose text is shown, e.g. focused in a list; null: none. */
  activeEvent?: number | null;
  /** Called when the pointer enters (index) or leaves (null) an event's symbol. */
  onActiveEvent?: (index: number | null) => void;
  /** Called with the time window shown (epoch ms) whenever the zoom moves. */
  onWindow?: (from: number, to: number) => void;
}

/** What the trend's option is built from: the props but for the chart's name, size and handlers. */
export type TrendOptionInput = Omit<
  TrendChartProps,
  'ariaLabel' | 'height' | 'activeEvent' | 'onPointClick' | 'onActiveEvent' | 'onWindow'
>;
