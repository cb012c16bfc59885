/**
 * Queries of the weekly review. Every query is limited to the sites in scope through the
 * point → machine → area join, so a user never reads another site's rows. Aggregation
 * (weekly and daily means) happens in MariaDB, so the answer stays small for a large fleet.
 */
import { and, asc, eq, gte, inArray, isNull, lt } from 'drizzle-orm';
import type { Pool } from 'mysql2/promise';
import type { Db } from '@turnstone/db/client';
import {
  alerts,
  bands,
  limitSets,
  machines,
  points,
  pointStates,
  qualityNotices,
  sites,
} from '@turnstone/db/schema';
import type { PointRef } from '@turnstone/contracts/review';
import type { SiteWeek } from './review-weeks.ts';
import { inSites, withPlace, withPlaceAndSite } from '../places/places-repository.ts';

export type { PointRef };

export type Criticality = 'low' | 'medium' | 'high';

export async function sitesIn(db: Db, siteIds: number[]) {
  if (siteIds.length === 0) return [];
  return db
    .select({ id: sites.id, code: sites.code, name: sites.name, timeZone: sites.timeZone })
    .from(sites)
    .where(inArray(sites.id, siteIds))
    .orderBy(asc(sites.code));
}

/** Every point of the sites, with the names a row of the review shows. */
export async function pointRefs(
  db: Db,
  siteIds: number[],
): Promise<Map<number, PointRef & { criticality: Criticality }>> {
  if (siteIds.length === 0) return new Map();
  const query = db
    .select({
      pointId: points.id,
      pointTag: points.tag,
      pointName: points.name,
      machineId: machines.id,
      machineName: machines.name,
      siteId: sites.id,
      siteCode: sites.code,
      criticality: machines.criticality,
    })
    .from(points)
    .$dynamic();
  const rows = await withPlaceAndSite(query).where(inArray(sites.id, siteIds));
  return new Map(rows.map((r) => [r.pointId, r]));
}

/**
 * Per point, band and local day of the point's site (from `lookbackFirstDay` to
 * `weekEnding` of the site's week): the mean of the usable values, the mean time they were
 * taken (epoch ms), and how many. The forecast fits these, so a point read hourly and one
 * read daily give series of the same size; the weekly means are summed from them (every
 * local day falls wholly in one week). Read from `band_day_sums`, which the analysis write
 * keeps (analysis/band-day-sums-repository.ts): one primary-key range per point and one row
 * per day, however often the point is read.
 */
export async function dailyMeans(db: Db, weeks: SiteWeek[]) {
  if (weeks.length === 0) return [];
  const bySite = weeks.map(() => '(p.site_id = ? AND d.day BETWEEN ? AND ?)').join(' OR ');
  // Thousands of rows for a plant: a prepared statement (the binary protocol carries the
  // doubles as they are, where the text protocol spells and parses every digit: half the
  // driver's CPU), without the query builder's per-row mapping.
  const [rows] = (await primaryPool(db).execute(
    `SELECT d.point_id AS pointId, d.band_key AS bandKey, DATE_FORMAT(d.day, '%Y-%m-%d') AS day,
       d.sum_taken_ms / d.n AS t, d.sum_value / d.n AS v, d.n AS n
     FROM points p
     JOIN band_day_sums d ON d.point_id = p.id
     WHERE ${bySite}`,
    weeks.flatMap((w) => [w.siteId, w.lookbackFirstDay, w.weekEnding]),
  )) as unknown as [
    { pointId: number; bandKey: string; day: string; t: number; v: number; n: number }[],
  ];
  // In point, band and time order.
  return rows
    .map((r) => ({
      pointId: r.pointId,
      bandKey: r.bandKey,
      day: r.day,
      t: Math.round(r.t),
      v: r.v,
      n: r.n,
    }))
    .sort(
      (a, b) =>
        a.pointId - b.pointId ||
        (a.bandKey < b.bandKey ? -1 : a.bandKey > b.bandKey ? 1 : 0) ||
        a.t - b.t,
    );
}

/** The mysql2 pool under the primary of `db` (Drizzle speaks only the text protocol). */
function primaryPool(db: Db): Pick<Pool, 'execute'> {
  const primary = (db as unknown as { $primary?: Db }).$primary ?? db;
  return (primary as unknown as { $client: Pick<Pool, 'execute'> }).$client;
}

/** The bands of every point limit set in the sites, with their full definitions. */
export async function pointBands(db: Db, siteIds: number[]) {
  if (siteIds.length === 0) return [];
  const query = db
    .select({
      pointId: limitSets.pointId,
      key: bands.key,
      name: bands.name,
      unit: bands.unit,
      definition: bands.definition,
    })
    .from(bands)
    .innerJoin(limitSets, eq(limitSets.id, bands.limitSetId))
    .innerJoin(points, eq(points.id, limitSets.pointId))
    .$dynamic();
  return withPlace(query).where(inSites(siteIds));
}

/** The remembered condition state of every point in the sites (baselines live there). */
export async function conditionStates(db: Db, siteIds: number[]) {
  if (siteIds.length === 0) return new Map<number, Record<string, unknown>>();
  const rows = await withPlace(
    db
      .select({ pointId: pointStates.pointId, state: pointStates.state })
      .from(pointStates)
      .innerJoin(points, eq(points.id, pointStates.pointId))
      .$dynamic(),
  ).where(inSites(siteIds));
  return new Map(rows.map((r) => [r.pointId, r.state]));
}

/** Raised and acknowledged alerts of the sites, oldest first. */
export async function openAlerts(db: Db, siteIds: number[]) {
  if (siteIds.length === 0) return [];
  return withPlace(
    db
      .select({ alert: alerts })
      .from(alerts)
      .innerJoin(points, eq(points.id, alerts.pointId))
      .$dynamic(),
  )
    .where(and(inSites(siteIds), inArray(alerts.state, ['raised', 'acknowledged'])))
    .orderBy(asc(alerts.firstAt))
    .limit(500);
}

/** Quality notices nobody has reviewed, of captures taken in [from, to). */
export async function unreviewedNotices(db: Db, siteIds: number[], from: Date, to: Date) {
  if (siteIds.length === 0) return [];
  return withPlace(
    db
      .select({ notice: qualityNotices })
      .from(qualityNotices)
      .innerJoin(points, eq(points.id, qualityNotices.pointId))
      .$dynamic(),
  )
    .where(
      and(
        inSites(siteIds),
        isNull(qualityNotices.reviewedAt),
        gte(qualityNotices.takenAt, from),
        lt(qualityNotices.takenAt, to),
      ),
    )
    .orderBy(asc(qualityNotices.takenAt))
    .limit(500);
}
