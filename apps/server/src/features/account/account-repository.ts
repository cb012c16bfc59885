/** The sites and machines the signed-in user may choose, and the user's unit system. */
import { asc, eq, inArray } from 'drizzle-orm';
import type { Db, Tx } from '@turnstone/db/client';
import { areas, machines, sites, users } from '@turnstone/db/schema';
import type { UnitSystem } from '@turnstone/contracts/units';

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

export async function setUnitSystem(db: Db | Tx, userId: number, unitSystem: UnitSystem) {
  await db.update(users).set({ unitSystem }).where(eq(users.id, userId));
}
