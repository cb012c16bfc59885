/**
 * Where the waterfall draws each spectrum and which line the pointer is over. Pure (no chart,
 * no DOM), so the drawing and the hover readout share one geometry and it can be tested alone.
 *
 * Every trace keeps the same amplitude scale; trace i (0 = newest, in front) is raised by
 * i·dy and shifted right by i·dx, so its line k is drawn at (k·step + i·dx, v[k] + i·dy).
 */

export interface LayoutTrace {
  values: Float32Array;
  step: number;
}

export interface WaterfallLayout {
  /** The band of the front trace's axis drawn (Hz or orders). */
  from: number;
  to: number;
  /** How many traces. */
  n: number;
  /** Right shift per trace (axis units) and rise per trace (amplitude units). */
  dx: number;
  dy: number;
  /** The reference amplitude: the median trace's largest line in the band. */
  yRef: number;
  /** Top of the amplitude axis. */
  yTop: number;
}

/** The front trace's axis: 0 to the last line of the longest spectrum. */
export function waterfallExtent(traces: readonly LayoutTrace[]): [number, number] {
  let xMax = 0;
  for (const t of traces) xMax = Math.max(xMax, (t.values.length - 1) * t.step);
  return [0, xMax];
}

/** Largest line of a trace between `from` and `to` (axis units). */
function largestIn(t: LayoutTrace, from: number, to: number): number {
  let m = 0;
  if (!(t.step > 0)) return m;
  const last = Math.min(t.values.length - 1, Math.ceil(to / t.step));
  for (let k = Math.max(0, Math.floor(from / t.step)); k <= last; k++)
    m = Math.max(m, t.values[k]!);
  return m;
}

/**
 * The layout of the band [from, to]: scaled to the median trace's largest line in the band,
 * so one extreme capture (e.g. clipped) does not flatten the rest (its peaks are cut at the
 * top); older traces shifted right by a quarter of the band over the whole stack.
 */
export function waterfallLayout(
  traces: readonly LayoutTrace[],
  band: readonly [number, number] = waterfallExtent(traces),
): WaterfallLayout {
  const [from, to] = band;
  const n = traces.length;
  const sorted = traces.map((t) => largestIn(t, from, to)).sort((x, y) => x - y);
  const yRef = sorted[Math.floor(sorted.length / 2)] || 1;
  const dy = (yRef * 0.5) / Math.max(1, Math.sqrt(n) / 2);
  const yTop = (n - 1) * dy + yRef * 1.4;
  const dx = ((to - from) * 0.25) / Math.max(1, n - 1);
  return { from, to, n, dx, dy, yRef, yTop };
}

export interface WaterfallPick {
  /** Index of the trace (0 = newest). */
  trace: number;
  /** Line index in that trace, and its position on the trace's own axis. */
  line: number;
  x: number;
  amplitude: number;
}

/** Lines either side of the pointer searched for the largest, so a hover lands on the peak. */
export const PICK_SNAP_LINES = 2;

/**
 * The line under the pointer at chart coordinates (x, y): the frontmost trace whose filled
 * shape covers the point (what the eye sees there), else the trace whose line passes nearest
 * above or below it; snapped to the largest line within ±{@link PICK_SNAP_LINES}. Null when
 * the pointer is left of every trace or beyond the band drawn.
 */
export function pickWaterfall(
  traces: readonly LayoutTrace[],
  layout: WaterfallLayout,
  x: number,
  y: number,
): WaterfallPick | null {
  let best: { i: number; k: number; gap: number } | null = null;
  for (let i = 0; i < traces.length; i++) {
    const t = traces[i]!;
    if (!(t.step > 0)) continue;
    const f = x - i * layout.dx;
    if (f < layout.from - t.step / 2 || f > layout.to + t.step / 2) continue;
    const k = Math.round(f / t.step);
    if (k < 0 || k >= t.values.length) continue;
    const base = i * layout.dy;
    const top = t.values[k]! + base;
    if (y >= base && y <= top) {
      best = { i, k, gap: 0 };
      break;
    }
    const gap = y < base ? base - y : y - top;
    if (!best || gap < best.gap) best = { i, k, gap };
  }
  if (!best) return null;
  const t = traces[best.i]!;
  let k = best.k;
  const lo = Math.max(0, best.k - PICK_SNAP_LINES);
  const hi = Math.min(t.values.length - 1, best.k + PICK_SNAP_LINES);
  for (let j = lo; j <= hi; j++) if (t.values[j]! > t.values[k]!) k = j;
  return { trace: best.i, line: k, x: k * t.step, amplitude: t.values[k]! };
}

/** Where line `line` of trace `trace` is drawn (its top), in chart coordinates. */
export function drawnAt(
  traces: readonly LayoutTrace[],
  layout: WaterfallLayout,
  trace: number,
  line: number,
): [number, number] {
  const t = traces[trace]!;
  return [line * t.step + trace * layout.dx, t.values[line]! + trace * layout.dy];
}

/**
 * The Hz and order of a position on a trace's axis: an order axis times the running speed
 * gives Hz, a Hz axis over it gives the order (order = f / f₁×); null where the speed is not
 * known.
 */
export function hzAndOrder(
  x: number,
  axis: 'hz' | 'order',
  shaftHz: number | null,
): { hz: number | null; order: number | null } {
  const speed = shaftHz !== null && shaftHz > 0 ? shaftHz : null;
  if (axis === 'hz') return { hz: x, order: speed ? x / speed : null };
  return { hz: speed ? x * speed : null, order: x };
}

/** 0 and round steps (1, 2 or 5 × 10ⁿ) up to `top`, four or five of them. */
export function niceTicks(top: number): number[] {
  if (!(top > 0)) return [0];
  const raw = top / 4;
  const p = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * p).find((s) => s >= raw)!;
  const out: number[] = [];
  for (let v = 0; v <= top * (1 + 1e-9); v += step) out.push(Number(v.toPrecision(12)));
  return out;
}
