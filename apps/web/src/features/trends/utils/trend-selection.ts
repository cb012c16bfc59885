/**
 * What a point's trend shows, kept in the page address so a trend can be shared: the band
 * (`band`), the period (`period`) and the further series (`with`, repeated, each
 * `<pointId>:<bandKey>` — a band of this point or of another point of the machine).
 */

/** At most this many series beside the band (the palette has six colours). */
export const MAX_EXTRA_SERIES = 5;

export interface SeriesRef {
  pointId: number;
  band: string;
}

export const seriesKey = (s: SeriesRef) => `${s.pointId}:${s.band}`;

/** `12:overall-velocity` → { pointId: 12, band: 'overall-velocity' }; null when malformed. */
export function parseSeries(text: string): SeriesRef | null {
  const m = /^(\d{1,10}):([A-Za-z0-9._-]{1,64})$/.exec(text);
  if (!m) return null;
  const pointId = Number(m[1]);
  return pointId > 0 ? { pointId, band: m[2]! } : null;
}

/**
 * The further series named in `params` (malformed or repeated ones dropped, and the band
 * itself, capped at {@link MAX_EXTRA_SERIES}).
 */
export function extraSeriesOf(params: URLSearchParams, primary: SeriesRef): SeriesRef[] {
  const out: SeriesRef[] = [];
  const seen = new Set([seriesKey(primary)]);
  for (const text of params.getAll('with')) {
    const s = parseSeries(text);
    if (!s || seen.has(seriesKey(s))) continue;
    seen.add(seriesKey(s));
    out.push(s);
    if (out.length === MAX_EXTRA_SERIES) break;
  }
  return out;
}

/** `params` with the further series replaced by `list`. */
export function withExtraSeries(params: URLSearchParams, list: readonly SeriesRef[]) {
  const next = new URLSearchParams(params);
  next.delete('with');
  for (const s of list) next.append('with', seriesKey(s));
  return next;
}
