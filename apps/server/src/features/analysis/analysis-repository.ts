import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import type { Db } from '@turnstone/db/client';
import {
  alertEvents,
  alerts,
  analyses,
  areas,
  bands,
  bandValues,
  bearings,
  gears,
  limitSets,
  machines,
  points,
  pointStates,
  qualityNotices,
  snapshots,
} from '@turnstone/db/schema';
import type { BandDefinition as LimitBand } from '@turnstone/condition';

export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
export type SnapshotRow = typeof snapshots.$inferSelect;
export type MachineRow = typeof machines.$inferSelect;

export async function loadSnapshot(db: Db, id: number): Promise<SnapshotRow | undefined> {
  const [s] = await db.select().from(snapshots).where(eq(snapshots.id, id));
  return s;
}

/** The point with its machine, site and the machine's components. */
export async function loadPointContext(db: Db, pointId: number) {
  const [row] = await db
    .select({ point: points, machine: machines, siteId: areas.siteId })
    .from(points)
    .innerJoin(machines, eq(machines.id, points.machineId))
    .innerJoin(areas, eq(areas.id, machines.areaId))
    .where(eq(points.id, pointId));
  if (!row) return undefined;
  const [bearingRows, gearRows] = await Promise.all([
    db.select().from(bearings).where(eq(bearings.machineId, row.machine.id)),
    db.select().from(gears).where(eq(gears.machineId, row.machine.id)),
  ]);
  return { ...row, bearings: bearingRows, gears: gearRows };
}

export interface StoredLimitSet {
  id: number;
  version: number;
  bands: LimitBand[];
}

export async function loadLimitSet(
  db: Db | Tx,
  pointId: number,
): Promise<StoredLimitSet | undefined> {
  const [set] = await db.select().from(limitSets).where(eq(limitSets.pointId, pointId));
  if (!set) return undefined;
  const rows = await db
    .select()
    .from(bands)
    .where(eq(bands.limitSetId, set.id))
    .orderBy(asc(bands.sortOrder), asc(bands.id));
  return {
    id: set.id,
    version: set.version,
    bands: rows.map((r) => r.definition as unknown as LimitBand),
  };
}

/** Writes a point's limit set (replacing its bands) and returns its new version. */
export async function saveLimitSet(
  tx: Tx,
  pointId: number,
  name: string,
  list: readonly LimitBand[],
  userId: number | null,
): Promise<{ id: number; version: number }> {
  const [existing] = await tx
    .select()
    .from(limitSets)
    .where(eq(limitSets.pointId, pointId))
    .for('update');
  let id: number;
  let version: number;
  if (existing) {
    id = existing.id;
    version = existing.version + 1;
    await tx
      .update(limitSets)
      .set({ name, version, updatedBy: userId, updatedAt: new Date() })
      .where(eq(limitSets.id, id));
    await tx.delete(bands).where(eq(bands.limitSetId, id));
  } else {
    const [row] = await tx
      .insert(limitSets)
      .values({ pointId, name, version: 1, updatedBy: userId })
      .$returningId();
    id = row!.id;
    version = 1;
  }
  await insertBands(tx, id, list);
  return { id, version };
}

/** The band rows of a limit set, in order: the list columns plus the whole definition. */
export async function insertBands(
  tx: Tx,
  limitSetId: number,
  list: readonly LimitBand[],
): Promise<void> {
  if (list.length === 0) return;
  await tx.insert(bands).values(
    list.map((b, i) => ({
      limitSetId,
      key: b.key,
      name: b.name,
      kind: b.kind,
      spectrum: b.spectrum,
      unit: b.unit,
      alertLevel: b.alertLevel,
      dangerLevel: b.dangerLevel,
      definition: b as unknown as Record<string, unknown>,
      sortOrder: i,
    })),
  );
}

/** Locks the point's condition state for this transaction (creating it when missing). */
export async function lockPointState(tx: Tx, pointId: number) {
  await tx
    .insert(pointStates)
    .values({ pointId, state: {}, updatedAt: new Date() })
    .onDuplicateKeyUpdate({ set: { pointId: sql`point_id` } });
  const [row] = await tx
    .select()
    .from(pointStates)
    .where(eq(pointStates.pointId, pointId))
    .for('update');
  return row!;
}

export async function savePointState(
  tx: Tx,
  pointId: number,
  state: Record<string, unknown>,
  evaluatedTakenAt: Date,
  limitSetVersion: number,
) {
  await tx
    .update(pointStates)
    .set({ state, evaluatedTakenAt, limitSetVersion, updatedAt: new Date() })
    .where(eq(pointStates.pointId, pointId));
}

export async function openAlert(tx: Tx, pointId: number, bandKey: string) {
  const [row] = await tx
    .select()
    .from(alerts)
    .where(
      and(
        eq(alerts.pointId, pointId),
        eq(alerts.bandKey, bandKey),
        inArray(alerts.state, ['raised', 'acknowledged']),
      ),
    )
    .limit(1);
  return row;
}

export { alerts, alertEvents, analyses, bandValues, points, qualityNotices, snapshots };
