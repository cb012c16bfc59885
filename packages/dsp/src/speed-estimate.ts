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
}

/**
 * Running speed estimated from the 1× peak: the largest spectral peak within
 * ±searchFraction of the nominal shaft frequency, interpolated between lines. Returns
 * null when the window holds no peak. Pass the acceleration spectrum: integrating first
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
  return { rpm: peak.hz * 60, hz: peak.hz };
}
