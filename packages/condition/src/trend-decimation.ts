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
 * Buckets for a decimated trend: ≤ 600 values answered (two a bucket), a bucket of about 29
 * hours over a year. At ~85 bytes of JSON a value that keeps a one-year answer under 60 kB,
 * and 600 values still resolve to a few pixels each on a full-width chart.
 */
export const TREND_MAX_BUCKETS = 300;

export interface Decimation {
  /** Values in the period before thinning. */
  total: number;
  /** Width of one bucket (ms). */
  bucketMs: number;
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
  const from = Math.min(opts.from, items[0]!.t);
  const to = Math.max(opts.to, items[items.length - 1]!.t);
  const bucketMs = Math.max(1, Math.ceil((to - from + 1) / buckets));
  const kept = new Uint8Array(items.length);
  kept[0] = 1;
  kept[items.length - 1] = 1;
  for (const i of opts.keep ?? []) if (i >= 0 && i < items.length) kept[i] = 1;
  let start = 0;
  while (start < items.length) {
    const b = Math.floor((items[start]!.t - from) / bucketMs);
    let lo = start;
    let hi = start;
    let end = start + 1;
    while (end < items.length && Math.floor((items[end]!.t - from) / bucketMs) === b) {
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
