/**
 * Chart colours and fonts: the app's palette (index.css @theme) for canvas drawing, which
 * cannot read CSS variables. Status colours always come with a line style or shape too.
 */
export const chartColours = {
  ink: '#22262b',
  inkMuted: '#50555c',
  inkFaint: '#63686f',
  line: '#dedad2',
  lineStrong: '#8a857c',
  paper: '#f5f3ef',
  surface: '#fffefc',
  accent: '#1b5a60',
  accentStrong: '#134449',
  accentSoft: '#e1ecec',
  ok: '#3f7a55',
  alert: '#a8741a',
  /** The alert amber for text: 5.6:1 on the chart's surface (the line colour is 4.0:1). */
  alertText: '#8a5f16',
  danger: '#a53d33',
  quality: '#66548f',
  compare: '#8a5a2b',
} as const;

/** Trend series colours in the order series are added (index.css --color-series-1…6). */
export const seriesColours = [
  '#1b5a60',
  '#2b5797',
  '#8a5a2b',
  '#8c3a6e',
  '#4c5661',
  '#0f6e8c',
] as const;
/** Each series' symbol, so no series is told from another by colour alone. */
export const seriesSymbols = [
  'circle',
  'triangle',
  'rect',
  'diamond',
  'roundRect',
  'arrow',
] as const;

export const monoFont = "'Roboto Mono', ui-monospace, monospace";
export const sansFont = "'Inter', ui-sans-serif, system-ui, sans-serif";

/** Axis styling shared by every chart. */
export function axisStyle() {
  return {
    axisLine: { lineStyle: { color: chartColours.lineStrong } },
    axisTick: { lineStyle: { color: chartColours.lineStrong } },
    axisLabel: { color: chartColours.inkMuted, fontFamily: monoFont, fontSize: 11 },
    splitLine: { lineStyle: { color: chartColours.line, opacity: 0.7 } },
    nameTextStyle: { color: chartColours.inkMuted, fontFamily: sansFont, fontSize: 11 },
  } as const;
}

/** Axis and tooltip numbers follow the app's one number rule (significant digits). */
export { formatNumber as formatValue } from '@turnstone/contracts/number-format';

/**
 * The zoom slider in the app's palette (the library's default blue is ~1.5–2.2:1 on paper):
 * handles and the selected span at 3:1 or more, labels in the muted ink.
 */
export function zoomSliderStyle() {
  return {
    height: 20,
    bottom: 12,
    filterMode: 'none' as const,
    borderColor: chartColours.lineStrong,
    backgroundColor: chartColours.surface,
    fillerColor: 'rgba(27, 90, 96, 0.14)',
    dataBackground: {
      lineStyle: { color: chartColours.lineStrong },
      areaStyle: { color: chartColours.line },
    },
    selectedDataBackground: {
      lineStyle: { color: chartColours.accent },
      areaStyle: { color: chartColours.accentSoft },
    },
    handleStyle: { color: chartColours.surface, borderColor: chartColours.accent },
    moveHandleStyle: { color: chartColours.accent, opacity: 0.6 },
    emphasis: {
      handleStyle: { borderColor: chartColours.accentStrong },
      moveHandleStyle: { color: chartColours.accentStrong },
    },
    textStyle: { fontFamily: monoFont, fontSize: 11, color: chartColours.inkMuted },
  };
}
