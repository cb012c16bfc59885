import { and, inArray, isNull, gte, sql } from 'drizzle-orm';
import type { Db } from '@turnstone/db/client';
import { alerts, areas, machines, points, qualityNotices, sites } from '@turnstone/db/schema';
import { eq } from 'drizzle-orm';

export async function listSites(db: Db, siteIds: number[]) {
  if (siteIds.length === 0) return [];
  return db.select().from(sites).where(inArray(sites.id, siteIds)).orderBy(sites.name);
}

/** The tree rows of the given sites, one row per point (machines without points too). */
export async function treeRows(db: Db, siteIds: number[]) {
  if (siteIds.length === 0) return [];
  return db
    .select({
      siteId: sites.id,
      areaId: areas.id,
      areaName: areas.name,
      machineId: machines.id,
      machineName: machines.name,
      machineType: machines.type,
      nominalRpm: machines.nominalRpm,
      pointId: points.id,
      pointTag: points.tag,
      pointName: points.name,
      direction: points.direction,
      lastTakenAt: points.lastTakenAt,
      lastVerdict: points.lastVerdict,
    })
    .from(sites)
    .innerJoin(areas, eq(areas.siteId, sites.id))
    .innerJoin(machines, eq(machines.areaId, areas.id))
    .leftJoin(points, eq(points.machineId, machines.id))
    .where(inArray(sites.id, siteIds))
    .orderBy(areas.name, machines.name, points.tag);
}

/** Highest open alert level per point. */
export async function openAlertLevels(db: Db): Promise<Map<number, 'alert' | 'danger'>> {
  const rows = await db
    .select({
      pointId: alerts.pointId,
      level: sql<string>`MAX(${alerts.level} = 'danger')`.as('d'),
    })
    .from(alerts)
    .where(inArray(alerts.state, ['raised', 'acknowledged']))
    .groupBy(alerts.pointId);
  return new Map(rows.map((r) => [r.pointId, Number(r.level) === 1 ? 'danger' : 'alert']));
}

/** Points with a quality notice nobody has reviewed yet, newer than `since`. */
export async function openQualityPoints(db: Db, since: Date): Promise<Set<number>> {
  const rows = await db
    .selectDistinct({ pointId: qualityNotices.pointId })
    .from(qualityNotices)
    .where(and(isNull(qualityNotices.reviewedAt), gte(qualityNotices.takenAt, since)));
  return new Set(rows.map((r) => r.pointId));
}
