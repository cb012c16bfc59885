/**
 * The one home of the band an overall value covers: read from a stored analysis summary
 * (`isoBandHz`, `accelBandHz`) and written as text, for the API, the CSV exports and every
 * screen that shows an overall value.
 */

/** Lower and upper edge of an overall value's band, Hz. */
export type BandHz = readonly [number, number];

/** A stored `[from, to]` Hz pair, or null when the analysis did not record it (older ones). */
export function bandHzOf(v: unknown): [number, number] | null {
  return Array.isArray(v) &&
    v.length === 2 &&
    v.every((x) => typeof x === 'number' && Number.isFinite(x))
    ? [v[0] as number, v[1] as number]
    : null;
}

/** "10–1000 Hz" for an overall value's band; "band not recorded" for older analyses. */
export function formatBandHz(band: BandHz | null | undefined): string {
  if (!band) return 'band not recorded';
  const hz = (v: number) => String(Number(v.toPrecision(5)));
  return `${hz(band[0])}–${hz(band[1])} Hz`;
}
