/**
 * `band_day_sums`: per point, band and local day of the point's site, the count and sums of
 * the usable band values (verdict not `unusable`) and of their capture times. Added to in
 * the analysis write transaction (`addBandDaySums`), rebuilt from `band_values` where the
 * local days changed meaning (`rebuildBandDaySums`: a site's time zone, points that moved
 * site) and once for a database that held band values before the table existed. The weekly
 * review reads its daily means from it (review-repository `dailyMeans`).
 */
import { inArray, sql, type SQL } from 'drizzle-orm';
import type { Db, Tx } from '@turnstone/db/client';
import { bandDaySums, points } from '@turnstone/db/schema';
import { offsetSegments } from '@turnstone/contracts/dates';

export interface BandDaySum {
  pointId: number;
  bandKey: string;
  /** Local day of the point's site, YYYY-MM-DD. */
  day: string;
  n: number;
  sumValue: number;
  sumTakenMs: number;
}

/** Adds a batch's sums, one statement (rows of one key summed first by the caller). */
export async function addBandDaySums(tx: Tx, rows: BandDaySum[]): Promise<void> {
  if (rows.length === 0) return;
  await tx
    .insert(bandDaySums)
    .values(rows)
    .onDuplicateKeyUpdate({
      set: {
        n: sql`${bandDaySums.n} + VALUES(${bandDaySums.n})`,
        sumValue: sql`${bandDaySums.sumValue} + VALUES(${bandDaySums.sumValue})`,
        sumTakenMs: sql`${bandDaySums.sumTakenMs} + VALUES(${bandDaySums.sumTakenMs})`,
      },
    });
}

/**
 * SQL for the local day (`YYYY-MM-DD`) of `takenAt` in `timeZone`, over [fromMs, toMs]: the
 * UTC time shifted by the zone's offset in force (a CASE over the clock changes), so the
 * database needs no time zone tables.
 */
export function localDayOfSql(timeZone: string, fromMs: number, toMs: number, takenAt: SQL): SQL {
  const segs = offsetSegments(timeZone, fromMs, toMs + 1);
  const offset =
    segs.length === 1
      ? sql`${segs[0]!.offset}`
      : sql`CASE ${sql.join(
          segs
            .slice(0, -1)
            .map((s) => sql`WHEN ${takenAt} < ${new Date(s.until)} THEN ${s.offset}`),
          sql` `,
        )} ELSE ${segs.at(-1)!.offset} END`;
  return sql`DATE(DATE_ADD(${takenAt}, INTERVAL ${offset} MINUTE))`;
}

/**
 * Recomputes the sums of these points (all in one site, of time zone `timeZone`) from their
 * band values: their rows are deleted and summed again in one INSERT … SELECT.
 */
export async function rebuildBandDaySums(
  db: Db | Tx,
  pointIds: number[],
  timeZone: string,
): Promise<void> {
  if (pointIds.length === 0) return;
  await db.delete(bandDaySums).where(inArray(bandDaySums.pointId, pointIds));
  const ids = sql.join(
    pointIds.map((id) => sql`${id}`),
    sql`, `,
  );
  const [span] = (await db.execute(
    sql`SELECT MIN(taken_at) AS lo, MAX(taken_at) AS hi FROM band_values WHERE point_id IN (${ids})`,
  )) as unknown as [{ lo: Date | string | null; hi: Date | string | null }[]];
  const lo = span[0]?.lo;
  const hi = span[0]?.hi;
  if (lo === null || lo === undefined || hi === null || hi === undefined) return;
  const ms = (v: Date | string) => (v instanceof Date ? v.getTime() : Date.parse(`${v}Z`));
  const day = localDayOfSql(timeZone, ms(lo), ms(hi), sql.raw('bv.taken_at'));
  await db.execute(sql`
    INSERT INTO band_day_sums (point_id, band_key, day, n, sum_value, sum_taken_ms)
    SELECT bv.point_id, bv.band_key, ${day}, COUNT(*), SUM(bv.value),
      SUM(TIMESTAMPDIFF(MICROSECOND, '1970-01-01 00:00:00', bv.taken_at) DIV 1000)
    FROM band_values bv
    WHERE bv.point_id IN (${ids}) AND bv.quality_verdict <> 'unusable'
    GROUP BY bv.point_id, bv.band_key, ${day}`);
}

