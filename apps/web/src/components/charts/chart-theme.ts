/**
 * Chart colours and fonts: the app's palette (index.css @theme) for canvas drawing, which
 * cannot read CSS variables. Status colours always come with a line style or shape too.
 */
export const chartColours = {
  ink: '#22262b',
  inkMuted: '#5b6068',
  inkFaint: '#80858c',
  line: '#dedad2',
  lineStrong: '#c8c3b9',
  paper: '#f5f3ef',
  surface: '#fffefc',
  accent: '#1b5a60',
  accentSoft: '#e1ecec',
  ok: '#3f7a55',
  alert: '#a8741a',
  danger: '#a53d33',
  quality: '#66548f',
  compare: '#8a5a2b',
} as const;

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

/** Number with sensible significant digits for axis and tooltip text. */
export function formatValue(v: number, digits = 3): string {
  if (!Number.isFinite(v)) return '—';
  const a = Math.abs(v);
  if (a === 0) return '0';
  if (a >= 1000) return v.toFixed(0);
  if (a >= 100) return v.toFixed(1);
  return v.toPrecision(digits);
}
