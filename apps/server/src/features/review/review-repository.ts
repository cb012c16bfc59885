/**
 * Queries of the weekly review. Every query is limited to the sites in scope through the
 * point → machine → area join, so a user never reads another site's rows. Aggregation
 * (weekly and daily means) happens in MariaDB, so the answer stays small for a large fleet.
 */
import { and, asc, eq, gte, inArray, isNull, lt, sql } from 'drizzle-orm';
import type { Db } from '@turnstone/db/client';
import {
  alerts,
  areas,
  bands,
  limitSets,
  machines,
  points,
  pointStates,
  qualityNotices,
  sites,
} from '@turnstone/db/schema';
import { localDaySql, type SiteWeek } from './review-weeks.ts';

export interface PointRef {
  pointId: number;
  pointTag: string;
  pointName: string;
  machineId: number;
  machineName: string;
  siteId: number;
  siteCode: string;
}

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
  const rows = await db
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
    .innerJoin(machines, eq(machines.id, points.machineId))
    .innerJoin(areas, eq(areas.id, machines.areaId))
    .innerJoin(sites, eq(sites.id, areas.siteId))
    .where(inArray(sites.id, siteIds));
  return new Map(rows.map((r) => [r.pointId, r]));
}

const inSites = (siteIds: number[]) => inArray(areas.siteId, siteIds);

/**
 * Per point, band and local day of the point's site (`localDaySql`): the mean of the usable
 * values, the mean time they were taken (epoch ms), and how many. The forecast fits these, so
 * a point read hourly and one read daily give series of the same size; the weekly means are
 * summed from them (every local day falls wholly in one week) and the rows are read once.
 */
export async function dailyMeans(db: Db, weeks: SiteWeek[]) {
  if (weeks.length === 0) return [];
  const from = new Date(Math.min(...weeks.map((w) => w.lookbackFrom)));
  const to = new Date(Math.max(...weeks.map((w) => w.thisTo)));
  const day = localDaySql(weeks, sql.raw('a.site_id'), sql.raw('bv.taken_at'));
  // Thousands of rows for a plant (one per point, band and day): read raw, numbers as
  // doubles, without the query builder's per-row mapping. The points' join reaches
  // band_values_point_time_idx, which covers the query (a range per point, no row reads).
  const [rows] = (await db.execute(sql`
    SELECT bv.point_id AS pointId, bv.band_key AS bandKey, ${day} AS day,
      CAST(AVG(TIMESTAMPDIFF(MICROSECOND, '1970-01-01 00:00:00', bv.taken_at) / 1000) AS DOUBLE) AS t,
      AVG(bv.value) AS v, COUNT(*) AS n
    FROM band_values bv
    JOIN points p ON p.id = bv.point_id
    JOIN machines m ON m.id = p.machine_id
    JOIN areas a ON a.id = m.area_id
    WHERE a.site_id IN (${sql.join(
      weeks.map((w) => sql`${w.siteId}`),
      sql`, `,
    )})
      AND bv.taken_at >= ${from} AND bv.taken_at < ${to}
      AND bv.quality_verdict <> 'unusable'
    GROUP BY bv.point_id, bv.band_key, day
    ORDER BY NULL`)) as unknown as [
    { pointId: number; bandKey: string; day: string; t: number; v: number; n: number }[],
  ];
  // In point, band and time order, as GROUP BY gave them before ORDER BY NULL spared
  // MariaDB the sort of its temporary table.
  return rows
    .map((r) => ({
      pointId: r.pointId,
      bandKey: r.bandKey,
      day: String(r.day),
      t: Math.round(r.t),
      v: r.v,
      n: Number(r.n),
    }))
    .sort(
      (a, b) =>
        a.pointId - b.pointId ||
        (a.bandKey < b.bandKey ? -1 : a.bandKey > b.bandKey ? 1 : 0) ||
        a.t - b.t,
    );
}

/** The bands of every point limit set in the sites, with their full definitions. */
export async function pointBands(db: Db, siteIds: number[]) {
  if (siteIds.length === 0) return [];
  return db
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
    .innerJoin(machines, eq(machines.id, points.machineId))
    .innerJoin(areas, eq(areas.id, machines.areaId))
    .where(inSites(siteIds));
}

/** The remembered condition state of every point in the sites (baselines live there). */
export async function conditionStates(db: Db, siteIds: number[]) {
  if (siteIds.length === 0) return new Map<number, Record<string, unknown>>();
  const rows = await db
    .select({ pointId: pointStates.pointId, state: pointStates.state })
    .from(pointStates)
    .innerJoin(points, eq(points.id, pointStates.pointId))
    .innerJoin(machines, eq(machines.id, points.machineId))
    .innerJoin(areas, eq(areas.id, machines.areaId))
    .where(inSites(siteIds));
  return new Map(rows.map((r) => [r.pointId, r.state]));
}

/** Raised and acknowledged alerts of the sites, oldest first. */
export async function openAlerts(db: Db, siteIds: number[]) {
  if (siteIds.length === 0) return [];
  return db
    .select({ alert: alerts })
    .from(alerts)
    .innerJoin(points, eq(points.id, alerts.pointId))
    .innerJoin(machines, eq(machines.id, points.machineId))
    .innerJoin(areas, eq(areas.id, machines.areaId))
    .where(and(inSites(siteIds), inArray(alerts.state, ['raised', 'acknowledged'])))
    .orderBy(asc(alerts.firstAt))
    .limit(500);
}

/** Quality notices nobody has reviewed, of captures taken in [from, to). */
export async function unreviewedNotices(db: Db, siteIds: number[], from: Date, to: Date) {
  if (siteIds.length === 0) return [];
  return db
    .select({ notice: qualityNotices })
    .from(qualityNotices)
    .innerJoin(points, eq(points.id, qualityNotices.pointId))
    .innerJoin(machines, eq(machines.id, points.machineId))
    .innerJoin(areas, eq(areas.id, machines.areaId))
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
