import { and, asc, desc, eq, gte, inArray, isNull, like } from 'drizzle-orm';
import type { Db } from '@turnstone/db/client';
import {
  alertEvents,
  alerts,
  analyses,
  auditLog,
  bands,
  bandValues,
  limitSets,
  pointStates,
  users,
} from '@turnstone/db/schema';
import type { BandDefinition as LimitBand } from '@turnstone/condition';
import type { Tx } from '@turnstone/db/client';
import { insertBands } from '../analysis/analysis-repository.ts';

type MachineType = (typeof limitSets.$inferSelect)['machineType'] & string;

/** The point's limit set row with who saved it last. */
export async function limitSetMeta(db: Db, pointId: number) {
  const [row] = await db
    .select({
      name: limitSets.name,
      version: limitSets.version,
      updatedAt: limitSets.updatedAt,
      updatedBy: users.name,
    })
    .from(limitSets)
    .leftJoin(users, eq(users.id, limitSets.updatedBy))
    .where(eq(limitSets.pointId, pointId));
  return row;
}

/** A machine type's stored template (point_id null), if an engineer saved one. */
export async function loadTemplate(db: Db | Tx, machineType: MachineType) {
  const [set] = await db
    .select()
    .from(limitSets)
    .where(and(eq(limitSets.machineType, machineType), isNull(limitSets.pointId)));
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

export async function saveTemplate(
  tx: Tx,
  machineType: MachineType,
  list: readonly LimitBand[],
  userId: number,
): Promise<number> {
  const [existing] = await tx
    .select()
    .from(limitSets)
    .where(and(eq(limitSets.machineType, machineType), isNull(limitSets.pointId)))
    .for('update');
  let id: number;
  let version: number;
  if (existing) {
    id = existing.id;
    version = existing.version + 1;
    await tx
      .update(limitSets)
      .set({ version, updatedBy: userId, updatedAt: new Date() })
      .where(eq(limitSets.id, id));
    await tx.delete(bands).where(eq(bands.limitSetId, id));
  } else {
    const [row] = await tx
      .insert(limitSets)
      .values({
        pointId: null,
        machineType,
        name: `${machineType} template`,
        version: 1,
        updatedBy: userId,
      })
      .$returningId();
    id = row!.id;
    version = 1;
  }
  await insertBands(tx, id, list);
  return version;
}

/**
 * The point's stored history for replay: its most recent `limit` analyses (quality verdict,
 * takenAt) and their band values, oldest first.
 */
export async function pointHistory(db: Db, pointId: number, limit = 5000) {
  const rows = await db
    .select({ id: analyses.id, takenAt: analyses.takenAt, verdict: analyses.qualityVerdict })
    .from(analyses)
    .where(eq(analyses.pointId, pointId))
    .orderBy(desc(analyses.takenAt))
    .limit(limit);
  rows.reverse();
  const first = rows[0];
  const values = first
    ? await db
        .select({
          analysisId: bandValues.analysisId,
          bandKey: bandValues.bandKey,
          value: bandValues.value,
        })
        .from(bandValues)
        .where(and(eq(bandValues.pointId, pointId), gte(bandValues.takenAt, first.takenAt)))
    : [];
  return { analyses: rows, values };
}

/** One band's stored values, oldest first (for baselines). */
export async function bandTrend(db: Db, pointId: number, bandKey: string, limit = 10_000) {
  return db
    .select({
      takenAt: bandValues.takenAt,
      value: bandValues.value,
      quality: bandValues.qualityVerdict,
    })
    .from(bandValues)
    .where(and(eq(bandValues.pointId, pointId), eq(bandValues.bandKey, bandKey)))
    .orderBy(asc(bandValues.takenAt))
    .limit(limit);
}

export async function openAlertsOfBands(tx: Tx, pointId: number, bandKeys: string[]) {
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

export async function limitAudit(db: Db, pointId: number, limit = 20) {
  return db
    .select({
      id: auditLog.id,
      at: auditLog.at,
      action: auditLog.action,
      actor: users.name,
      reason: auditLog.reason,
      before: auditLog.before,
      after: auditLog.after,
    })
    .from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.actorUserId))
    .where(
      and(
        eq(auditLog.entity, 'point'),
        eq(auditLog.entityId, String(pointId)),
        like(auditLog.action, 'limits.%'),
      ),
    )
    .orderBy(desc(auditLog.at), desc(auditLog.id))
    .limit(limit);
}

export { alertEvents, alerts, pointStates };
