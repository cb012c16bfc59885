import { ISO_BAND_HZ, ISO_BAND_SPLIT_RPM, isoBandForSpeed } from '@turnstone/dsp/iso-overall-band';

/** Frequency span over which ISO 20816-3 overall velocity is measured. */
export interface IsoBand {
  /** Lower edge, Hz. */
  readonly fromHz: number;
  /** Upper edge, Hz. */
  readonly toHz: number;
}

/** Lowest speed ISO 20816-3 covers, r/min. Source: ISO 20816-3:2022 abstract (confirmed). */
export const ISO_20816_3_MIN_RPM = 120;
/** Highest speed ISO 20816-3 covers, r/min. Source: ISO 20816-3:2022 abstract (confirmed). */
export const ISO_20816_3_MAX_RPM = 30_000;
/**
 * Speed above which the 10–1000 Hz band applies (at or below it, 2–1000 Hz): the rule
 * `@turnstone/dsp` analyses with, read from there so the two cannot disagree.
 * Source: ISO 20816-3 (from memory).
 */
export const ISO_20816_3_BAND_SPLIT_RPM = ISO_BAND_SPLIT_RPM;

const span = ([fromHz, toHz]: readonly [number, number]): IsoBand => ({ fromHz, toHz });
/** 10–1000 Hz, for machines above 600 r/min. Source: ISO 20816-3 (from memory). */
export const ISO_BAND_ABOVE_600_RPM: IsoBand = span(ISO_BAND_HZ.above600);
/** 2–1000 Hz, for machines from 120 to 600 r/min. Source: ISO 20816-3 (from memory). */
export const ISO_BAND_120_TO_600_RPM: IsoBand = span(ISO_BAND_HZ.below600);

/**
 * Which ISO 20816-3 measurement band applies at a running speed: 10–1000 Hz above 600 r/min,
 * 2–1000 Hz from 120 to 600 r/min inclusive (exactly 600 r/min takes 2–1000 Hz, since
 * "above 600" excludes it). Returns `null` outside the standard's scope (below 120 or above
 * 30 000 r/min), where the caller must choose a band itself.
 *
 * Source: ISO 20816-3 (band edges from memory; speed scope confirmed from the 2022 abstract).
 */
export function isoBand(rpm: number): IsoBand | null {
  if (!Number.isFinite(rpm)) throw new RangeError(`speed must be finite, got ${rpm}`);
  if (rpm < ISO_20816_3_MIN_RPM || rpm > ISO_20816_3_MAX_RPM) return null;
  return isoBandForSpeed(rpm) === 'above600' ? ISO_BAND_ABOVE_600_RPM : ISO_BAND_120_TO_600_RPM;
}
