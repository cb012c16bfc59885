import { findPeaks } from './spectral-peaks.ts';
import type { WindowName } from './window-functions.ts';

/** Options for {@link estimateSpeed}. */
export interface SpeedEstimateOptions {
  /** Nominal speed from the machine record, r/min. Required. */
  nominalRpm: number;
  /** Search ±this fraction of the nominal speed (induction motors slip a few %). @default 0.1 */
  searchFraction?: number;
  /** Window the spectrum was computed with. @default 'hann' */
  window?: WindowName;
  /** Segment length the spectrum was computed with. @default 2 · (lines − 1) */
  nperseg?: number;
  /**
   * The peak must stand this many times (in amplitude) above the median line between
   * 0.5 × and 1.5 × nominal, or no speed is reported.
   * @default 3 (≈ 9.5 dB)
   */
  minProminence?: number;
}

/**
 * Running speed estimated from the 1× peak: the largest spectral peak within
 * ±searchFraction of the nominal shaft frequency, interpolated between lines. Returns
 * null when the window holds no peak standing clear of the lines around it. Pass the acceleration spectrum: integrating first
 * would tilt the lines and bias the interpolation.
 *
 * Source: common practice, no source (1× is the dominant line of most rotating machines).
 */
export function estimateSpeed(
  power: ArrayLike<number>,
  dfHz: number,
  options: SpeedEstimateOptions,
): { rpm: number; hz: number } | null {
  const nominal = options.nominalRpm;
  if (!(nominal > 0)) throw new RangeError(`nominalRpm must be positive, got ${nominal}`);
  const fraction = options.searchFraction ?? 0.1;
  if (options.minProminence !== undefined && !(options.minProminence >= 1)) {
    throw new RangeError(`minProminence must be ≥ 1, got ${options.minProminence}`);
  }
  if (!(fraction > 0 && fraction < 1))
    throw new RangeError(`searchFraction must be in (0, 1), got ${fraction}`);
  const hz = nominal / 60;
  const span = Math.max(fraction * hz, 1.5 * dfHz);
  const [peak] = findPeaks(power, dfHz, {
    count: 1,
    window: options.window ?? 'hann',
    ...(options.nperseg === undefined ? {} : { nperseg: options.nperseg }),
    minHz: Math.max(dfHz, hz - span),
    maxHz: hz + span,
  });
  if (!peak || !(peak.amplitude > 0)) return null;
  const lo = Math.max(1, Math.ceil((0.5 * hz) / dfHz));
  const hi = Math.min(power.length - 1, Math.floor((1.5 * hz) / dfHz));
  const around: number[] = [];
  for (let k = lo; k <= hi; k++) around.push(power[k]!);
  around.sort((a, b) => a - b);
  const median = around.length > 0 ? Math.sqrt(around[Math.floor(around.length / 2)]!) : 0;
  if (Math.sqrt(power[peak.bin]!) < (options.minProminence ?? 3) * median) return null;
  return { rpm: peak.hz * 60, hz: peak.hz };
}
