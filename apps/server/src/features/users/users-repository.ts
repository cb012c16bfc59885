import { asc, eq, inArray } from 'drizzle-orm';
import type { Db, Tx } from '@turnstone/db/client';
import { sites, userSites, users } from '@turnstone/db/schema';

export type UserRow = typeof users.$inferSelect;

export async function listUsers(db: Db) {
  const rows = await db.select().from(users).orderBy(asc(users.name));
  const links = await db.select().from(userSites);
  const bySite = new Map<number, number[]>();
  for (const l of links) bySite.set(l.userId, [...(bySite.get(l.userId) ?? []), l.siteId]);
  return rows.map((u) => ({ ...u, siteIds: (bySite.get(u.id) ?? []).sort((a, b) => a - b) }));
}

export async function listSites(db: Db) {
  return db
    .select({ id: sites.id, code: sites.code, name: sites.name })
    .from(sites)
    .orderBy(asc(sites.code));
}

export async function existingSiteIds(db: Db | Tx, ids: number[]): Promise<number[]> {
  if (ids.length === 0) return [];
  const rows = await db.select({ id: sites.id }).from(sites).where(inArray(sites.id, ids));
  return rows.map((r) => r.id);
}

export async function findUser(db: Db | Tx, id: number) {
  const [u] = await db.select().from(users).where(eq(users.id, id)).limit(1);
  return u;
}

export async function assignedSites(db: Db | Tx, id: number): Promise<number[]> {
  const rows = await db
    .select({ id: userSites.siteId })
    .from(userSites)
    .where(eq(userSites.userId, id));
  return rows.map((r) => r.id).sort((a, b) => a - b);
}

export async function setSites(tx: Tx, userId: number, siteIds: number[]) {
  await tx.delete(userSites).where(eq(userSites.userId, userId));
  if (siteIds.length)
    await tx.insert(userSites).values(siteIds.map((siteId) => ({ userId, siteId })));
}