/** The ids of a site's points. */
export async function pointsOfSite(db: Db | Tx, siteId: number): Promise<number[]> {
  const rows = await db
    .select({ id: points.id })
    .from(points)
    .where(inArray(points.siteId, [siteId]));
  return rows.map((r) => r.id);
}

/** The ids of a machine's points. */
export async function pointsOfMachine(db: Db | Tx, machineId: number): Promise<number[]> {
  const rows = await db
    .select({ id: points.id })
    .from(points)
    .where(inArray(points.machineId, [machineId]));
  return rows.map((r) => r.id);
}

/**
 * Sites whose points hold band values but no day sums: a database upgraded from before the
 * table (filled once at start), with each site's time zone.
 */
export async function sitesWithoutDaySums(db: Db): Promise<{ siteId: number; timeZone: string }[]> {
  const [rows] = (await db.execute(sql`
    SELECT s.id AS siteId, s.time_zone AS timeZone FROM sites s
    WHERE EXISTS (SELECT 1 FROM points p JOIN band_values bv ON bv.point_id = p.id
                  WHERE p.site_id = s.id)
      AND NOT EXISTS (SELECT 1 FROM points p JOIN band_day_sums d ON d.point_id = p.id
                      WHERE p.site_id = s.id)`)) as unknown as [
    { siteId: number; timeZone: string }[],
  ];
  return rows.map((r) => ({ siteId: Number(r.siteId), timeZone: String(r.timeZone) }));
}

/** Every site with its time zone. */
export async function sitesWithZones(db: Db): Promise<{ siteId: number; timeZone: string }[]> {
  const [rows] = (await db.execute(
    sql`SELECT id AS siteId, time_zone AS timeZone FROM sites`,
  )) as unknown as [{ siteId: number; timeZone: string }[]];
  return rows.map((r) => ({ siteId: Number(r.siteId), timeZone: String(r.timeZone) }));
}

/**
 * After the band values taken in [from, to) were dropped (from null: all before `to`): the
 * sums of these points (one site, zone `timeZone`) for the local days `first` … `last` that
 * met that span are deleted, and those of the two edge days summed again from the values
 * left around them. Idempotent: a pass that stopped half-way repeats it.
 */
export async function resumDaysOfDroppedSpan(
  db: Db,
  pointIds: number[],
  timeZone: string,
  span: { from: Date | null; to: Date; first: string | null; last: string },
): Promise<void> {
  if (pointIds.length === 0) return;
  const ids = sql.join(
    pointIds.map((id) => sql`${id}`),
    sql`, `,
  );
  const { from, to, first, last } = span;
  await db.execute(sql`
    DELETE FROM band_day_sums
     WHERE point_id IN (${ids}) AND day <= ${last} ${first ? sql`AND day >= ${first}` : sql``}`);
  // Local days are at most a day and a few hours off UTC: two days either side hold them.
  const lo = new Date((from ?? to).getTime() - 2 * 86_400_000);
  const hi = new Date(to.getTime() + 2 * 86_400_000);
  const day = localDayOfSql(timeZone, lo.getTime(), hi.getTime(), sql.raw('bv.taken_at'));
  const edges = first ? sql`${first}, ${last}` : sql`${last}`;
  await db.execute(sql`
    INSERT INTO band_day_sums (point_id, band_key, day, n, sum_value, sum_taken_ms)
    SELECT bv.point_id, bv.band_key, ${day} AS d, COUNT(*), SUM(bv.value),
      SUM(TIMESTAMPDIFF(MICROSECOND, '1970-01-01 00:00:00', bv.taken_at) DIV 1000)
    FROM band_values bv
    WHERE bv.point_id IN (${ids}) AND bv.quality_verdict <> 'unusable'
      AND bv.taken_at >= ${lo} AND bv.taken_at < ${hi} AND ${day} IN (${edges})
    GROUP BY bv.point_id, bv.band_key, d
    ON DUPLICATE KEY UPDATE n = VALUES(n), sum_value = VALUES(sum_value),
      sum_taken_ms = VALUES(sum_taken_ms)`);
}
