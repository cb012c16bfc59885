/**
 * The trend chart's option, built from plain data: the band's values with their limit lines,
 * baseline band, event markers, projection and extra marker series, and the data types the
 * chart takes. Status is never colour alone: alert lines are dashed, danger lines solid and
 * thicker, and each has a text label; markers differ in shape.
 */
import { unitText } from '@turnstone/contracts/units';
import {
  axisStyle,
  chartColours,
  formatValue,
  monoFont,
  sansFont,
  zoomSliderStyle,
} from './chart-theme.ts';
import type { ChartOption, LineSeriesOption, ScatterSeriesOption } from './echarts.ts';
import { withTrendSeries } from './trend-series-option.ts';
import { formatDate, formatDateTime } from '../../lib/format.ts';

export type * from './trend-types.ts';
import type { ChartTime, TrendEventMarker, TrendOptionInput } from './trend-types.ts';

/** The next "round" number at or above x (1, 1.2, 1.5, 2, 2.5, 3, 4, 5, 6, 8 × 10^k). */
export function niceCeil(x: number): number {
  const p = 10 ** Math.floor(Math.log10(x));
  for (const m of [1, 1.2, 1.5, 2, 2.5, 3, 4, 5, 6, 8, 10]) if (m * p >= x) return m * p;
  return 10 * p;
}

export const toMs = (t: ChartTime) => (typeof t === 'number' ? t : Date.parse(t));
/** Units as people write them (µm, not um): one home in contracts. */
export const displayUnit = unitText;

const tones = {
  alert: chartColours.alert,
  danger: chartColours.danger,
  accent: chartColours.accent,
  ink: chartColours.ink,
  quality: chartColours.quality,
} as const;

const shapes = {
  triangle: 'triangle',
  diamond: 'diamond',
  circle: 'circle',
  rect: 'rect',
  pin: 'pin',
} as const;

const eventStyle: Record<
  TrendEventMarker['kind'],
  { colour: string; type: 'solid' | 'dashed' | 'dotted' }
> = {
  raised: { colour: chartColours.alert, type: 'solid' },
  escalated: { colour: chartColours.danger, type: 'solid' },
  acknowledged: { colour: chartColours.accent, type: 'dashed' },
  cleared: { colour: chartColours.ok, type: 'dotted' },
  finding: { colour: chartColours.quality, type: 'dashed' },
  limits: { colour: chartColours.ink, type: 'dotted' },
  upload: { colour: chartColours.ink, type: 'dotted' },
  other: { colour: chartColours.inkMuted, type: 'dotted' },
};

/** Axis and pointer labels in the one date format and the screen's zone (lib/format.ts). */
export const dateLabel = { format: (t: number) => formatDate(t) };
export const dateTimeLabel = { format: (t: number) => formatDateTime(t) };

