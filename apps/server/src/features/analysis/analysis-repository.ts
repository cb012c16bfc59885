import { and, eq, inArray, isNull, lte, or } from 'drizzle-orm';
import type { Db, Tx } from '@turnstone/db/client';
import { withPlaceAndSite } from '../places/places-repository.ts';
import {
  analyses,
  areas,
  bandValues,
  bearings,
  gears,
  machines,
  points,
  sites,
  snapshots,
} from '@turnstone/db/schema';

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
  /** The site's time zone (IANA), which the band values' local days follow. */
  siteTimeZone: string;
  bearings: (typeof bearings.$inferSelect)[];
  gears: (typeof gears.$inferSelect)[];
}

/** Points with their machine, site and the machine's components: three statements for any number. */
export async function loadPointContexts(
  db: Db,
  pointIds: number[],
): Promise<Map<number, PointContext>> {
  if (pointIds.length === 0) return new Map();
  const query = db
    .select({
      point: points,
      machine: machines,
      siteId: areas.siteId,
      siteTimeZone: sites.timeZone,
    })
    .from(points)
    .$dynamic();
  const rows = await withPlaceAndSite(query).where(inArray(points.id, pointIds));
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

export { analyses, bandValues, points, snapshots };
