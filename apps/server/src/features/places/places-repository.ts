/**
 * Where a point stands: its machine, the machine's area and the area's site. Every reader
 * that scopes points to sites joins through here.
 */
import { eq, inArray } from 'drizzle-orm';
import type { MySqlSelect } from 'drizzle-orm/mysql-core';
import type { Db, Tx } from '@turnstone/db/client';
import { areas, machines, points, sites } from '@turnstone/db/schema';

/**
 * Joins a query that has `points` to the point's machine and area; `areas.siteId` is then
 * the point's site. Give the query `$dynamic()`.
 */
export const withPlace = <T extends MySqlSelect>(query: T) =>
  query
    .innerJoin(machines, eq(machines.id, points.machineId))
    .innerJoin(areas, eq(areas.id, machines.areaId));

/** `withPlace` and the site's row (its code, name, time zone). */
export const withPlaceAndSite = <T extends MySqlSelect>(query: T) =>
  withPlace(query).innerJoin(sites, eq(sites.id, areas.siteId));

/** Points in these sites (of a query joined `withPlace`); no sites match no point. */
export const inSites = (siteIds: readonly number[]) =>
  inArray(areas.siteId, siteIds.length ? [...siteIds] : [0]);

/** A point with its machine and the site it belongs to (through the machine's area). */
export async function pointWithPlace(db: Db | Tx, pointId: number) {
  const [row] = await withPlace(
    db.select({ point: points, machine: machines, siteId: areas.siteId }).from(points).$dynamic(),
  ).where(eq(points.id, pointId));
  return row;
}