export function buildTrendOption(props: TrendOptionInput): ChartOption {
  const unit = displayUnit(props.unit);
  const name = props.name ?? 'Value';
  const data = props.points.map((p) => [toMs(p.t), p.v, p.q ?? 'ok'] as [number, number, string]);
  const times = data.map((d) => d[0]);
  if (props.now !== undefined) times.push(props.now);
  if (props.projection) times.push(toMs(props.projection.to.t));
  // Unusable captures are drawn but do not set the scale: one clipped capture reading
  // thousands of mm/s would flatten the trend. They are cut at the top of the chart.
  let usableMax = 0;
  for (const d of data) if (d[2] !== 'unusable') usableMax = Math.max(usableMax, d[1]);
  for (const l of props.limits ?? []) usableMax = Math.max(usableMax, l.value);
  for (const m of props.markerSeries ?? [])
    for (const p of m.points) usableMax = Math.max(usableMax, p.v);
  const hasUnusable = data.some((d) => d[2] === 'unusable');
  const yMax = hasUnusable && usableMax > 0 ? niceCeil(usableMax * 1.1) : undefined;
  const xMin = props.range?.from !== undefined ? toMs(props.range.from) : Math.min(...times);
  const xMax = props.range?.to !== undefined ? toMs(props.range.to) : Math.max(...times);

  const limitLines = (props.limits ?? []).map((l) => {
    const colour =
      l.level === 'danger'
        ? chartColours.danger
        : l.level === 'alert'
          ? chartColours.alert
          : chartColours.ink;
    const textColour = l.level === 'alert' ? chartColours.alertText : colour;
    const text =
      l.label ??
      `${l.level === 'danger' ? 'Danger' : l.level === 'alert' ? 'Alert' : 'Level'} ${formatValue(l.value)} ${unit}`;
    return {
      yAxis: l.value,
      name: text,
      label: {
        formatter: text,
        position: (l.level === 'alert' ? 'insideStartTop' : 'insideEndTop') as
          'insideStartTop' | 'insideEndTop',
        color: textColour,
        fontFamily: monoFont,
        fontSize: 11,
      },
      lineStyle: {
        color: colour,
        type:
          l.level === 'alert'
            ? ('dashed' as const)
            : l.level === 'danger'
              ? ('solid' as const)
              : ('dotted' as const),
        width: l.level === 'danger' ? 2 : 1.5,
        opacity: l.muted ? 0.45 : 1,
      },
    };
  });

  const eventLines = (props.events ?? [])
    .filter((e) => e.v === undefined)
    .map((e) => {
      const s = eventStyle[e.kind];
      return {
        xAxis: toMs(e.t),
        name: e.label,
        label: { show: false },
        lineStyle: { color: s.colour, type: s.type, width: 1.2 },
        emphasis: {
          label: {
            show: true,
            formatter: e.label,
            color: s.colour,
            fontFamily: sansFont,
            fontSize: 11,
          },
        },
      };
    });
  const todayLine =
    props.now !== undefined
      ? [
          {
            xAxis: props.now,
            name: 'Today',
            label: {
              formatter: 'Today',
              position: 'end' as const,
              color: chartColours.inkMuted,
              fontSize: 11,
            },
            lineStyle: { color: chartColours.inkFaint, type: 'dotted' as const, width: 1 },
          },
        ]
      : [];

  // Unusable values break the line (they are not measurements of the machine) and show
  // as hollow squares, pinned to the top edge when they lie above the chart.
  const lineData = data.map((d) => (d[2] === 'unusable' ? [d[0], null] : [d[0], d[1]]));
  const main: LineSeriesOption = {
    name,
    type: 'line',
    data: lineData,
    connectNulls: false,
    showSymbol: data.length <= 200,
    symbolSize: 4,
    sampling: data.length > 3000 ? 'lttb' : undefined,
    lineStyle: { color: props.colour ?? chartColours.accent, width: 1.5 },
    itemStyle: { color: props.colour ?? chartColours.accent },
    emphasis: { focus: 'none' },
    markLine: {
      symbol: ['none', 'none'],
      silent: false,
      animation: false,
      data: [...limitLines, ...eventLines, ...todayLine],
    },
    markArea: props.baseline
      ? {
          silent: true,
          itemStyle: { color: chartColours.accentSoft, opacity: 0.8 },
          label: {
            show: true,
            position: 'insideTopLeft',
            color: chartColours.accent,
            fontSize: 11,
          },
          data: [
            [
              { yAxis: props.baseline.low, name: props.baseline.label ?? 'Baseline' },
              { yAxis: props.baseline.high },
            ],
          ],
        }
      : undefined,
    z: 3,
  };

  // Suspect and unusable captures, drawn over the line with their own shapes.
  const flagged: ScatterSeriesOption = {
    name: 'Quality flagged',
    type: 'scatter',
    data: data
      .filter((d) => d[2] !== 'ok')
      .map((d) => ({
        value: [d[0], yMax !== undefined ? Math.min(d[1], yMax) : d[1]],
        name: `${d[2]} capture: ${formatValue(d[1])} ${unit}`,
      })),
    tooltip: { trigger: 'item', formatter: (p) => String((p as { name: string }).name) },
    symbol: 'rect',
    symbolSize: 7,
    itemStyle: { color: 'transparent', borderColor: chartColours.quality, borderWidth: 1.5 },
    z: 4,
  };

  const series: (LineSeriesOption | ScatterSeriesOption)[] = [main, flagged];
  if (props.projection) {
    const p = props.projection;
    series.push({
      name: p.label ?? 'Projection',
      type: 'line',
      data: [
        [toMs(p.from.t), p.from.v],
        [toMs(p.to.t), p.to.v],
      ],
      symbol: (_value: unknown, params: { dataIndex: number }) =>
        params.dataIndex === 1 ? 'diamond' : 'none',
      symbolSize: 9,
      showSymbol: true,
      lineStyle: { color: chartColours.ink, type: 'dashed', width: 1.5 },
      itemStyle: { color: chartColours.ink },
      label: {
        show: true,
        formatter: (params: { dataIndex: number }) =>
          params.dataIndex === 1 ? (p.label ?? '') : '',
        position: 'top',
        distance: 8,
        align: 'right',
        color: chartColours.ink,
        fontFamily: sansFont,
        fontSize: 11,
      },
      z: 5,
    });
  }
  for (const m of props.markerSeries ?? []) {
    series.push({
      name: m.name,
      type: 'scatter',
      data: m.points.map((p) => ({ value: [toMs(p.t), p.v], name: p.label ?? m.name })),
      symbol: shapes[m.shape],
      symbolSize: 10,
      itemStyle: { color: tones[m.tone], borderColor: chartColours.surface, borderWidth: 1 },
      z: 6,
    });
  }

  const zoom = props.zoom ?? true;
  const ax = axisStyle();
  const option: ChartOption = {
    animation: false,
    grid: { left: 56, right: 24, top: 20, bottom: zoom ? 64 : 28 },
    tooltip: {
      trigger: 'axis',
      axisPointer: { type: 'line' },
      textStyle: { fontFamily: monoFont, fontSize: 12 },
      valueFormatter: (v) => (typeof v === 'number' ? `${formatValue(v)} ${unit}` : String(v)),
    },
    xAxis: {
      type: 'time',
      min: xMin,
      max: xMax,
      ...ax,
      splitLine: { show: false },
      axisLabel: { ...ax.axisLabel, hideOverlap: true },
      axisPointer: { label: { formatter: (p) => dateTimeLabel.format(Number(p.value)) } },
    },
    yAxis: {
      type: 'value',
      name: unit,
      scale: false,
      max: yMax,
      ...ax,
      axisLabel: { ...ax.axisLabel, formatter: (v: number) => formatValue(v) },
    },
    dataZoom: zoom
      ? [
          { type: 'inside', xAxisIndex: 0, filterMode: 'none' },
          {
            type: 'slider',
            xAxisIndex: 0,
            ...zoomSliderStyle(),
            labelFormatter: (v: number) => dateLabel.format(v),
          },
        ]
      : [],
    series,
  };
  const events = props.events ?? [];
  if (!props.extraSeries?.length && events.length === 0) return option;
  return withTrendSeries(option, {
    primaryId: props.seriesId ?? 'primary',
    primaryUnit: unit,
    extra: props.extraSeries ?? [],
    strip: events.flatMap((e, index) =>
      e.v === undefined ? [{ index, t: e.t, kind: e.kind, label: e.label }] : [],
    ),
    uploads: events.flatMap((e, index) =>
      e.v !== undefined ? [{ index, t: e.t, v: e.v, label: e.label }] : [],
    ),
  });
}
