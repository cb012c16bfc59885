/**
 * Who receives alert mail: a user's subscriptions (site, machine or digest-only rows), the
 * operator's default of every alert of their sites, and dropping rows for sites a user no
 * longer has. Account settings, user administration and the demo write them through here.
 */
import { and, asc, eq, inArray, isNotNull, notInArray } from 'drizzle-orm';
import type { Db, Tx } from '@turnstone/db/client';
import { areas, machines, subscriptions } from '@turnstone/db/schema';

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

/**
 * The default for an operator: every alert of each given site, at once. Sites the user is
 * already subscribed to at site level are left as they are (their own choice stands).
 */
export async function subscribeToSiteAlerts(
  tx: Tx,
  userId: number,
  siteIds: readonly number[],
): Promise<void> {
  if (siteIds.length === 0) return;
  const have = await tx
    .select({ siteId: subscriptions.siteId })
    .from(subscriptions)
    .where(and(eq(subscriptions.userId, userId), inArray(subscriptions.siteId, [...siteIds])));
  const existing = new Set(have.map((r) => r.siteId));
  const rows = siteIds
    .filter((siteId) => !existing.has(siteId))
    .map((siteId) => ({
      userId,
      siteId,
      machineId: null,
      minLevel: 'alert' as const,
      cadence: 'immediate' as const,
    }));
  if (rows.length) await tx.insert(subscriptions).values(rows);
}

/**
 * Removes the user's subscriptions to sites they no longer have, and to machines of those
 * sites (the digest-only row has neither and stays).
 */
export async function dropSubscriptionsOutside(
  tx: Tx,
  userId: number,
  siteIds: readonly number[],
): Promise<void> {
  const keep = siteIds.length ? [...siteIds] : [-1];
  await tx
    .delete(subscriptions)
    .where(
      and(
        eq(subscriptions.userId, userId),
        isNotNull(subscriptions.siteId),
        notInArray(subscriptions.siteId, keep),
      ),
    );
  await tx
    .delete(subscriptions)
    .where(
      and(
        eq(subscriptions.userId, userId),
        isNotNull(subscriptions.machineId),
        notInArray(
          subscriptions.machineId,
          tx
            .select({ id: machines.id })
            .from(machines)
            .innerJoin(areas, eq(areas.id, machines.areaId))
            .where(inArray(areas.siteId, keep)),
        ),
      ),
    );
}
