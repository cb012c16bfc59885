/**
 * Reading peaks for the diagnosis: the local noise floor, the search windows around expected
 * frequencies, and the evidence a peak becomes. Shared by every rule (diagnosis-*.ts).
 */
import type { DiagnosisEvidence, EvidenceSpectrum } from './diagnosis-types.ts';

/**
 * A peak counts only when its line stands this far above the median of the lines around it
 * (12 dB). For one unaveraged line of Gaussian noise the chance of exceeding 4 × the median
 * is exp(−(4 · 1.177)²/2) ≈ 1.5·10⁻⁵ (Rayleigh amplitude); Welch-averaged lines scatter less.
 * Common practice (peaks 10–15 dB above the floor), no source.
 */
export const NOISE_FLOOR_RATIO = 4;
/** Lines each side over which the local noise floor is taken. Common practice, no source. */
export const NOISE_FLOOR_HALF_WIDTH_LINES = 60;
/**
 * The local floor is the lower quartile of the lines around a peak, scaled to a median
 * (× 1.55, the median/quartile ratio of a Rayleigh-distributed noise line: √(ln 2 / ln(4/3))),
 * so a long series of harmonics filling up to three quarters of the window does not lift it.
 * Source: the Rayleigh distribution's quantiles (definition); Welch-averaged lines scatter
 * less, which makes this floor slightly high (a conservative error).
 */
export const NOISE_FLOOR_QUARTILE_TO_MEDIAN = Math.sqrt(Math.LN2 / Math.log(4 / 3));
/** Lines each side of a peak left out of its own noise floor (Hann main lobe ±2 lines, plus one). */
export const NOISE_FLOOR_GAP_LINES = 3;
/** Search half-width, in lines, around every expected frequency (interpolation and leakage). */
export const LINE_TOLERANCE = 1.5;
/** Search half-width around harmonics of the located 1×, fraction of the frequency. */
export const HARMONIC_TOLERANCE = 0.003;

export interface Lines {
  values: ArrayLike<number>;
  dfHz: number;
  enbwBins: number;
  /** Lines below this index are not read (zeroed below the velocity cut-off, envelope mean). */
  firstLine: number;
}

export interface Peak {
  hz: number;
  /** Tone amplitude: √(Σ of the main lobe's line powers / ENBW). */
  amplitude: number;
  /** Local noise floor per line (median-equivalent), in the spectrum's unit. */
  floor: number;
  /** The peak line clears {@link NOISE_FLOOR_RATIO} × the floor. */
  present: boolean;
}

/** Median-equivalent floor: the lower quartile × {@link NOISE_FLOOR_QUARTILE_TO_MEDIAN}. */
export function noiseFloor(values: ArrayLike<number>): number {
  if (values.length === 0) return 0;
  // A typed array sorts numerically without a comparator call per pair (the worker reads
  // dozens of peaks per capture).
  const sorted = Float64Array.from(values).sort();
  return sorted[Math.floor(sorted.length / 4)]! * NOISE_FLOOR_QUARTILE_TO_MEDIAN;
}

/** The largest local maximum within ±tolHz of hz, or null when the window holds none. */
export function readPeak(s: Lines, hz: number, tolHz: number): Peak | null {
  const v = s.values;
  const len = v.length;
  const lo = Math.max(s.firstLine + 1, Math.ceil((hz - tolHz) / s.dfHz));
  const hi = Math.min(len - 2, Math.floor((hz + tolHz) / s.dfHz));
  let best = -1;
  for (let k = lo; k <= hi; k++) {
    const x = v[k]!;
    if (x >= v[k - 1]! && x >= v[k + 1]! && (best < 0 || x > v[best]!)) best = k;
  }
  if (best < 0) return null;
  const a = v[best - 1]!;
  const b = v[best]!;
  const c = v[best + 1]!;
  const denom = a - 2 * b + c;
  const delta = denom < 0 ? Math.max(-0.5, Math.min(0.5, (0.5 * (a - c)) / denom)) : 0;
  let power = 0;
  for (let k = Math.max(s.firstLine, best - 2); k <= Math.min(len - 1, best + 2); k++) {
    power += v[k]! * v[k]!;
  }
  const around: number[] = [];
  const from = Math.max(s.firstLine, best - NOISE_FLOOR_HALF_WIDTH_LINES);
  const to = Math.min(len - 1, best + NOISE_FLOOR_HALF_WIDTH_LINES);
  for (let k = from; k <= to; k++) {
    if (Math.abs(k - best) > NOISE_FLOOR_GAP_LINES) around.push(v[k]!);
  }
  const floor = noiseFloor(around);
  return {
    hz: (best + delta) * s.dfHz,
    amplitude: Math.sqrt(power / s.enbwBins),
    floor,
    present: b > NOISE_FLOOR_RATIO * floor && b > 0,
  };
}

export function clamp01(x: number): number {
  return Math.max(0, Math.min(1, x));
}

export function fmt(x: number, digits = 3): string {
  return Number(x.toPrecision(digits)).toString();
}

export function orderLabel(k: number): string {
  return `${fmt(k, 3)}×`;
}

/** What every rule reads: the spectra as lines, the located 1× and the overall velocity. */
export interface DiagnosisContext {
  velocity: Lines;
  acceleration: Lines;
  /** The 1× peak of the velocity spectrum near the given speed, if any. */
  p1: Peak | null;
  /** 1× located in the velocity spectrum (or the given speed when no peak stands there), Hz. */
  f1: number;
  /** Line spacing of the velocity spectrum, Hz. */
  df: number;
  /** Overall velocity, mm/s RMS (the analysis' ISO band). */
  overall: number;
  /** A peak as evidence, its order taken against {@link f1}. */
  ev(s: EvidenceSpectrum, p: Peak, label: string): DiagnosisEvidence;
  /** The peak near `hz`, searched ±`tolFraction` of hz plus {@link LINE_TOLERANCE} lines. */
  at(s: Lines, hz: number, tolFraction?: number): Peak | null;
}

/** A peak's amplitude when it clears the noise floor, else 0. */
export function amp(p: Peak | null): number {
  return p?.present ? p.amplitude : 0;
}
