/**
 * What the spectrum view computes, as plain functions (no React, no ECharts): the y range of
 * the lines in view, the noise floor and the real peaks above it, the fault frequency a peak
 * matches, levels in dB re ISO 1683, the harmonic and sideband cursors' positions with the
 * amplitude read at each, and the dB change between two spectra line by line.
 */
import { toDecibels } from '@turnstone/dsp/decibels';
import type { VibrationUnit } from '@turnstone/dsp/units';
import { largestPeaks } from './chart-values.ts';

/**
 * Lines below this frequency never set the y scale or count as peaks: the envelope's (and any
 * offset's) 0 Hz line and its window leakage into the next lines. Common practice, no source.
 */
export const LOW_CUTOFF_HZ = 2;
/** …and never fewer than this many lines from 0 (DC and the Hann window's two leakage lines). */
export const LOW_CUTOFF_LINES = 3;

/** The low cut on the chart's axis: 2 Hz (in orders at `shaftHz` on an order axis), at least 3 lines. */
export function lowCutoff(step: number, axis: 'hz' | 'order', shaftHz: number | null): number {
  const hz = axis === 'hz' ? LOW_CUTOFF_HZ : shaftHz ? LOW_CUTOFF_HZ / shaftHz : 0;
  return Math.max(LOW_CUTOFF_LINES * step, hz);
}

/** First and last line index inside [from, to] on an axis with lines at k · step. */
function lineRange(length: number, step: number, from: number, to: number): [number, number] {
  const first = Math.max(0, Math.ceil(from / step - 1e-9));
  const last = Math.min(length - 1, Math.floor(to / step + 1e-9));
  return [first, last];
}

/** Largest line in [max(from, lowCut), to]; 0 when the window holds no line. */
export function maxInView(
  values: ArrayLike<number>,
  step: number,
  from: number,
  to: number,
  lowCut: number,
): number {
  const [first, last] = lineRange(values.length, step, Math.max(from, lowCut), to);
  let m = 0;
  for (let k = first; k <= last; k++) {
    const v = values[k]!;
    if (Number.isFinite(v) && v > m) m = v;
  }
  return m;
}

/** Margin of the noise floor above the median line, dB. Common practice, no source. */
export const NOISE_FLOOR_MARGIN_DB = 10;

/**
 * Noise floor of the lines in [max(from, lowCut), to]: their median times 10^(margin/20).
 * The median of a spectrum's lines is its typical (noise) level, little moved by the few
 * lines that carry tones. Returns 0 for an empty window.
 */
export function noiseFloor(
  values: ArrayLike<number>,
  step: number,
  from: number,
  to: number,
  lowCut: number,
  marginDb = NOISE_FLOOR_MARGIN_DB,
): number {
  const [first, last] = lineRange(values.length, step, Math.max(from, lowCut), to);
  if (last < first) return 0;
  const sorted = Array.from({ length: last - first + 1 }, (_, i) => values[first + i]!).sort(
    (a, b) => a - b,
  );
  const n = sorted.length;
  const median = n % 2 === 1 ? sorted[(n - 1) / 2]! : (sorted[n / 2 - 1]! + sorted[n / 2]!) / 2;
  return median * 10 ** (marginDb / 20);
}

/** A real peak: a line above the noise floor, with the fault frequency it matches, if any. */
export interface SpectrumPeak {
  /** Position of the peak's line on the axis. */
  x: number;
  value: number;
  match: FrequencyMark | null;
}

/** A fault frequency or one of its harmonics on the chart's axis. */
export interface FrequencyMark {
  /** e.g. "Motor DE BPFO", "2× Motor DE BPFO". */
  name: string;
  /** Which family it belongs to (one per fault frequency). */
  family: string;
  harmonic: number;
  x: number;
}

