/** The signed-in user's notification settings, and the sites and machines they may choose. */
import { asc, eq, inArray } from 'drizzle-orm';
import type { Db } from '@turnstone/db/client';
import { areas, machines, sites, subscriptions } from '@turnstone/db/schema';

export async function sitesOf(db: Db, siteIds: readonly number[]) {
  if (siteIds.length === 0) return [];
  return db
    .select({ id: sites.id, code: sites.code, name: sites.name })
    .from(sites)
    .where(inArray(sites.id, [...siteIds]))
    .orderBy(asc(sites.code));
}

export async function machinesOfSites(db: Db, siteIds: readonly number[]) {
  if (siteIds.length === 0) return [];
  return db
    .select({ id: machines.id, siteId: areas.siteId, name: machines.name })
    .from(machines)
    .innerJoin(areas, eq(areas.id, machines.areaId))
    .where(inArray(areas.siteId, [...siteIds]))
    .orderBy(asc(machines.name));
}

export async function subscriptionsOf(db: Db, userId: number) {
  return db
    .select()
    .from(subscriptions)
    .where(eq(subscriptions.userId, userId))
    .orderBy(asc(subscriptions.id));
}

export type SubscriptionRow = typeof subscriptions.$inferInsert;

/** Replaces all of a user's subscription rows in one transaction. */
export async function replaceSubscriptions(db: Db, userId: number, rows: SubscriptionRow[]) {
  await db.transaction(async (tx) => {
    await tx.delete(subscriptions).where(eq(subscriptions.userId, userId));
    if (rows.length) await tx.insert(subscriptions).values(rows);
  });
}
