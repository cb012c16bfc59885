/**
 * The reads of a long trend (trend-values.ts): a band's hour summaries (`band_value_hours`,
 * kept by analysis/band-hours-repository.ts), its raw values between two instants, and the
 * single values a thinned trend always keeps (the period's first and last, the latest at or
 * before each alert transition). Raw values come in (taken_at, analysis_id) order, the order
 * the hour summaries break ties in.
 */
import { sql } from 'drizzle-orm';
import type { Db } from '@turnstone/db/client';

export type Quality = 'ok' | 'suspect' | 'unusable';
export interface TrendRow {
  t: number;
  value: number;
  quality: Quality;
  analysisId: number;
}
export interface HourRow {
  n: number;
  lo: TrendRow;
  hi: TrendRow;
}

const ms = (column: string) => sql.raw(`CAST(UNIX_TIMESTAMP(${column}) * 1000 AS SIGNED)`);
const row = (r: { t: unknown; value: unknown; quality: Quality; analysisId: unknown }) => ({
  t: Number(r.t),
  value: Number(r.value),
  quality: r.quality,
  analysisId: Number(r.analysisId),
});

/**
 * The band's values in [from, to) — or [from, to] with `toInclusive` — oldest first: a range
 * scan of band_values_trend_idx (point_id, band_key, taken_at). Raw SQL with the time as
 * epoch milliseconds: building a Date per row through the ORM cost more than the query.
 */
export async function rawValues(
  db: Db,
  pointId: number,
  bandKey: string,
  from: Date,
  to: Date,
  toInclusive = false,
): Promise<TrendRow[]> {
  const end = toInclusive ? sql`taken_at <= ${to}` : sql`taken_at < ${to}`;
  const [rows] = (await db.execute(sql`
    SELECT ${ms('taken_at')} AS t, value, quality_verdict AS quality, analysis_id AS analysisId
    FROM band_values FORCE INDEX (band_values_trend_idx)
    WHERE point_id = ${pointId} AND band_key = ${bandKey} AND taken_at >= ${from} AND ${end}
    ORDER BY taken_at, analysis_id`)) as unknown as [Parameters<typeof row>[0][]];
  return rows.map(row);
}

/**
 * The band's values in [from, to] as the projection needs them (time, value, quality), oldest
 * first: read from band_values_trend_idx alone (it holds all three, migration 0022), not
 * row by row.
 */
export async function projectionValues(
  db: Db,
  pointId: number,
  bandKey: string,
  from: Date,
  to: Date,
): Promise<Omit<TrendRow, 'analysisId'>[]> {
  const [rows] = (await db.execute(sql`
    SELECT ${ms('taken_at')} AS t, value, quality_verdict AS quality
    FROM band_values FORCE INDEX (band_values_trend_idx)
    WHERE point_id = ${pointId} AND band_key = ${bandKey}
      AND taken_at >= ${from} AND taken_at <= ${to}
    ORDER BY taken_at`)) as unknown as [{ t: unknown; value: unknown; quality: Quality }[]];
  return rows.map((r) => ({ t: Number(r.t), value: Number(r.value), quality: r.quality }));
}

/**
 * The band's hour summaries of the hours starting in [from, to), merged per bucket of
 * `bucketMs` from `origin` (whole hours, from a UTC hour): each bucket's count, and its
 * lowest and highest value — the first in (time, analysis id) order among equals, as the
 * hours hold them — oldest first. Merged in the database, so a year answers ~300 rows, not
 * 8,760.
 */
export async function bucketsOfHours(
  db: Db,
  pointId: number,
  bandKey: string,
  from: Date,
  to: Date,
  origin: number,
  bucketMs: number,
): Promise<HourRow[]> {
  const bucket = sql`(UNIX_TIMESTAMP(hour_at) * 1000 - ${origin}) DIV ${bucketMs}`;
  // the lowest (highest) value's capture: time, analysis id and quality of the first hour in
  // (value, time, analysis id) order — one GROUP BY pass (MariaDB: GROUP_CONCAT … LIMIT)
  const capture = (side: 'min' | 'max', order: string) =>
    sql.raw(
      `GROUP_CONCAT(CAST(UNIX_TIMESTAMP(${side}_at) * 1000 AS SIGNED), ' ', ${side}_analysis_id, ` +
        `' ', ${side}_quality ORDER BY ${order} SEPARATOR '' LIMIT 1)`,
    );
  const [rows] = (await db.execute(sql`
    SELECT SUM(n) AS n, MIN(min_value) AS loV,
      ${capture('min', 'min_value, min_at, min_analysis_id')} AS lo,
      MAX(max_value) AS hiV,
      ${capture('max', 'max_value DESC, max_at, max_analysis_id')} AS hi
    FROM band_value_hours
    WHERE point_id = ${pointId} AND band_key = ${bandKey} AND hour_at >= ${from}
      AND hour_at < ${to}
    GROUP BY ${bucket}
    ORDER BY MIN(hour_at)`)) as unknown as [
    { n: unknown; loV: unknown; lo: string; hiV: unknown; hi: string }[],
  ];
  const side = (value: unknown, packed: string): TrendRow => {
    const [t, analysisId, quality] = packed.split(' ');
    return row({ t, value, quality: quality as Quality, analysisId });
  };
  return rows.map((r) => ({ n: Number(r.n), lo: side(r.loV, r.lo), hi: side(r.hiV, r.hi) }));
}

/**
 * For each instant of `ats`, the band's latest value taken in [from, min(at, to)] (the last in
 * (taken_at, analysis_id) order), or null; and the first value taken in [from, to] as
 * `first`. One statement: each lookup is a descent of band_values_trend_idx to the latest
 * time, then the rows of that time.
 */
export async function valuesAt(
  db: Db,
  pointId: number,
  bandKey: string,
  from: Date,
  to: Date,
  ats: readonly Date[],
): Promise<{ first: TrendRow | null; at: (TrendRow | null)[] }> {
  const band = sql`point_id = ${pointId} AND band_key = ${bandKey}`;
  const cols = sql`${ms('taken_at')} AS t, value, quality_verdict AS quality, analysis_id AS analysisId`;
  const firstOf = sql`(SELECT ${-1} AS k, ${cols} FROM band_values
      WHERE ${band} AND taken_at = (SELECT MIN(taken_at) FROM band_values
        WHERE ${band} AND taken_at >= ${from} AND taken_at <= ${to})
      ORDER BY analysis_id LIMIT 1)`;
  const parts = [firstOf];
  ats.forEach((at, k) =>
    parts.push(sql`(SELECT ${k} AS k, ${cols} FROM band_values
      WHERE ${band} AND taken_at = (SELECT MAX(taken_at) FROM band_values
        WHERE ${band} AND taken_at >= ${from} AND taken_at <= ${at < to ? at : to})
      ORDER BY analysis_id DESC LIMIT 1)`),
  );
  const out: { first: TrendRow | null; at: (TrendRow | null)[] } = {
    first: null,
    at: ats.map(() => null),
  };
  // a statement of at most ~200 lookups
  for (let i = 0; i < parts.length; i += 200) {
    const [rows] = (await db.execute(
      sql.join(parts.slice(i, i + 200), sql` UNION ALL `),
    )) as unknown as [(Parameters<typeof row>[0] & { k: unknown })[]];
    for (const r of rows) {
      const k = Number(r.k);
      if (k < 0) out.first = row(r);
      else out.at[k] = row(r);
    }
  }
  return out;
}
