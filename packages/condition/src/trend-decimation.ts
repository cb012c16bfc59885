/**
 * Thins a long trend to what a chart can draw without losing what an analyst looks for. The
 * period is cut into equal time buckets; each bucket keeps its lowest and its highest value
 * (in time order), so every peak and every trough is still drawn at its own time and height,
 * and a line through the kept values covers the same band of pixels as one through all of
 * them. This is the min/max idea of M4 (Jugel, Jerzak, Hackenbroich and Markl, "M4: a
 * visualization-oriented time series data aggregation", PVLDB 7(10), 2014), which also keeps
 * each bucket's first and last value; with markers drawn per value rather than a pixel-exact
 * line, min and max are what matters and halve the answer.
 *
 * Also always kept: the first and the last value of the period (the latest value is what the
 * page quotes) and any value named in `keep` (the captures behind alert transitions).
 */

/**
 * Buckets for a decimated trend: ≤ 600 values answered (two a bucket), a bucket of 30 hours
 * over a year. At ~85 bytes of JSON a value that keeps a one-year answer under 60 kB,
 * and 600 values still resolve to a few pixels each on a full-width chart.
 */
export const TREND_MAX_BUCKETS = 300;

export interface Decimation {
  /** Values in the period before thinning. */
  total: number;
  /** Width of one bucket (ms). */
  bucketMs: number;
}

/** An hour (ms). Buckets an hour or wider are whole UTC hours, aligned to UTC hours. */
export const HOUR_MS = 3_600_000;

/**
 * The buckets of a period [from, to]: `bucketMs` wide from `origin`. Narrower than an hour
 * they start at `from`; an hour or wider they are a whole number of hours starting on a UTC
 * hour (at most one bucket more than `maxBuckets`), so each is a union of whole UTC hours and
 * can be thinned from per-hour summaries (`decimateSpans`) to the same values as from the
 * raw values. Hours are UTC whatever the site's time zone: a clock change moves no bucket.
 */
export function trendBuckets(
  from: number,
  to: number,
  maxBuckets = TREND_MAX_BUCKETS,
): { origin: number; bucketMs: number } {
  const bucketMs = Math.max(1, Math.ceil((to - from + 1) / maxBuckets));
  if (bucketMs < HOUR_MS) return { origin: from, bucketMs };
  return {
    origin: Math.floor(from / HOUR_MS) * HOUR_MS,
    bucketMs: Math.ceil(bucketMs / HOUR_MS) * HOUR_MS,
  };
}

export function decimateTrend<T extends { t: number; v: number }>(
  items: readonly T[],
  opts: {
    from: number;
    to: number;
    maxBuckets?: number;
    /** Values to keep whatever their bucket (by index into `items`). */
    keep?: ReadonlySet<number>;
  },
): { items: T[]; decimation: Decimation | null } {
  const buckets = opts.maxBuckets ?? TREND_MAX_BUCKETS;
  // Short enough to answer as it is.
  if (items.length <= 2 * buckets) return { items: [...items], decimation: null };
  const { origin, bucketMs } = trendBuckets(
    Math.min(opts.from, items[0]!.t),
    Math.max(opts.to, items[items.length - 1]!.t),
    buckets,
  );
  const kept = new Uint8Array(items.length);
  kept[0] = 1;
  kept[items.length - 1] = 1;
  for (const i of opts.keep ?? []) if (i >= 0 && i < items.length) kept[i] = 1;
  let start = 0;
  while (start < items.length) {
    const b = Math.floor((items[start]!.t - origin) / bucketMs);
    let lo = start;
    let hi = start;
    let end = start + 1;
    while (end < items.length && Math.floor((items[end]!.t - origin) / bucketMs) === b) {
      if (items[end]!.v < items[lo]!.v) lo = end;
      if (items[end]!.v > items[hi]!.v) hi = end;
      end++;
    }
    kept[lo] = 1;
    kept[hi] = 1;
    start = end;
  }
  const out: T[] = [];
  for (let i = 0; i < items.length; i++) if (kept[i]) out.push(items[i]!);
  return { items: out, decimation: { total: items.length, bucketMs } };
}

/**
 * A stretch of a trend inside one bucket, summarised: how many values, and its lowest and
 * highest (each the first in time order among equals). A raw value is a span of one.
 */
export interface TrendSpan<T> {
  n: number;
  lo: T;
  hi: T;
}

/**
 * `decimateTrend`'s answer from summaries instead of every value: `spans` oldest first, none
 * crossing a bucket of `trendBuckets(from, to)` (UTC hours when buckets are an hour or wider,
 * raw values elsewhere), with the period's first and last value and the values to keep
 * looked up by the caller. Values are told apart and ordered by (t, `id`): the order the raw
 * values come in. Gives the same items as `decimateTrend` over the values the spans sum up
 * (tests/api/trend-hours.test.ts checks it against the raw path); the caller answers short
 * periods (total ≤ 2 × maxBuckets) from the raw values.
 */
export function decimateSpans<T extends { t: number; v: number; id: number }>(
  spans: readonly TrendSpan<T>[],
  opts: {
    from: number;
    to: number;
    maxBuckets?: number;
    first: T;
    last: T;
    keep?: readonly T[];
  },
): { items: T[]; decimation: Decimation } {
  const { origin, bucketMs } = trendBuckets(
    Math.min(opts.from, opts.first.t),
    Math.max(opts.to, opts.last.t),
    opts.maxBuckets ?? TREND_MAX_BUCKETS,
  );
  const kept = new Map<string, T>();
  const add = (x: T) => kept.set(`${x.t}|${x.id}`, x);
  add(opts.first);
  add(opts.last);
  for (const x of opts.keep ?? []) add(x);
  let total = 0;
  let i = 0;
  while (i < spans.length) {
    const b = Math.floor((spans[i]!.lo.t - origin) / bucketMs);
    let lo = spans[i]!.lo;
    let hi = spans[i]!.hi;
    total += spans[i]!.n;
    i++;
    while (i < spans.length && Math.floor((spans[i]!.lo.t - origin) / bucketMs) === b) {
      const s = spans[i]!;
      if (s.lo.v < lo.v) lo = s.lo;
      if (s.hi.v > hi.v) hi = s.hi;
      total += s.n;
      i++;
    }
    add(lo);
    add(hi);
  }
  const items = [...kept.values()].sort((a, b) => a.t - b.t || a.id - b.id);
  return { items, decimation: { total, bucketMs } };
}
