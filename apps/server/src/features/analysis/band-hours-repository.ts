/**
 * `band_value_hours`: each point's band values by UTC hour — count, sum, and the hour's lowest
 * and highest value with the capture each came from. The long trend reads them
 * (points/trend-hours.ts). They are recomputed, never added to: whoever writes or deletes
 * band values calls `refreshBandHours` for the hours it touched, in its own transaction, so
 * a replaced value or a deleted capture can never leave a stale minimum or maximum behind.
 *
 * One statement computes an hour from its raw rows (`HOUR_SUMMARY`): the lowest value is the
 * first in (taken_at, analysis_id) order among those equal to the minimum, the highest the
 * first among those equal to the maximum — the same rule the trend's raw-row decimation
 * follows (condition/trend-decimation.ts), so both give the same answer.
 */
import { sql, type SQL } from 'drizzle-orm';
import type { Db, Tx } from '@turnstone/db/client';

export const HOUR_MS = 3_600_000;

/** The UTC hour holding `at`, as its start. */
export function hourOf(at: Date | number): Date {
  const ms = typeof at === 'number' ? at : at.getTime();
  return new Date(Math.floor(ms / HOUR_MS) * HOUR_MS);
}

/** The hours of the band values that `where` selects (a condition on `band_values`), again. */
function hourSummary(where: SQL): SQL {
  const hour = sql`DATE_FORMAT(taken_at, '%Y-%m-%d %H:00:00')`;
  return sql`
    INSERT INTO band_value_hours (point_id, band_key, hour_at, n, sum_value,
      min_value, min_at, min_analysis_id, min_quality,
      max_value, max_at, max_analysis_id, max_quality)
    SELECT point_id, band_key, h, COUNT(*), SUM(value),
      MAX(IF(lo = 1, value, NULL)), MAX(IF(lo = 1, taken_at, NULL)),
      MAX(IF(lo = 1, analysis_id, NULL)), MAX(IF(lo = 1, quality_verdict, NULL)),
      MAX(IF(hi = 1, value, NULL)), MAX(IF(hi = 1, taken_at, NULL)),
      MAX(IF(hi = 1, analysis_id, NULL)), MAX(IF(hi = 1, quality_verdict, NULL))
    FROM (
      SELECT point_id, band_key, taken_at, value, analysis_id, quality_verdict, ${hour} AS h,
        ROW_NUMBER() OVER (PARTITION BY point_id, band_key, ${hour}
                           ORDER BY value, taken_at, analysis_id) AS lo,
        ROW_NUMBER() OVER (PARTITION BY point_id, band_key, ${hour}
                           ORDER BY value DESC, taken_at, analysis_id) AS hi
      FROM band_values WHERE ${where}
    ) x
    GROUP BY point_id, band_key, h`;
}

/**
 * Recomputes the hours (`hourAt`: an hour's start, UTC) of these points from their band
 * values, every band: the hour rows are deleted and built again from `band_values`. Call it
 * in the transaction that wrote, replaced or deleted the values, after the change. Callers
 * that may run at once for one point must hold that point's lock (the analysis batch holds
 * its points' condition states FOR UPDATE).
 */
export async function refreshBandHours(
  tx: Db | Tx,
  touched: readonly { pointId: number; hourAt: Date }[],
): Promise<void> {
  const byPoint = new Map<number, Map<number, Date>>();
  for (const t of touched) {
    const h = hourOf(t.hourAt);
    let hours = byPoint.get(t.pointId);
    if (!hours) byPoint.set(t.pointId, (hours = new Map()));
    hours.set(h.getTime(), h);
  }
  if (byPoint.size === 0) return;
  const keys = [...byPoint].map(([pointId, hours]) => ({ pointId, hours: [...hours.values()] }));
  const hoursOf = sql.join(
    keys.map(
      (k) =>
        sql`(point_id = ${k.pointId} AND hour_at IN (${sql.join(
          k.hours.map((h) => sql`${h}`),
          sql`, `,
        )}))`,
    ),
    sql` OR `,
  );
  const valuesOf = sql.join(
    keys.flatMap((k) =>
      k.hours.map(
        (h) =>
          sql`(point_id = ${k.pointId} AND taken_at >= ${h} AND taken_at < ${new Date(h.getTime() + HOUR_MS)})`,
      ),
    ),
    sql` OR `,
  );
  await tx.execute(sql`DELETE FROM band_value_hours WHERE ${hoursOf}`);
  await tx.execute(hourSummary(valuesOf));
}

