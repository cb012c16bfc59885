import { and, count, eq, inArray, ne, sql } from 'drizzle-orm';
import type { MySqlTable } from 'drizzle-orm/mysql-core';
import type { Db, Tx } from '@turnstone/db/client';
import {
  alerts,
  analyses,
  findings,
  qualityNotices,
  areas,
  bearings,
  gears,
  limitSets,
  machines,
  points,
  snapshots,
  sites,
} from '@turnstone/db/schema';

export async function listSites(db: Db, siteIds: number[]) {
  if (siteIds.length === 0) return [];
  return db.select().from(sites).where(inArray(sites.id, siteIds)).orderBy(sites.name);
}

export async function listAreas(db: Db, siteIds: number[]) {
  if (siteIds.length === 0) return [];
  return db.select().from(areas).where(inArray(areas.siteId, siteIds)).orderBy(areas.name);
}

export async function listMachines(db: Db, areaIds: number[]) {
  if (areaIds.length === 0) return [];
  return db.select().from(machines).where(inArray(machines.areaId, areaIds)).orderBy(machines.name);
}

export async function componentsOf(db: Db, machineIds: number[]) {
  if (machineIds.length === 0) return { bearingRows: [], gearRows: [], pointRows: [] };
  const [bearingRows, gearRows, pointRows] = await Promise.all([
    db.select().from(bearings).where(inArray(bearings.machineId, machineIds)).orderBy(bearings.id),
    db.select().from(gears).where(inArray(gears.machineId, machineIds)).orderBy(gears.id),
    db.select().from(points).where(inArray(points.machineId, machineIds)).orderBy(points.tag),
  ]);
  return { bearingRows, gearRows, pointRows };
}

export async function siteById(db: Db | Tx, id: number) {
  const [row] = await db.select().from(sites).where(eq(sites.id, id));
  return row;
}
export async function siteByCode(db: Db | Tx, code: string, exceptId = 0) {
  const [row] = await db
    .select({ id: sites.id })
    .from(sites)
    .where(and(eq(sites.code, code), ne(sites.id, exceptId)));
  return row;
}
export async function areaById(db: Db | Tx, id: number) {
  const [row] = await db.select().from(areas).where(eq(areas.id, id));
  return row;
}
export async function areaByName(db: Db | Tx, siteId: number, name: string, exceptId = 0) {
  const [row] = await db
    .select({ id: areas.id })
    .from(areas)
    .where(and(eq(areas.siteId, siteId), eq(areas.name, name), ne(areas.id, exceptId)));
  return row;
}
/** The machine with its area's site. */
export async function machineById(db: Db | Tx, id: number) {
  const [row] = await db
    .select({ machine: machines, siteId: areas.siteId })
    .from(machines)
    .innerJoin(areas, eq(areas.id, machines.areaId))
    .where(eq(machines.id, id));
  return row;
}
export async function machineByName(db: Db | Tx, areaId: number, name: string, exceptId = 0) {
  const [row] = await db
    .select({ id: machines.id })
    .from(machines)
    .where(and(eq(machines.areaId, areaId), eq(machines.name, name), ne(machines.id, exceptId)));
  return row;
}
/** The point of the site with this tag (tags are unique per site), other than `exceptId`. */
export async function pointByTag(db: Db | Tx, siteId: number, tag: string, exceptId = 0) {
  const [row] = await db
    .select({ id: points.id, machineId: points.machineId })
    .from(points)
    .where(and(eq(points.siteId, siteId), eq(points.tag, tag), ne(points.id, exceptId)));
  return row;
}
/** The tags among `tags` that points of the site other than the machine's own use. */
export async function tagsTakenAtSite(
  db: Db | Tx,
  siteId: number,
  tags: string[],
  exceptMachineId: number,
): Promise<string[]> {
  if (tags.length === 0) return [];
  const rows = await db
    .select({ tag: points.tag })
    .from(points)
    .where(
      and(
        eq(points.siteId, siteId),
        inArray(points.tag, tags),
        ne(points.machineId, exceptMachineId),
      ),
    )
    .orderBy(points.tag);
  return rows.map((r) => r.tag);
}
/** Keeps the points' site in step with their machine's, after the machine moved site. */
export async function movePointsToSite(tx: Tx, machineId: number, siteId: number) {
  await tx.update(points).set({ siteId }).where(eq(points.machineId, machineId));
}
export async function bearingsOf(db: Db | Tx, machineId: number) {
  return db.select().from(bearings).where(eq(bearings.machineId, machineId)).orderBy(bearings.id);
}
export async function gearsOf(db: Db | Tx, machineId: number) {
  return db.select().from(gears).where(eq(gears.machineId, machineId)).orderBy(gears.id);
}
export async function pointsOf(db: Db | Tx, machineId: number) {
  return db.select().from(points).where(eq(points.machineId, machineId));
}

