/**
 * The spectrum chart's ECharts option: traces on a Hz or order axis in linear amplitude or
 * dB re ISO 1683, the window shown (kept by the caller, so a new cursor or marker does not
 * reset the zoom), a y axis scaled to the lines in that window above the low cut-off,
 * fault-frequency marks, the harmonic / sideband / two-point cursors, evidence peaks and,
 * with a compared trace, a second grid with the dB change per line.
 */
import { axisStyle, chartColours, formatValue, monoFont, zoomSliderStyle } from './chart-theme.ts';
import type { ChartOption, LineSeriesOption, ScatterSeriesOption } from './echarts.ts';
import { manyValuesLine } from './line-series.ts';
import {
  maxInView,
  noiseFloor,
  toDecibelLines,
  type CursorLine,
  type FrequencyMark,
} from './spectrum-math.ts';
import type { VibrationUnit } from '@turnstone/dsp/units';
import { toDecibels } from '@turnstone/dsp/decibels';

export interface SpectrumTrace {
  /** Legend and tooltip name, e.g. the capture time. */
  label: string;
  /** Line k sits at k · step on the x axis, in the unit shown (scale applied). */
  values: Float32Array;
  step: number;
  /** The compared trace is drawn thinner, in a second colour. */
  role: 'main' | 'compare';
}

export type MarkKind = 'shaft' | 'bpfo' | 'bpfi' | 'bsf' | 'ftf' | 'gear-mesh' | 'blade-pass';
export interface ChartMark extends FrequencyMark {
  kind: MarkKind;
}

export interface SpectrumHighlight {
  x: number;
  y: number;
  label: string;
}

export interface SpectrumCursors {
  harmonic: readonly CursorLine[];
  sideband: readonly CursorLine[];
  /** The two-point cursor: A and B, each a position on the axis. */
  points: readonly { name: 'A' | 'B'; x: number }[];
  /** The keyboard cursor while it has the focus: where Enter would set a cursor. */
  probe?: number | null;
}

export interface SpectrumOptionInput {
  traces: readonly SpectrumTrace[];
  axis: 'hz' | 'order';
  /** Axis title, e.g. "mm/s RMS" or "dB re 1 nm/s (mm/s RMS)". */
  yName: string;
  unit: string;
  /** dB re ISO 1683 of this unit, or null for linear amplitude. */
  decibels: VibrationUnit | null;
  /** The window shown on the x axis. */
  view: readonly [number, number];
  /** Lines below this never set the y scale (see `lowCutoff`). */
  lowCut: number;
  marks: readonly ChartMark[];
  cursors: SpectrumCursors;
  highlights: readonly SpectrumHighlight[];
  /** dB change per line of the main trace against the compared one, drawn in a second grid. */
  difference: { values: readonly (number | null)[]; step: number } | null;
}

export const markColour: Record<MarkKind, string> = {
  shaft: chartColours.ink,
  bpfo: chartColours.danger,
  bpfi: chartColours.alert,
  bsf: chartColours.quality,
  ftf: chartColours.ok,
  'gear-mesh': chartColours.compare,
  'blade-pass': chartColours.compare,
};
export const markDash: Record<MarkKind, 'solid' | 'dashed' | 'dotted'> = {
  shaft: 'solid',
  bpfo: 'dashed',
  bpfi: 'dashed',
  bsf: 'dotted',
  ftf: 'dotted',
  'gear-mesh': 'dashed',
  'blade-pass': 'dashed',
};

/** The y range of the window: 0 … 110 % of the largest line (linear), or median − 20 dB … max + 6 dB. */
export function yRange(p: SpectrumOptionInput): { min: number; max: number } {
  const [from, to] = p.view;
  let top = 0;
  let median = Infinity;
  for (const t of p.traces) {
    top = Math.max(top, maxInView(t.values, t.step, from, to, p.lowCut));
    const m = noiseFloor(t.values, t.step, from, to, p.lowCut, 0);
    if (m > 0) median = Math.min(median, m);
  }
  if (!p.decibels) return { min: 0, max: top > 0 ? top * 1.1 : 1 };
  if (!(top > 0)) return { min: 0, max: 100 };
  const max = Math.ceil((toDecibels(top, p.decibels) + 6) / 5) * 5;
  const low = Number.isFinite(median) ? toDecibels(median, p.decibels) - 20 : max - 80;
  return { min: Math.floor(Math.max(low, max - 120) / 5) * 5, max };
}

