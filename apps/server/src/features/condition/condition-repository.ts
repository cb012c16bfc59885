/**
 * Condition persistence, one home for every writer: the points' condition state rows, alerts
 * with their history (raise, update, escalate, clear, acknowledge) and data-quality notices.
 * The worker's condition step, acknowledgement and a limits save all write through here.
 */
import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import type { Db, Tx } from '@turnstone/db/client';
import { alertEvents, alerts, points, pointStates, qualityNotices } from '@turnstone/db/schema';

export type PointStateRow = typeof pointStates.$inferSelect;
export type AlertRow = typeof alerts.$inferSelect;
export type NewAlert = typeof alerts.$inferInsert;
export type AlertChange = Partial<NewAlert>;
export type NewAlertEvent = typeof alertEvents.$inferInsert;
export type NewQualityNotice = typeof qualityNotices.$inferInsert;

// ---------------------------------------------------------------- point states

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

/** The state after judging a capture: with the capture's time and the limit set judged by. */
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

/** The state after an acknowledgement or a limits save (no capture judged). */
export async function replacePointState(
  tx: Tx,
  pointId: number,
  state: Record<string, unknown>,
  now: Date,
) {
  await tx
    .update(pointStates)
    .set({ state, updatedAt: now })
    .where(eq(pointStates.pointId, pointId));
}

// ---------------------------------------------------------------- alerts

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

/** The open alerts of some of a point's bands, locked for this transaction. */
export async function lockOpenAlertsOfBands(tx: Tx, pointId: number, bandKeys: string[]) {
  if (bandKeys.length === 0) return [];
  return tx
    .select()
    .from(alerts)
    .where(
      and(
        eq(alerts.pointId, pointId),
        inArray(alerts.bandKey, bandKeys),
        inArray(alerts.state, ['raised', 'acknowledged']),
      ),
    )
    .for('update');
}

/** The alert rows, locked for this transaction. */
export async function lockAlerts(tx: Tx, ids: number[]) {
  if (ids.length === 0) return [];
  return tx.select().from(alerts).where(inArray(alerts.id, ids)).for('update');
}

/** A new alert with its first history entry; returns its id. */
export async function raiseAlert(
  tx: Tx,
  alert: NewAlert,
  event: Omit<NewAlertEvent, 'alertId' | 'kind'>,
): Promise<number> {
  const [row] = await tx.insert(alerts).values(alert).$returningId();
  await tx.insert(alertEvents).values({ ...event, alertId: row!.id, kind: 'raised' });
  return row!.id;
}

/** Changes an alert row; with an event, adds it to the alert's history. */
export async function changeAlert(
  tx: Tx,
  alertId: number,
  set: AlertChange,
  event?: Omit<NewAlertEvent, 'alertId'>,
): Promise<void> {
  await tx
    .update(alerts)
    .set({ ...set, updatedAt: sql`CURRENT_TIMESTAMP(3)` })
    .where(eq(alerts.id, alertId));
  if (event) await tx.insert(alertEvents).values({ ...event, alertId });
}

// ---------------------------------------------------------------- quality notices

/** A data-quality notice for the engineer (the Review screen lists the week's). */
export async function insertQualityNotice(tx: Tx, notice: NewQualityNotice): Promise<void> {
  await tx.insert(qualityNotices).values(notice);
}

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