/** "2× DE 6205 BPFO"; running speed's own harmonics are plainly "2×", "3×" … */
function harmonicName(name: string, k: number): string {
  if (k === 1) return name;
  return name === '1×' ? `${k}×` : `${k}× ${name}`;
}

/**
 * The harmonics 1 … count of each fault frequency (`x` on the chart's axis) up to `xMax`:
 * the first keeps the name, the others are named "k× name".
 */
export function harmonicMarks(
  base: readonly { name: string; x: number }[],
  count: number,
  xMax: number,
): FrequencyMark[] {
  const out: FrequencyMark[] = [];
  for (const f of base) {
    if (!(f.x > 0)) continue;
    for (let k = 1; k <= count && k * f.x <= xMax; k++)
      out.push({ name: harmonicName(f.name, k), family: f.name, harmonic: k, x: k * f.x });
  }
  return out;
}

/** The mark nearest x within ± tolerance, or null. */
export function matchMark(
  x: number,
  marks: readonly FrequencyMark[],
  tolerance: number,
): FrequencyMark | null {
  let best: FrequencyMark | null = null;
  for (const m of marks) {
    const d = Math.abs(m.x - x);
    if (d <= tolerance + 1e-12 && (!best || d < Math.abs(best.x - x))) best = m;
  }
  return best;
}

/**
 * The real peaks of [from, to], largest first: local maxima as scipy.signal.find_peaks finds
 * them (see {@link largestPeaks}) at or above the {@link noiseFloor} of the same window, at
 * most `count`, each with the mark that lies within one line spacing (the resolution).
 */
export function realPeaks(
  values: ArrayLike<number>,
  step: number,
  from: number,
  to: number,
  opts: { lowCut: number; marks?: readonly FrequencyMark[]; count?: number; marginDb?: number },
): { floor: number; peaks: SpectrumPeak[] } {
  const floor = noiseFloor(values, step, from, to, opts.lowCut, opts.marginDb);
  const found = largestPeaks(values, step, Math.max(from, opts.lowCut), to, Infinity);
  const peaks = found
    .filter((p) => p.value >= floor && p.value > 0)
    .slice(0, opts.count ?? 12)
    .map((p) => ({ x: p.x, value: p.value, match: matchMark(p.x, opts.marks ?? [], step) }));
  return { floor, peaks };
}

/**
 * The line nearest x that is the largest within ± radius lines of x (a cursor put beside a
 * peak lands on it). Returns x's own line when the window is flat.
 */
export function snapToPeak(values: ArrayLike<number>, step: number, x: number, radius = 3): number {
  const centre = Math.round(x / step);
  const lo = Math.max(0, centre - radius);
  const hi = Math.min(values.length - 1, centre + radius);
  let best = Math.min(Math.max(centre, lo), hi);
  for (let k = lo; k <= hi; k++) {
    const v = values[k]!;
    const b = values[best]!;
    if (v > b || (v === b && Math.abs(k - centre) < Math.abs(best - centre))) best = k;
  }
  return best * step;
}

/** One line of a cursor: where it sits and the amplitude read there. */
export interface CursorLine {
  /** Harmonic number (1, 2, …) or sideband number (…, −1, 0 = carrier, 1, …). */
  n: number;
  x: number;
  /** The largest line within ± 1 line of x (a tone between two lines shows on both). */
  amplitude: number | null;
}

function readAt(values: ArrayLike<number>, step: number, x: number): number | null {
  const k = Math.round(x / step);
  if (k < 0 || k >= values.length) return null;
  let m = values[k]!;
  if (k > 0) m = Math.max(m, values[k - 1]!);
  if (k + 1 < values.length) m = Math.max(m, values[k + 1]!);
  return m;
}

/** The harmonic cursor's lines k · fundamental, k = 1 … count, up to the last line. */
export function harmonicLines(
  values: ArrayLike<number>,
  step: number,
  fundamental: number,
  count: number,
): CursorLine[] {
  const xMax = (values.length - 1) * step;
  const out: CursorLine[] = [];
  if (!(fundamental > 0)) return out;
  for (let k = 1; k <= count && k * fundamental <= xMax + 1e-9; k++)
    out.push({ n: k, x: k * fundamental, amplitude: readAt(values, step, k * fundamental) });
  return out;
}