/** How many snapshots, analyses, alerts, findings and notices the points hold: data that deleting would lose. */
export async function dataCount(db: Db | Tx, pointIds: number[]): Promise<number> {
  if (pointIds.length === 0) return 0;
  const counts = await Promise.all(
    [snapshots, analyses, alerts, findings, qualityNotices].map((t) =>
      db.select({ n: count() }).from(t).where(inArray(t.pointId, pointIds)),
    ),
  );
  return counts.reduce((sum, [row]) => sum + Number(row?.n ?? 0), 0);
}

/**
 * Locks the points' rows for the deleting transaction (first, before anything is counted):
 * ingest inserts a capture from its point's row read in share mode, so no capture can
 * arrive for them until the deletion commits or rolls back (what the foreign key from the
 * partitioned `snapshots` to `points` did).
 */
export async function lockPoints(tx: Tx, pointIds: number[]): Promise<void> {
  if (pointIds.length === 0) return;
  await tx.select({ id: points.id }).from(points).where(inArray(points.id, pointIds)).for('update');
}
export async function lockPointsOfMachine(tx: Tx, machineId: number): Promise<void> {
  await tx
    .select({ id: points.id })
    .from(points)
    .where(eq(points.machineId, machineId))
    .for('update');
}

/**
 * Deletes the points and everything that hangs from them, in the caller's transaction. The
 * captures' tables are partitioned and take no foreign keys, so their rows (snapshots, uids,
 * jobs, analyses, band values, pins, quality notices) are deleted here explicitly, not by
 * cascade. (The setup services refuse to delete a point with captures; this keeps the
 * deletion whole whatever the caller checked.)
 */
export async function deletePoints(tx: Tx, pointIds: number[]) {
  if (pointIds.length === 0) return;
  const ids = sql.join(
    pointIds.map((id) => sql`${id}`),
    sql`, `,
  );
  const ofAnalyses = sql`SELECT id FROM analyses WHERE point_id IN (${ids})`;
  const ofSnapshots = sql`SELECT id FROM snapshots WHERE point_id IN (${ids})`;
  await tx.execute(sql`DELETE FROM capture_pins WHERE analysis_id IN (${ofAnalyses})`);
  await tx.execute(sql`DELETE FROM quality_notices WHERE point_id IN (${ids})`);
  await tx.execute(sql`DELETE FROM band_values WHERE point_id IN (${ids})`);
  await tx.execute(sql`DELETE FROM analyses WHERE point_id IN (${ids})`);
  await tx.execute(sql`DELETE FROM jobs WHERE snapshot_id IN (${ofSnapshots})`);
  await tx.execute(sql`DELETE FROM snapshot_uids WHERE snapshot_id IN (${ofSnapshots})`);
  await tx.execute(sql`DELETE FROM snapshots WHERE point_id IN (${ids})`);
  await tx.delete(limitSets).where(inArray(limitSets.pointId, pointIds));
  await tx.delete(points).where(inArray(points.id, pointIds));
}

// ---------------------------------------------------------------- writes of the tree

/** The tables of the machine tree, each with an auto-increment `id`. */
type TreeTable =
  typeof sites | typeof areas | typeof machines | typeof points | typeof bearings | typeof gears;

/** Inserts one row of the tree and returns its id. */
export async function insertRow<T extends TreeTable>(
  tx: Tx,
  table: T,
  values: T['$inferInsert'],
): Promise<number> {
  // Drizzle cannot check a value against a union of tables; the signature above does.
  const [row] = await tx
    .insert(table as MySqlTable)
    .values(values as never)
    .$returningId();
  return (row as { id: number }).id;
}

export async function updateRow<T extends TreeTable>(
  tx: Tx,
  table: T,
  id: number,
  set: Partial<T['$inferInsert']>,
): Promise<void> {
  await tx
    .update(table)
    .set(set as never)
    .where(eq(table.id, id));
}

export async function deleteRow(tx: Tx, table: TreeTable, id: number): Promise<void> {
  await tx.delete(table).where(eq(table.id, id));
}
