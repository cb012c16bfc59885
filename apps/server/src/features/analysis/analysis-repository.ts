import { and, asc, eq, inArray, isNull, lte, or, sql } from 'drizzle-orm';
import type { Db, Tx } from '@turnstone/db/client';
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

export type SnapshotRow = typeof snapshots.$inferSelect;
export type MachineRow = typeof machines.$inferSelect;

/** Snapshots by id, in one statement. */
export async function loadSnapshots(db: Db, ids: number[]): Promise<Map<number, SnapshotRow>> {
  if (ids.length === 0) return new Map();
  const rows = await db.select().from(snapshots).where(inArray(snapshots.id, ids));
  return new Map(rows.map((r) => [r.id, r]));
}

export interface PointContext {
  point: typeof points.$inferSelect;
  machine: MachineRow;
  siteId: number;
  bearings: (typeof bearings.$inferSelect)[];
  gears: (typeof gears.$inferSelect)[];
}

/** Points with their machine, site and the machine's components: three statements for any number. */
export async function loadPointContexts(
  db: Db,
  pointIds: number[],
): Promise<Map<number, PointContext>> {
  if (pointIds.length === 0) return new Map();
  const rows = await db
    .select({ point: points, machine: machines, siteId: areas.siteId })
    .from(points)
    .innerJoin(machines, eq(machines.id, points.machineId))
    .innerJoin(areas, eq(areas.id, machines.areaId))
    .where(inArray(points.id, pointIds));
  const machineIds = [...new Set(rows.map((r) => r.machine.id))];
  const [bearingRows, gearRows] = machineIds.length
    ? await Promise.all([
        db.select().from(bearings).where(inArray(bearings.machineId, machineIds)),
        db.select().from(gears).where(inArray(gears.machineId, machineIds)),
      ])
    : [[], []];
  return new Map(
    rows.map((row) => [
      row.point.id,
      {
        ...row,
        bearings: bearingRows.filter((b) => b.machineId === row.machine.id),
        gears: gearRows.filter((g) => g.machineId === row.machine.id),
      },
    ]),
  );
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
  return (await loadLimitSets(db, [pointId])).get(pointId);
}

/** The limit sets of several points (two statements), by point id; points without one are absent. */
/** The quality verdict of each point's latest judged capture (null before the first). */
export async function lastVerdicts(
  db: Db | Tx,
  pointIds: number[],
): Promise<Map<number, 'ok' | 'suspect' | 'unusable' | null>> {
  if (pointIds.length === 0) return new Map();
  const rows = await db
    .select({ id: points.id, lastVerdict: points.lastVerdict })
    .from(points)
    .where(inArray(points.id, pointIds));
  return new Map(rows.map((r) => [r.id, r.lastVerdict]));
}

/** The version of each point's limit set (one statement; points without a set are absent). */
export async function limitSetVersions(
  db: Db | Tx,
  pointIds: number[],
): Promise<Map<number, number>> {
  if (pointIds.length === 0) return new Map();
  const rows = await db
    .select({ pointId: limitSets.pointId, version: limitSets.version })
    .from(limitSets)
    .where(inArray(limitSets.pointId, pointIds));
  return new Map(rows.map((r) => [r.pointId!, r.version]));
}

