/**
 * A band's values over a period as the trend answers them: every value of a short period,
 * and for a long one each bucket's lowest and highest value (condition/trend-decimation.ts)
 * with the period's first and last and the value behind each alert transition and upload;
 * plus the recent values the projection fits (those within PROJECTION_WINDOW_DAYS of the
 * latest).
 *
 * Buckets narrower than an hour are thinned from the raw values. Buckets of an hour or more
 * are whole UTC hours, thinned from the stored hour summaries (`band_value_hours`) for the
 * period's whole hours and from raw values for its partial first and last hour — the same
 * values as thinning every raw value, read from 1/6 of the rows at a 10-minute cadence
 * (tests/api/trend-hours.test.ts holds the two paths equal). The projection still reads its
 * window's raw values.
 */
import { PROJECTION_WINDOW_DAYS } from '@turnstone/condition';
import {
  decimateSpans,
  decimateTrend,
  HOUR_MS,
  TREND_MAX_BUCKETS,
  trendBuckets,
  type Decimation,
} from '@turnstone/condition/trend-decimation';
import type { Db } from '@turnstone/db/client';

import {
  bucketsOfHours,
  projectionValues,
  rawValues,
  valuesAt as valuesAtOf,
  type TrendRow,
} from './trend-hours-repository.ts';

const WINDOW_MS = PROJECTION_WINDOW_DAYS * 86_400_000;

export interface TrendValues {
  items: TrendRow[];
  decimation: Decimation | null;
  /**
   * The values within the projection window of the latest, newest first (values of one
   * instant by value, highest first).
   */
  recent: Omit<TrendRow, 'analysisId'>[];
}

/**
 * Indices of the values behind alert transitions: the latest value taken at or before each
 * event (rows oldest first), so thinning a long trend never hides why an alert changed.
 */
function indicesAt(rows: readonly TrendRow[], marks: readonly Date[]): Set<number> {
  const keep = new Set<number>();
  for (const m of marks) {
    const at = m.getTime();
    let lo = 0;
    let hi = rows.length - 1;
    let found = -1;
    while (lo <= hi) {
      const mid = (lo + hi) >> 1;
      if (rows[mid]!.t <= at) {
        found = mid;
        lo = mid + 1;
      } else hi = mid - 1;
    }
    if (found >= 0) keep.add(found);
  }
  return keep;
}

/** The recent values of rows oldest first: within the window of the latest, newest first. */
function recentOf(rows: readonly Omit<TrendRow, 'analysisId'>[]): TrendValues['recent'] {
  const out: TrendValues['recent'] = [];
  const latestAt = rows.length ? rows[rows.length - 1]!.t : 0;
  for (let i = rows.length - 1; i >= 0; i--) {
    const { t, value, quality } = rows[i]!;
    if (latestAt - t > WINDOW_MS) break;
    out.push({ t, value, quality });
  }
  // one order for values of one instant, whichever index they were read by
  return out.sort((a, b) => b.t - a.t || b.value - a.value);
}

const asItem = (r: TrendRow) => ({ ...r, v: r.value, id: r.analysisId });
const asRow = ({ t, value, quality, analysisId }: TrendRow): TrendRow => ({
  t,
  value,
  quality,
  analysisId,
});

/** Every raw value of the period, thinned (today's path; and the reference for the other). */
export async function trendValuesFromRaw(
  db: Db,
  pointId: number,
  bandKey: string,
  from: Date,
  to: Date,
  marks: Promise<readonly Date[]> | readonly Date[],
): Promise<TrendValues> {
  const [rows, at] = await Promise.all([rawValues(db, pointId, bandKey, from, to, true), marks]);
  const thinned = decimateTrend(rows.map(asItem), {
    from: from.getTime(),
    to: to.getTime(),
    keep: indicesAt(rows, at),
  });
  return {
    items: thinned.items.map(asRow),
    decimation: thinned.decimation,
    recent: recentOf(rows),
  };
}

/**
 * The trend's values: from the hour summaries when the buckets are an hour or wider, else
 * from the raw values. `marks`: the alert transitions and uploads whose values are kept (a
 * promise, so the reads that do not need them start at once).
 */
export async function trendValues(
  db: Db,
  pointId: number,
  bandKey: string,
  from: Date,
  to: Date,
  marks: Promise<readonly Date[]> | readonly Date[],
): Promise<TrendValues> {
  const f = from.getTime();
  const t = to.getTime();
  const buckets = trendBuckets(f, t);
  if (buckets.bucketMs < HOUR_MS) return trendValuesFromRaw(db, pointId, bandKey, from, to, marks);
  // whole hours [hStart, hEnd); the partial hours at either end come raw
  const hStart = new Date(Math.ceil(f / HOUR_MS) * HOUR_MS);
  const hEnd = new Date(Math.floor((t + 1) / HOUR_MS) * HOUR_MS);
  const foundP = Promise.resolve(marks).then((at) =>
    valuesAtOf(db, pointId, bandKey, from, to, [to, ...at]),
  );
  // the projection's window: the values within its span of the latest (found by its own
  // seek, so the window's read does not wait for the marks)
  const windowP = valuesAtOf(db, pointId, bandKey, from, to, [to]).then(({ at: [last] }) =>
    last
      ? projectionValues(db, pointId, bandKey, new Date(Math.max(f, last.t - WINDOW_MS)), to)
      : [],
  );
  const [head, hours, tail, window, found] = await Promise.all([
    rawValues(db, pointId, bandKey, from, hStart),
    bucketsOfHours(db, pointId, bandKey, hStart, hEnd, buckets.origin, buckets.bucketMs),
    rawValues(db, pointId, bandKey, hEnd, to, true),
    windowP,
    foundP,
  ]);
  const total = head.length + tail.length + hours.reduce((a, h) => a + h.n, 0);
  const last = found.at[0];
  if (total <= 2 * TREND_MAX_BUCKETS || !found.first || !last)
    return trendValuesFromRaw(db, pointId, bandKey, from, to, marks);
  const one = (r: TrendRow) => ({ n: 1, lo: asItem(r), hi: asItem(r) });
  const thinned = decimateSpans(
    [
      ...head.map(one),
      ...hours.map((h) => ({ n: h.n, lo: asItem(h.lo), hi: asItem(h.hi) })),
      ...tail.map(one),
    ],
    {
      from: f,
      to: t,
      first: asItem(found.first),
      last: asItem(last),
      keep: found.at.slice(1).flatMap((r) => (r ? [asItem(r)] : [])),
    },
  );
  const recent = recentOf(window);
  return { items: thinned.items.map(asRow), decimation: thinned.decimation, recent };
}
