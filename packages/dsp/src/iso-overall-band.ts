/**
 * The ISO 20816-3 overall-velocity band and the speed rule that picks it — the one place
 * both `@turnstone/dsp` (the analysis) and `@turnstone/condition` (zones, templates) read.
 */

/** ISO 20816 overall-velocity band: 10–1000 Hz above 600 r/min, 2–1000 Hz at or below 600 r/min. */
export type IsoBand = 'above600' | 'below600';

/** Edges in Hz of each ISO 20816 overall band. Source: ISO 20816-1 / ISO 20816-3 (from memory). */
export const ISO_BAND_HZ: Record<IsoBand, readonly [number, number]> = {
  above600: [10, 1000],
  below600: [2, 1000],
};

/**
 * Speed that splits the two bands, r/min: above it 10–1000 Hz, at or below it 2–1000 Hz
 * (the standard gives 2–1000 Hz for 120–600 r/min, so exactly 600 r/min is the slow band).
 * Source: ISO 20816-3 (from memory).
 */
export const ISO_BAND_SPLIT_RPM = 600;

/**
 * Which ISO overall band applies at a running speed: `'above600'` (10–1000 Hz) when the
 * speed is above {@link ISO_BAND_SPLIT_RPM}, `'below600'` (2–1000 Hz) at or below it.
 * Without a speed, `'above600'`. Source: ISO 20816-3 (from memory).
 */
export function isoBandForSpeed(rpm: number | null | undefined): IsoBand {
  if (rpm === null || rpm === undefined) return 'above600';
  if (!Number.isFinite(rpm) || rpm < 0) {
    throw new RangeError(`speed must be a finite, non-negative r/min, got ${rpm}`);
  }
  return rpm > ISO_BAND_SPLIT_RPM ? 'above600' : 'below600';
}