function cursorMark(x: number, label: string, colour: string, type: 'dotted' | 'dashed' | 'solid') {
  return {
    xAxis: x,
    name: label,
    label: {
      show: true,
      formatter: label,
      position: 'end' as const,
      color: colour,
      fontFamily: monoFont,
      fontSize: 11,
    },
    lineStyle: { color: colour, type, width: 1.2, opacity: 1 },
    emphasis: { label: { show: true } },
  };
}

/** Text of a line value: the amplitude in its unit, or its level in dB. */
function levelText(p: SpectrumOptionInput, v: number | null | undefined): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  if (!p.decibels) return `${formatValue(v, 4)} ${p.unit}`;
  return v > 0 ? `${toDecibels(v, p.decibels).toFixed(1)} dB` : '—';
}

const escapeHtml = (t: string) =>
  t.replace(/[&<>"]/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;' })[c]!);

/**
 * The hover box: the position, then every trace's line nearest it (so a compared capture is
 * read at the same place even with another line spacing) and the change between them.
 */
export function hoverText(p: SpectrumOptionInput, params: unknown): string {
  const first = (Array.isArray(params) ? params[0] : params) as { axisValue?: unknown } | undefined;
  const x = Number(first?.axisValue);
  if (!Number.isFinite(x)) return '';
  const xName = p.axis === 'hz' ? 'Hz' : 'order';
  const rows = [`${formatValue(x, 4)} ${xName}`];
  const at = (t: SpectrumTrace) => {
    const k = Math.round(x / t.step);
    return k >= 0 && k < t.values.length ? t.values[k]! : null;
  };
  for (const t of p.traces) rows.push(`${escapeHtml(t.label)}: ${levelText(p, at(t))}`);
  if (p.difference) {
    const k = Math.round(x / p.difference.step);
    const d = p.difference.values[k];
    rows.push(
      `Change: ${d === null || d === undefined ? '—' : `${d >= 0 ? '+' : ''}${d.toFixed(1)} dB`}`,
    );
  }
  return rows.join('<br>');
}

export function buildSpectrumOption(p: SpectrumOptionInput): ChartOption {
  const xName = p.axis === 'hz' ? 'Hz' : 'order';
  const xMax = Math.max(0, ...p.traces.map((t) => (t.values.length - 1) * t.step));
  const series: (LineSeriesOption | ScatterSeriesOption)[] = p.traces.map((t) => {
    const ys = p.decibels ? toDecibelLines(t.values, p.decibels) : Array.from(t.values);
    const data: [number, number | null][] = ys.map((y, k) => [k * t.step, y]);
    const main = t.role === 'main';
    const color = main ? chartColours.accent : chartColours.compare;
    return manyValuesLine(
      t.label,
      data,
      { color, width: main ? 1.3 : 1, opacity: main ? 1 : 0.85 },
      { connectNulls: false, itemStyle: { color }, z: main ? 3 : 2 },
    );
  });
  const marks = p.marks
    .filter((m) => m.x > 0 && m.x <= xMax)
    .map((m) => ({
      xAxis: m.x,
      name: m.name,
      // Named on hover and in the key under the chart, never in stacked rotated text.
      label: {
        show: false,
        formatter: `${m.name} ${formatValue(m.x, 4)} ${xName}`,
        position: 'insideEndTop' as const,
        color: chartColours.ink as string,
        fontFamily: monoFont,
        fontSize: 11,
      },
      emphasis: { label: { show: true } },
      lineStyle: {
        color: markColour[m.kind],
        type: markDash[m.kind],
        width: 1,
        opacity: m.harmonic === 1 ? 0.85 : 0.5,
      },
    }));
  const c = p.cursors;
  const cursorMarks = [
    ...c.harmonic.map((l) => cursorMark(l.x, `${l.n}×`, chartColours.accent, 'dotted')),
    ...c.sideband.map((l) =>
      cursorMark(
        l.x,
        l.n === 0 ? 'C' : `${l.n > 0 ? '+' : '−'}${Math.abs(l.n)}`,
        chartColours.quality,
        l.n === 0 ? 'solid' : 'dashed',
      ),
    ),
    ...c.points.map((pt) => cursorMark(pt.x, pt.name, chartColours.ink, 'solid')),
    ...(c.probe !== null && c.probe !== undefined
      ? [cursorMark(c.probe, 'keys', chartColours.ink, 'dashed')]
      : []),
  ];
  const first = series[0] as LineSeriesOption | undefined;
  if (first)
    first.markLine = {
      symbol: ['none', 'none'],
      silent: false,
      animation: false,
      data: [...marks, ...cursorMarks],
    };
  const highlights = p.highlights.filter((h) => h.x > 0 && h.x <= xMax);
  if (highlights.length > 0)
    series.push({
      name: 'Hint evidence',
      type: 'scatter',
      data: highlights.map((h) => ({
        value: [h.x, p.decibels && h.y > 0 ? toDecibels(h.y, p.decibels) : h.y],
        name: h.label,
      })),
      symbol: 'diamond',
      symbolSize: 12,
      itemStyle: { color: chartColours.danger, borderColor: chartColours.surface, borderWidth: 1 },
      label: {
        show: true,
        position: 'top',
        formatter: (d: { name: string }) => d.name,
        color: chartColours.danger,
        fontSize: 11,
        fontWeight: 600,
      },
      z: 5,
    });
  const diff = p.difference;
  if (diff)
    series.push({
      name: 'Change (dB)',
      type: 'line',
      xAxisIndex: 1,
      yAxisIndex: 1,
      data: diff.values.map((y, k) => [k * diff.step, y]),
      showSymbol: false,
      sampling: 'lttb',
      connectNulls: false,
      lineStyle: { color: chartColours.ink, width: 1 },
      itemStyle: { color: chartColours.ink },
      markLine: {
        symbol: ['none', 'none'],
        silent: true,
        data: [{ yAxis: 0 }],
        lineStyle: { color: chartColours.lineStrong, type: 'solid' },
        label: { show: false },
      },
    });
  const ax = axisStyle();
  const y = yRange(p);
  const [from, to] = p.view;
  const xAxis = (gridIndex: number) => ({
    type: 'value' as const,
    gridIndex,
    name: gridIndex === 0 && diff ? '' : xName,
    nameLocation: 'end' as const,
    min: 0,
    max: xMax,
    ...ax,
    splitLine: { show: false },
    axisLabel: { ...ax.axisLabel, formatter: (v: number) => formatValue(v) },
    axisPointer: {
      label: {
        formatter: (v: { value: unknown }) => `${formatValue(Number(v.value), 4)} ${xName}`,
      },
    },
  });
  const xIndexes = diff ? [0, 1] : [0];
  return {
    animation: false,
    grid: diff
      ? [
          { left: 64, right: 28, top: 28, height: '52%' },
          { left: 64, right: 28, bottom: 64, height: '18%' },
        ]
      : { left: 64, right: 28, top: 28, bottom: 64 },
    legend:
      p.traces.length > 1
        ? {
            top: 0,
            right: 24,
            data: p.traces.map((t) => t.label),
            textStyle: { fontFamily: monoFont, fontSize: 11, color: chartColours.inkMuted },
          }
        : undefined,
    axisPointer: diff ? { link: [{ xAxisIndex: 'all' }] } : undefined,
    tooltip: {
      trigger: 'axis',
      textStyle: { fontFamily: monoFont, fontSize: 12 },
      formatter: (params: unknown) => hoverText(p, params),
    },
    xAxis: diff ? [xAxis(0), xAxis(1)] : xAxis(0),
    yAxis: [
      {
        type: 'value',
        name: p.yName,
        min: y.min,
        max: y.max,
        ...ax,
        axisLabel: { ...ax.axisLabel, formatter: (v: number) => formatValue(v) },
      },
      ...(diff
        ? [
            {
              type: 'value' as const,
              gridIndex: 1,
              name: 'change, dB',
              ...ax,
              axisLabel: { ...ax.axisLabel, formatter: (v: number) => v.toFixed(0) },
            },
          ]
        : []),
    ],
    // The window is the caller's (startValue/endValue), so options built for a new cursor or
    // marker keep it. Filtering to the window makes the down-sampling count only the lines
    // shown, so a zoomed peak is drawn at its own line.
    dataZoom: [
      {
        type: 'inside',
        xAxisIndex: xIndexes,
        filterMode: 'filter',
        startValue: from,
        endValue: to,
      },
      {
        type: 'slider',
        xAxisIndex: xIndexes,
        ...zoomSliderStyle(),
        filterMode: 'filter',
        startValue: from,
        endValue: to,
      },
    ],
    series,
  };
}