export async function loadLimitSets(
  db: Db | Tx,
  pointIds: number[],
): Promise<Map<number, StoredLimitSet>> {
  const out = new Map<number, StoredLimitSet>();
  if (pointIds.length === 0) return out;
  const sets = await db.select().from(limitSets).where(inArray(limitSets.pointId, pointIds));
  if (sets.length === 0) return out;
  const rows = await db
    .select()
    .from(bands)
    .where(
      inArray(
        bands.limitSetId,
        sets.map((s) => s.id),
      ),
    )
    .orderBy(asc(bands.sortOrder), asc(bands.id));
  for (const set of sets)
    out.set(set.pointId!, {
      id: set.id,
      version: set.version,
      bands: rows
        .filter((r) => r.limitSetId === set.id)
        .map((r) => r.definition as unknown as LimitBand),
    });
  return out;
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

export type PointStateRow = typeof pointStates.$inferSelect;

/** Locks the point's condition state for this transaction (creating it when missing). */
export async function lockPointState(tx: Tx, pointId: number): Promise<PointStateRow> {
  return (await lockPointStates(tx, [pointId])).get(pointId)!;
}

/**
 * Locks the condition states of several points for this transaction, creating missing ones.
 * Rows are locked in ascending point id, so two transactions locking overlapping sets wait
 * for each other instead of deadlocking. Existing rows are locked with a plain
 * SELECT … FOR UPDATE, not an upsert: an INSERT checks the points foreign key first and
 * holds a shared lock on the point row while it waits, and the holder's later
 * `UPDATE points` would then deadlock with it.
 */
export async function lockPointStates(
  tx: Tx,
  pointIds: number[],
): Promise<Map<number, PointStateRow>> {
  const ids = [...new Set(pointIds)].sort((a, b) => a - b);
  const select = (list: number[]) =>
    tx
      .select()
      .from(pointStates)
      .where(inArray(pointStates.pointId, list))
      .orderBy(asc(pointStates.pointId))
      .for('update');
  const out = new Map<number, PointStateRow>();
  if (ids.length === 0) return out;
  for (const r of await select(ids)) out.set(r.pointId, r);
  const missing = ids.filter((id) => !out.has(id));
  if (missing.length) {
    // A point's first capture. Two workers creating the same row may deadlock here; the
    // loser's batch is rolled back and run again.
    const now = new Date();
    await tx
      .insert(pointStates)
      .values(missing.map((pointId) => ({ pointId, state: {}, updatedAt: now })))
      .onDuplicateKeyUpdate({ set: { pointId: sql`point_id` } });
    for (const r of await select(missing)) out.set(r.pointId, r);
  }
  return out;
}

export type NewAnalysis = typeof analyses.$inferInsert;

/**
 * Inserts analyses in one statement and returns their ids by snapshot id. RETURNING
 * (MariaDB ≥ 10.5) rather than insertId + n: ids of a multi-row insert are consecutive only
 * under some auto-increment lock modes (not Galera's). Sent as a prepared statement on the
 * transaction's connection: the binary protocol carries the spectra BLOBs as they are,
 * where the text protocol would spell every byte as two hex digits.
 */
export async function insertAnalyses(tx: Tx, rows: NewAnalysis[]): Promise<Map<number, number>> {
  if (rows.length === 0) return new Map();
  const { sql: text, params } = tx.insert(analyses).values(rows).toSQL();
  const [ret] = await connectionOf(tx).execute(`${text} RETURNING id, snapshot_id`, params);
  return new Map(
    (ret as { id: number | string; snapshot_id: number | string }[]).map((r) => [
      Number(r.snapshot_id),
      Number(r.id),
    ]),
  );
}

/** The mysql2 connection a Drizzle transaction runs on (Drizzle only speaks the text protocol). */
function connectionOf(tx: Tx): {
  execute(sql: string, params: unknown[]): Promise<[unknown, unknown]>;
} {
  return (tx as unknown as { session: { client: ReturnType<typeof connectionOf> } }).session.client;
}

export async function insertBandValues(
  tx: Tx,
  rows: (typeof bandValues.$inferInsert)[],
): Promise<void> {
  if (rows.length) await tx.insert(bandValues).values(rows);
}

/** The point's latest capture, unless a newer one is already recorded. */
export async function markPointTaken(
  tx: Tx,
  pointId: number,
  takenAt: Date,
  verdict: 'ok' | 'suspect' | 'unusable',
): Promise<void> {
  await tx
    .update(points)
    .set({ lastTakenAt: takenAt, lastVerdict: verdict })
    .where(
      and(eq(points.id, pointId), or(isNull(points.lastTakenAt), lte(points.lastTakenAt, takenAt))),
    );
}

export async function markSnapshotsDone(tx: Tx, ids: number[]): Promise<void> {
  if (ids.length === 0) return;
  await tx
    .update(snapshots)
    .set({ status: 'done', statusReason: null })
    .where(inArray(snapshots.id, ids));
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

/** The open (raised or acknowledged) alerts of some points, oldest first. */
export async function openAlerts(tx: Tx, pointIds: number[]) {
  if (pointIds.length === 0) return [];
  return tx
    .select({ id: alerts.id, pointId: alerts.pointId, bandKey: alerts.bandKey })
    .from(alerts)
    .where(
      and(inArray(alerts.pointId, pointIds), inArray(alerts.state, ['raised', 'acknowledged'])),
    )
    .orderBy(asc(alerts.id));
}

export { alerts, alertEvents, analyses, bandValues, points, qualityNotices, snapshots };
