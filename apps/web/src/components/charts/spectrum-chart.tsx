/**
 * A spectrum on a Hz or order axis, with fault-frequency markers (1×, harmonics, bearing,
 * gear mesh, blade pass), a harmonic cursor (click the chart to put the fundamental there),
 * a second spectrum to compare and zoom (wheel/drag and a slider).
 */
import { useMemo } from 'react';
import {
  axisStyle,
  chartColours,
  formatValue,
  monoFont,
  sansFont,
  zoomSliderStyle,
} from './chart-theme.ts';
import type { ChartOption, LineSeriesOption, ScatterSeriesOption } from './echarts.ts';
import { useEChart } from './use-echart.ts';
import { useChartZoom, xExtent, ZoomKeys } from './zoom-keys.tsx';
import { ChartCanvas } from './chart-canvas.tsx';

export interface SpectrumTrace {
  /** Legend and tooltip name, e.g. the capture time. */
  label: string;
  /** Line k sits at k · step on the x axis. */
  values: Float32Array;
  step: number;
  /** The compared trace is drawn thinner, in a second colour. */
  role: 'main' | 'compare';
}

export interface SpectrumMarker {
  /** e.g. "1×", "Motor DE BPFO". */
  name: string;
  /** Position on the chart's x axis (Hz or orders). */
  x: number;
  kind: 'shaft' | 'bpfo' | 'bpfi' | 'bsf' | 'ftf' | 'gear-mesh' | 'blade-pass';
}

export interface SpectrumHighlight {
  x: number;
  y: number;
  label: string;
}

export interface SpectrumChartProps {
  traces: readonly SpectrumTrace[];
  axis: 'hz' | 'order';
  /** Amplitude unit and scale, e.g. "g RMS". */
  yName: string;
  unit: string;
  markers?: readonly SpectrumMarker[];
  /** Harmonic cursor: lines at k · fundamental, k = 1 … count. */
  cursor?: { fundamental: number; count: number } | null;
  onPick?: (x: number) => void;
  /** Peaks to highlight (a diagnosis hint's evidence): position on the axes and a label. */
  highlights?: readonly SpectrumHighlight[];
  height?: number;
  ariaLabel: string;
}

const markerColour: Record<SpectrumMarker['kind'], string> = {
  shaft: chartColours.ink,
  bpfo: chartColours.danger,
  bpfi: chartColours.alert,
  bsf: chartColours.quality,
  ftf: chartColours.ok,
  'gear-mesh': chartColours.compare,
  'blade-pass': chartColours.compare,
};
const markerType: Record<SpectrumMarker['kind'], 'solid' | 'dashed' | 'dotted'> = {
  shaft: 'solid',
  bpfo: 'dashed',
  bpfi: 'dashed',
  bsf: 'dotted',
  ftf: 'dotted',
  'gear-mesh': 'dashed',
  'blade-pass': 'dashed',
};

/** The evidence window runs from 0 to this many times the highest evidence peak (rounded up). */
const EVIDENCE_ZOOM = 2;

/** The next 1, 2 or 5 × 10ⁿ at or above x (0 for 0). */
function niceCeil(x: number): number {
  if (!(x > 0)) return 0;
  const p = 10 ** Math.floor(Math.log10(x));
  return ([1, 2, 5, 10].find((m) => m * p >= x) ?? 10) * p;
}

