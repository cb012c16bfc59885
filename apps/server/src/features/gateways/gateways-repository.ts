/** Gateways with their site's names; keys are stored as prefix and hash only. */
import { and, count, desc, eq, gte, inArray } from 'drizzle-orm';
import type { Db, Tx } from '@turnstone/db/client';
import { gateways, sites, snapshots } from '@turnstone/db/schema';

export type GatewayRow = typeof gateways.$inferSelect;

const withSite = { g: gateways, siteName: sites.name, siteCode: sites.code };

export async function gatewaysOfSites(db: Db, siteIds: readonly number[]) {
  if (siteIds.length === 0) return [];
  return db
    .select(withSite)
    .from(gateways)
    .innerJoin(sites, eq(sites.id, gateways.siteId))
    .where(inArray(gateways.siteId, [...siteIds]))
    .orderBy(desc(gateways.createdAt), desc(gateways.id));
}

export async function gatewayWithSite(db: Db, id: number) {
  const [row] = await db
    .select(withSite)
    .from(gateways)
    .innerJoin(sites, eq(sites.id, gateways.siteId))
    .where(eq(gateways.id, id));
  return row;
}

export async function siteExists(db: Db, siteId: number): Promise<boolean> {
  const [site] = await db.select({ id: sites.id }).from(sites).where(eq(sites.id, siteId));
  return site !== undefined;
}

export async function insertGateway(
  tx: Tx,
  values: { siteId: number; name: string; keyPrefix: string; keyHash: string },
): Promise<number> {
  const [row] = await tx.insert(gateways).values(values).$returningId();
  return row!.id;
}

export async function setRevoked(tx: Tx, id: number, revokedAt: Date) {
  await tx.update(gateways).set({ revokedAt }).where(eq(gateways.id, id));
}

export async function setKey(tx: Tx, id: number, key: { keyPrefix: string; keyHash: string }) {
  await tx.update(gateways).set(key).where(eq(gateways.id, id));
}

/** Captures each gateway posted since `since` (by receipt time), keyed by gateway id. */
export async function postCountsSince(
  db: Db,
  gatewayIds: readonly number[],
  since: Date,
): Promise<Map<number, number>> {
  if (gatewayIds.length === 0) return new Map();
  const rows = await db
    .select({ gatewayId: snapshots.gatewayId, n: count() })
    .from(snapshots)
    .where(and(gte(snapshots.receivedAt, since), inArray(snapshots.gatewayId, [...gatewayIds])))
    .groupBy(snapshots.gatewayId);
  return new Map(rows.map((r) => [Number(r.gatewayId), Number(r.n)]));
}
