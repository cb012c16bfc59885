import {
  and,
  asc,
  count,
  desc,
  eq,
  gt,
  gte,
  inArray,
  isNotNull,
  lte,
  max,
  type SQL,
} from 'drizzle-orm';
import { alias } from 'drizzle-orm/mysql-core';
import type { Db } from '@turnstone/db/client';
import {
  alertEvents,
  alerts,
  analyses,
  areas,
  bandValues,
  machines,
  points,
  sites,
  users,
} from '@turnstone/db/schema';
import type { Tx } from '@turnstone/db/client';
import type { CursorPosition } from '../../lib/cursor.ts';
import { afterPosition } from '../../lib/cursor.ts';
import { inSites, withPlaceAndSite } from '../places/places-repository.ts';

export interface AlertFilter {
  state?: 'raised' | 'acknowledged' | 'cleared';
  level?: 'alert' | 'danger';
  siteId?: number;
  pointId?: number;
  /** Alerts on the points of this machine. */
  machineId?: number;
  /** Raised or acknowledged (not cleared). */
  open?: boolean;
  ids?: number[];
  /** Sites the caller may see; null for every site (admin). */
  siteIds: number[] | null;
  limit?: number;
  /** lastAt at or after. */
  since?: Date;
  /** Rows after this (lastAt, id) in the list's descending order. */
  after?: CursorPosition;
}

const ackUser = alias(users, 'ack_user');

const columns = {
  id: alerts.id,
  level: alerts.level,
  state: alerts.state,
  pointId: alerts.pointId,
  pointTag: points.tag,
  pointName: points.name,
  machineId: machines.id,
  machineName: machines.name,
  siteId: areas.siteId,
  siteCode: sites.code,
  bandKey: alerts.bandKey,
  bandName: alerts.bandName,
  unit: alerts.unit,
  value: alerts.lastValue,
  peakValue: alerts.peakValue,
  limit: alerts.limitValue,
  suspect: alerts.suspect,
  firstAt: alerts.firstAt,
  lastAt: alerts.lastAt,
  clearedAt: alerts.clearedAt,
  acknowledgedBy: ackUser.name,
  acknowledgedAt: alerts.acknowledgedAt,
  acknowledgeNote: alerts.acknowledgeNote,
  updatedAt: alerts.updatedAt,
};

export type AlertRow = Awaited<ReturnType<typeof listAlerts>>[number];

/** Alerts with their point, machine and site, newest activity first. */
export async function listAlerts(db: Db | Tx, f: AlertFilter) {
  const where: SQL[] = [];
  if (f.state) where.push(eq(alerts.state, f.state));
  if (f.level) where.push(eq(alerts.level, f.level));
  if (f.siteId) where.push(eq(areas.siteId, f.siteId));
  if (f.pointId) where.push(eq(alerts.pointId, f.pointId));
  if (f.machineId) where.push(eq(points.machineId, f.machineId));
  if (f.open) where.push(inArray(alerts.state, ['raised', 'acknowledged']));
  if (f.ids) where.push(inArray(alerts.id, f.ids.length ? f.ids : [0]));
  if (f.siteIds) where.push(inSites(f.siteIds));
  if (f.since) where.push(gte(alerts.lastAt, f.since));
  if (f.after) where.push(afterPosition(alerts.lastAt, alerts.id, f.after));
  return withPlaceAndSite(
    db.select(columns).from(alerts).innerJoin(points, eq(points.id, alerts.pointId)).$dynamic(),
  )
    .leftJoin(ackUser, eq(ackUser.id, alerts.acknowledgedBy))
    .where(and(...where))
    .orderBy(desc(alerts.lastAt), desc(alerts.id))
    .limit(f.limit ?? 500);
}

export async function alertHistory(db: Db, alertId: number) {
  return db
    .select({
      id: alertEvents.id,
      kind: alertEvents.kind,
      level: alertEvents.level,
      value: alertEvents.value,
      at: alertEvents.at,
      userName: users.name,
      note: alertEvents.note,
    })
    .from(alertEvents)
    .leftJoin(users, eq(users.id, alertEvents.userId))
    .where(eq(alertEvents.alertId, alertId))
    .orderBy(asc(alertEvents.at), asc(alertEvents.id));
}

/**
 * The band's newest values at or before `upTo`, oldest first (the alert detail's sparkline and
 * the alert mail's picture both read it).
 */
export async function recentBandValues(
  db: Pick<Db, 'select'>,
  pointId: number,
  bandKey: string,
  limit: number,
  upTo?: Date,
): Promise<{ at: Date; value: number }[]> {
  const where = [eq(bandValues.pointId, pointId), eq(bandValues.bandKey, bandKey)];
  if (upTo) where.push(lte(bandValues.takenAt, upTo));
  const rows = await db
    .select({ at: bandValues.takenAt, value: bandValues.value })
    .from(bandValues)
    .where(and(...where))
    .orderBy(desc(bandValues.takenAt), desc(bandValues.id))
    .limit(limit);
  return rows.reverse();
}

/** How many of the band's values were taken after `since` (the value that raised the alert). */
export async function bandValuesAfter(db: Db, pointId: number, bandKey: string, since: Date) {
  const [row] = await db
    .select({ n: count() })
    .from(bandValues)
    .where(
      and(
        eq(bandValues.pointId, pointId),
        eq(bandValues.bandKey, bandKey),
        gt(bandValues.takenAt, since),
      ),
    );
  return Number(row?.n ?? 0);
}

/**
 * The machine's ISO 20816 zone: the worst of the zones its points' newest zoned captures
 * were judged in (the zone each capture gets in the analysis step).
 */
export async function machineZone(
  db: Db,
  machineId: number,
): Promise<'A' | 'B' | 'C' | 'D' | null> {
  const latest = db
    .select({ pointId: analyses.pointId, takenAt: max(analyses.takenAt).as('latest_at') })
    .from(analyses)
    .innerJoin(points, eq(points.id, analyses.pointId))
    .where(and(eq(points.machineId, machineId), isNotNull(analyses.isoZone)))
    .groupBy(analyses.pointId)
    .as('latest');
  const [row] = await db
    .select({ zone: max(analyses.isoZone) })
    .from(analyses)
    .innerJoin(
      latest,
      and(eq(latest.pointId, analyses.pointId), eq(latest.takenAt, analyses.takenAt)),
    )
    .where(isNotNull(analyses.isoZone));
  return (row?.zone as 'A' | 'B' | 'C' | 'D' | null | undefined) ?? null;
}