export function buildSpectrumOption(p: SpectrumChartProps): ChartOption {
  const xName = p.axis === 'hz' ? 'Hz' : 'order';
  let xMax = 0;
  const series: LineSeriesOption[] = p.traces.map((t) => {
    const data: [number, number][] = new Array(t.values.length);
    for (let k = 0; k < t.values.length; k++) data[k] = [k * t.step, t.values[k]!];
    xMax = Math.max(xMax, (t.values.length - 1) * t.step);
    return {
      name: t.label,
      type: 'line',
      data,
      showSymbol: false,
      sampling: 'max',
      lineStyle: {
        color: t.role === 'main' ? chartColours.accent : chartColours.compare,
        width: t.role === 'main' ? 1.3 : 1,
        opacity: t.role === 'main' ? 1 : 0.85,
      },
      itemStyle: { color: t.role === 'main' ? chartColours.accent : chartColours.compare },
      z: t.role === 'main' ? 3 : 2,
    };
  });
  const markLines = (p.markers ?? [])
    .filter((m) => m.x > 0 && m.x <= xMax)
    .map((m) => ({
      xAxis: m.x,
      name: m.name,
      // Named in the key under the chart and on hover, not in stacked rotated text.
      label: {
        show: false,
        formatter: m.name,
        position: 'insideEndTop' as 'insideEndTop' | 'end',
        rotate: 0,
        color: chartColours.ink as string,
        fontFamily: sansFont,
        fontSize: 12,
      },
      emphasis: { label: { show: true } },
      lineStyle: { color: markerColour[m.kind], type: markerType[m.kind], width: 1, opacity: 0.8 },
    }));
  const cursorLines: typeof markLines = [];
  if (p.cursor && p.cursor.fundamental > 0) {
    for (let k = 1; k <= p.cursor.count; k++) {
      const x = k * p.cursor.fundamental;
      if (x > xMax) break;
      cursorLines.push({
        xAxis: x,
        name: `${k}× cursor`,
        label: {
          show: true,
          formatter: `${k}×`,
          position: 'end' as const,
          rotate: 0,
          color: chartColours.accent,
          fontFamily: monoFont,
          fontSize: 11,
        },
        lineStyle: { color: chartColours.accent, type: 'dotted', width: 1.2, opacity: 1 },
        emphasis: { label: { show: true } },
      });
    }
  }
  const first = series[0];
  if (first) {
    first.markLine = {
      symbol: ['none', 'none'],
      silent: false,
      animation: false,
      data: [...markLines, ...cursorLines],
    };
  }
  const highlights = (p.highlights ?? []).filter((h) => h.x > 0 && h.x <= xMax);
  const evidence: ScatterSeriesOption | null =
    highlights.length === 0
      ? null
      : {
          name: 'Hint evidence',
          type: 'scatter',
          data: highlights.map((h) => ({ value: [h.x, h.y], name: h.label })),
          symbol: 'diamond',
          symbolSize: 12,
          itemStyle: {
            color: chartColours.danger,
            borderColor: chartColours.surface,
            borderWidth: 1,
          },
          label: {
            show: true,
            position: 'top',
            formatter: (d: { name: string }) => d.name,
            color: chartColours.danger,
            fontFamily: sansFont,
            fontSize: 11,
            fontWeight: 600,
          },
          z: 5,
        };
  const windowEnd = niceCeil(EVIDENCE_ZOOM * Math.max(0, ...highlights.map((h) => h.x)));
  const evidenceWindow =
    windowEnd > 0 && windowEnd < xMax ? { startValue: 0, endValue: windowEnd } : {};
  const ax = axisStyle();
  return {
    animation: false,
    grid: { left: 64, right: 28, top: 28, bottom: 64 },
    legend:
      p.traces.length > 1
        ? {
            top: 0,
            right: 24,
            textStyle: { fontFamily: monoFont, fontSize: 11, color: chartColours.inkMuted },
          }
        : undefined,
    tooltip: {
      trigger: 'axis',
      textStyle: { fontFamily: monoFont, fontSize: 12 },
      valueFormatter: (v) => (typeof v === 'number' ? `${formatValue(v, 4)} ${p.unit}` : String(v)),
    },
    xAxis: {
      type: 'value',
      name: xName,
      nameLocation: 'end',
      min: 0,
      max: xMax,
      ...ax,
      splitLine: { show: false },
      axisLabel: { ...ax.axisLabel, formatter: (v: number) => formatValue(v) },
      axisPointer: {
        label: { formatter: (v) => `${formatValue(Number(v.value), 4)} ${xName}` },
      },
    },
    yAxis: {
      type: 'value',
      name: p.yName,
      ...ax,
      axisLabel: { ...ax.axisLabel, formatter: (v: number) => formatValue(v) },
    },
    // With evidence to show, the window opens on it (the peaks of a shaft-family hint sit in
    // the first percent of a 5 kHz axis); the slider and wheel still reach the whole axis.
    // Filtering to the window makes the line's down-sampling count only the lines shown, so a
    // zoomed peak is drawn at its own line, not merged with its neighbour.
    dataZoom: [
      { type: 'inside', xAxisIndex: 0, filterMode: 'filter', ...evidenceWindow },
      {
        type: 'slider',
        xAxisIndex: 0,
        ...zoomSliderStyle(),
        filterMode: 'filter',
        ...evidenceWindow,
      },
    ],
    series: evidence ? [...series, evidence] : series,
  };
}