/**
 * Recomputes every hour of one point (a database that had band values before the table): a
 * statement a month (one partition of band_values each, and a sort that stays small).
 */
export async function rebuildPointHours(tx: Db | Tx, pointId: number): Promise<void> {
  await tx.execute(sql`DELETE FROM band_value_hours WHERE point_id = ${pointId}`);
  const [span] = (await tx.execute(
    sql`SELECT MIN(taken_at) AS lo, MAX(taken_at) AS hi FROM band_values WHERE point_id = ${pointId}`,
  )) as unknown as [{ lo: Date | string | null; hi: Date | string | null }[]];
  const date = (v: Date | string | null | undefined) =>
    v === null || v === undefined
      ? null
      : v instanceof Date
        ? v
        : new Date(`${v.replace(' ', 'T')}Z`);
  const lo = date(span[0]?.lo);
  const hi = date(span[0]?.hi);
  if (!lo || !hi) return;
  for (
    let m = new Date(Date.UTC(lo.getUTCFullYear(), lo.getUTCMonth(), 1));
    m <= hi;
    m = new Date(Date.UTC(m.getUTCFullYear(), m.getUTCMonth() + 1, 1))
  ) {
    const next = new Date(Date.UTC(m.getUTCFullYear(), m.getUTCMonth() + 1, 1));
    await tx.execute(
      hourSummary(sql`point_id = ${pointId} AND taken_at >= ${m} AND taken_at < ${next}`),
    );
  }
}

/** Locks a point's condition state, as an analysis batch does, so no batch writes meanwhile. */
export async function lockPointState(tx: Tx, pointId: number): Promise<void> {
  await tx.execute(sql`SELECT point_id FROM point_states WHERE point_id = ${pointId} FOR UPDATE`);
}

/** Points holding band values but no hours: a database upgraded from before the table. */
export async function pointsWithoutHours(db: Db): Promise<number[]> {
  const [rows] = (await db.execute(sql`
    SELECT p.id FROM points p
    WHERE EXISTS (SELECT 1 FROM band_values bv WHERE bv.point_id = p.id)
      AND NOT EXISTS (SELECT 1 FROM band_value_hours h WHERE h.point_id = p.id)
    ORDER BY p.id`)) as unknown as [{ id: number }[]];
  return rows.map((r) => Number(r.id));
}

/**
 * Deletes the hours of [from, to) (UTC month bounds: a month's hours lie wholly in it), for
 * a dropped month partition; `from` null: everything before `to`. By (point, band) ranges of
 * the primary key, a few hundred at a time, so nothing scans the whole table.
 */
export async function deleteHoursBetween(db: Db | Tx, from: Date | null, to: Date): Promise<void> {
  const [pairs] = (await db.execute(
    sql`SELECT point_id AS pointId, band_key AS bandKey FROM band_value_hours
         GROUP BY point_id, band_key`,
  )) as unknown as [{ pointId: number; bandKey: string }[]];
  const span = from ? sql`hour_at >= ${from} AND hour_at < ${to}` : sql`hour_at < ${to}`;
  for (let i = 0; i < pairs.length; i += 200) {
    const which = sql.join(
      pairs
        .slice(i, i + 200)
        .map((p) => sql`(point_id = ${p.pointId} AND band_key = ${p.bandKey} AND ${span})`),
      sql` OR `,
    );
    await db.execute(sql`DELETE FROM band_value_hours WHERE ${which}`);
  }
}
