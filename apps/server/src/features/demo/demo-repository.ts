/** What the demo seed and the demo history write and read directly. */
import { and, count, eq, inArray, sql } from 'drizzle-orm';
import type { MySqlSelect } from 'drizzle-orm/mysql-core';
import type { Db } from '@turnstone/db/client';
import {
  alerts,
  auditLog,
  areas,
  bearings,
  findings,
  gears,
  machines,
  points,
  qualityNotices,
  sites,
  userSites,
  users,
} from '@turnstone/db/schema';
import { demoPlant, demoUsers } from '@turnstone/demo-scenario/demo-plant';
import { subscribeToSiteAlerts } from '../mail/subscriptions-repository.ts';
import { MACHINE_FIELDS, pick } from '../setup/setup-columns.ts';

export async function userCount(db: Db): Promise<number> {
  const [row] = await db.select({ n: count() }).from(users);
  return row?.n ?? 0;
}

/** The demo plant and its people, in one transaction (`hash`: the demo password's). */
export async function insertDemoPlant(db: Db, hash: string): Promise<void> {
  await db.transaction(async (tx) => {
    const siteIds = new Map<string, number>();
    for (const site of demoPlant) {
      const [s] = await tx
        .insert(sites)
        .values({ code: site.code, name: site.name, timeZone: site.timeZone })
        .$returningId();
      siteIds.set(site.code, s!.id);
      for (const area of site.areas) {
        const [a] = await tx
          .insert(areas)
          .values({ siteId: s!.id, name: area.name })
          .$returningId();
        for (const m of area.machines) {
          const [mach] = await tx
            .insert(machines)
            .values({
              areaId: a!.id,
              ...pick(m, MACHINE_FIELDS),
              lineHz: m.lineHz,
              notes: `Demo story: ${m.story}.`,
            })
            .$returningId();
          const bearingIds = new Map<string, number>();
          for (const b of m.bearings) {
            const [bi] = await tx
              .insert(bearings)
              .values({ machineId: mach!.id, ...b, speedRatio: b.speedRatio ?? 1 })
              .$returningId();
            bearingIds.set(b.name, bi!.id);
          }
          for (const g of m.gears ?? [])
            await tx.insert(gears).values({ machineId: mach!.id, ...g });
          for (const p of m.points) {
            await tx.insert(points).values({
              machineId: mach!.id,
              siteId: s!.id,
              tag: `${site.code}-${m.code}-${p.suffix}`,
              name: p.name,
              location: p.location,
              direction: p.direction,
              sensitivityMvPerG: p.sensitivityMvPerG,
              bearingId: p.bearing ? (bearingIds.get(p.bearing) ?? null) : null,
            });
          }
        }
      }
    }
    for (const u of demoUsers) {
      const [ui] = await tx
        .insert(users)
        .values({ email: u.email, name: u.name, role: u.role, passwordHash: hash })
        .$returningId();
      for (const code of u.sites)
        await tx.insert(userSites).values({ userId: ui!.id, siteId: siteIds.get(code)! });
      // The default every operator gets when made (see users-service): their sites' alerts.
      if (u.role === 'operator')
        await subscribeToSiteAlerts(
          tx,
          ui!.id,
          u.sites.map((code) => siteIds.get(code)!),
        );
    }
  });
}

/** The sites a user is assigned to (as rows of user_sites, whatever the role). */
export async function ownSiteIds(db: Db, userId: number): Promise<number[]> {
  const rows = await db
    .select({ siteId: userSites.siteId })
    .from(userSites)
    .where(eq(userSites.userId, userId));
  return rows.map((r) => r.siteId);
}

export function allSites(db: Db) {
  return db.select().from(sites);
}

/** Every point's id with its tag and site code. */
export function pointTags(db: Db) {
  return db
    .select({ id: points.id, tag: points.tag, siteCode: sites.code })
    .from(points)
    .innerJoin(sites, eq(sites.id, points.siteId));
}

export async function setCaptureSetup(db: Db, pointId: number, fmaxHz: number, lines: number) {
  await db.update(points).set({ fmaxHz, lines }).where(eq(points.id, pointId));
}

export async function alertCountsByState(db: Db) {
  const counts = await db
    .select({ state: alerts.state, n: sql<number>`COUNT(*)` })
    .from(alerts)
    .groupBy(alerts.state);
  const byState = { raised: 0, acknowledged: 0, cleared: 0 };
  for (const r of counts) byState[r.state] = Number(r.n);
  return byState;
}

export async function qualityNoticeCount(db: Db): Promise<number> {
  const [row] = await db.select({ n: count() }).from(qualityNotices);
  return Number(row?.n ?? 0);
}

/** Joins a query from `alerts` to the alert's point and its site. Give the query `$dynamic()`. */
const withPointAndSite = <T extends MySqlSelect>(query: T) =>
  query
    .innerJoin(points, eq(points.id, alerts.pointId))
    .innerJoin(sites, eq(sites.id, points.siteId));

/** Raised alerts at the alert level (not danger), with their point's tag and site code. */
export function raisedAlertsAtAlertLevel(db: Db) {
  const raised = db
    .select({
      id: alerts.id,
      tag: points.tag,
      siteCode: sites.code,
      pointId: alerts.pointId,
      bandKey: alerts.bandKey,
      level: alerts.level,
      firstAt: alerts.firstAt,
    })
    .from(alerts)
    .$dynamic();
  return withPointAndSite(raised).where(and(eq(alerts.state, 'raised'), eq(alerts.level, 'alert')));
}

/** An alert of one band on the point with this site code and tag, if any. */
export async function alertOfPointBand(db: Db, siteCode: string, tag: string, bandKey: string) {
  const [a] = await withPointAndSite(
    db.select({ id: alerts.id, pointId: alerts.pointId }).from(alerts).$dynamic(),
  )
    .where(and(eq(sites.code, siteCode), eq(points.tag, tag), eq(alerts.bandKey, bandKey)))
    .limit(1);
  return a;
}

/** Dates a finding when the story's planner wrote it, not when the seed ran. */
/**
 * A finding of the story dated when the planner wrote it: its creation, last change and audit
 * entries (written at the seed's own time) all at `at`.
 */
export async function backdateFinding(db: Db, id: number, at: Date): Promise<void> {
  await db
    .update(findings)
    .set({ createdAt: at, updatedAt: at })
    .where(inArray(findings.id, [id]));
  await db
    .update(auditLog)
    .set({ at })
    .where(and(eq(auditLog.entity, 'finding'), eq(auditLog.entityId, String(id))));
}