export function SpectrumChart(props: SpectrumChartProps) {
  const { traces, axis, yName, unit, markers, cursor, onPick, highlights } = props;
  const option = useMemo(
    () =>
      buildSpectrumOption({
        traces,
        axis,
        yName,
        unit,
        markers,
        cursor,
        highlights,
        ariaLabel: '',
      }),
    [traces, axis, yName, unit, markers, cursor, highlights],
  );
  const { ref, chart } = useEChart(option, (chart) => {
    const zr = chart.getZr();
    const onClick = (e: { offsetX: number; offsetY: number }) => {
      if (!chart.containPixel({ gridIndex: 0 }, [e.offsetX, e.offsetY])) return;
      const [x] = chart.convertFromPixel({ gridIndex: 0 }, [e.offsetX, e.offsetY]) as number[];
      if (x !== undefined && x > 0) onPick?.(x);
    };
    zr.on('click', onClick);
    return () => zr.off('click', onClick);
  });
  const zoom = useChartZoom(chart, option);
  const shown = (markers ?? []).filter((m) => m.x > 0);
  const xUnit = axis === 'hz' ? 'Hz' : 'order';
  return (
    <div>
      <ChartCanvas
        canvasRef={ref}
        ariaLabel={props.ariaLabel}
        height={props.height ?? 360}
        className="w-full cursor-crosshair"
      />
      {shown.length > 0 && <MarkerKey markers={shown} unit={xUnit} />}
      <div className="mt-2 px-2">
        <ZoomKeys
          chart={chart}
          shown={zoom}
          label="spectrum"
          extent={xExtent(option)}
          format={(v) => `${formatValue(v, 4)} ${xUnit}`}
        />
      </div>
    </div>
  );
}

const dash: Record<'solid' | 'dashed' | 'dotted', string> = {
  solid: '',
  dashed: '4 3',
  dotted: '1.5 2.5',
};

/** The markers' key: line style, colour, name and position, as text. */
function MarkerKey({ markers, unit }: { markers: readonly SpectrumMarker[]; unit: string }) {
  return (
    <ul
      aria-label="Frequency markers"
      className="mt-1 flex flex-wrap gap-x-4 gap-y-1 px-2 text-xs text-ink-muted"
    >
      {markers.map((m) => (
        <li key={`${m.kind}-${m.name}-${m.x}`} className="inline-flex items-center gap-1.5">
          <svg viewBox="0 0 18 6" aria-hidden="true" className="h-1.5 w-[18px]">
            <line
              x1="0"
              y1="3"
              x2="18"
              y2="3"
              stroke={markerColour[m.kind]}
              strokeWidth="2"
              strokeDasharray={dash[markerType[m.kind]]}
            />
          </svg>
          <span className="text-ink">{m.name}</span>
          <span className="font-mono">
            {formatValue(m.x, 4)} {unit}
          </span>
        </li>
      ))}
    </ul>
  );
}