/** The sideband cursor's lines carrier + n · spacing, n = −count … count, inside (0, last line]. */
export function sidebandLines(
  values: ArrayLike<number>,
  step: number,
  carrier: number,
  spacing: number,
  count: number,
): CursorLine[] {
  const xMax = (values.length - 1) * step;
  const out: CursorLine[] = [];
  if (!(carrier > 0) || !(spacing > 0)) return out;
  for (let n = -count; n <= count; n++) {
    const x = carrier + n * spacing;
    if (x > 0 && x <= xMax + 1e-9) out.push({ n, x, amplitude: readAt(values, step, x) });
  }
  return out;
}

/** Spectrum units a level in dB can be given for (dB re ISO 1683 of their quantity). */
export function decibelUnit(unit: string): VibrationUnit | null {
  return unit === 'g' ||
    unit === 'm/s2' ||
    unit === 'mm/s' ||
    unit === 'in/s' ||
    unit === 'um' ||
    unit === 'mil'
    ? unit
    : unit === 'µm'
      ? 'um'
      : null;
}

/**
 * Each line in dB re the ISO 1683 reference of its quantity (acceleration 1 µm/s², velocity
 * 1 nm/s, displacement 1 pm); a line of 0 (no level) is null.
 */
export function toDecibelLines(values: ArrayLike<number>, unit: VibrationUnit): (number | null)[] {
  const out: (number | null)[] = new Array(values.length);
  for (let k = 0; k < values.length; k++) {
    const v = values[k]!;
    out[k] = v > 0 ? toDecibels(v, unit) : null;
  }
  return out;
}

/** `other` read at x by linear interpolation between its lines (null outside it). */
function interpolate(other: ArrayLike<number>, step: number, x: number): number | null {
  const p = x / step;
  const k = Math.floor(p);
  if (k < 0 || k >= other.length) return null;
  if (k === other.length - 1) return p - k < 1e-9 ? other[k]! : null;
  const f = p - k;
  return other[k]! * (1 - f) + other[k + 1]! * f;
}

/**
 * Change from `before` to `after`, dB per line of `after` (20 · log10(after / before)); where
 * the two spectra have different line spacings, `before` is interpolated at `after`'s lines.
 * Null where either has no level.
 */
export function differenceDb(
  after: ArrayLike<number>,
  afterStep: number,
  before: ArrayLike<number>,
  beforeStep: number,
): (number | null)[] {
  const out: (number | null)[] = new Array(after.length);
  for (let k = 0; k < after.length; k++) {
    const a = after[k]!;
    const b = interpolate(before, beforeStep, k * afterStep);
    out[k] = a > 0 && b !== null && b > 0 ? 20 * Math.log10(a / b) : null;
  }
  return out;
}

/** How a spectrum's amplitude is stated: RMS, peak or peak-to-peak. */
export type AmplitudeScale = 'rms' | 'peak' | 'peak-to-peak';

export const amplitudeScaleLabel: Record<AmplitudeScale, string> = {
  rms: 'RMS',
  peak: 'peak',
  'peak-to-peak': 'peak-to-peak',
};

/**
 * Factor from a stored scale to a shown one, for a sine: peak = √2 · RMS, peak-to-peak =
 * 2 · peak. Source: the definition of RMS of a sine (any physics text), common practice.
 */
export function scaleFactor(from: AmplitudeScale, to: AmplitudeScale): number {
  const perRms: Record<AmplitudeScale, number> = {
    rms: 1,
    peak: Math.SQRT2,
    'peak-to-peak': 2 * Math.SQRT2,
  };
  return perRms[to] / perRms[from];
}
