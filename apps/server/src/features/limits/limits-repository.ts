import { and, asc, desc, eq, gte, inArray, lte } from 'drizzle-orm';
import type { Db } from '@turnstone/db/client';
import { analyses, auditLog, bandValues, limitSets, users } from '@turnstone/db/schema';

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
  // The band values of exactly these analyses: ranges of band_values_analysis_band_uq
  // (analysis_id first), a thousand analyses a query; the time bound leaves out the
  // partitions before the first.
  const values: { analysisId: number; bandKey: string; value: number }[] = [];
  for (let i = 0; i < rows.length; i += 1000)
    values.push(
      ...(await db
        .select({
          analysisId: bandValues.analysisId,
          bandKey: bandValues.bandKey,
          value: bandValues.value,
        })
        .from(bandValues)
        .where(
          and(
            eq(bandValues.pointId, pointId),
            gte(bandValues.takenAt, rows[0]!.takenAt),
            inArray(
              bandValues.analysisId,
              rows.slice(i, i + 1000).map((r) => r.id),
            ),
          ),
        )),
    );
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

/** Audit actions that change a point's limit set (limits-service, baseline-service). */
const LIMIT_CHANGE_ACTIONS = ['limits.update', 'limits.baseline'] as const;

/** The point's limit-set changes in the audit record: who, why, the bands before and after. */
function limitChanges(db: Db, pointId: number, period?: { from: Date; to: Date }) {
  return db
    .select({
      id: auditLog.id,
      at: auditLog.at,
      action: auditLog.action,
      by: users.name,
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
        inArray(auditLog.action, [...LIMIT_CHANGE_ACTIONS]),
        period && gte(auditLog.at, period.from),
        period && lte(auditLog.at, period.to),
      ),
    );
}

/** The latest `limit` changes, newest first (the limits history). */
export async function limitAudit(db: Db, pointId: number, limit = 20) {
  return limitChanges(db, pointId).orderBy(desc(auditLog.at), desc(auditLog.id)).limit(limit);
}

/** The changes in a period in time order, at most `cap` of them (the newest kept). */
export async function limitChangesIn(db: Db, pointId: number, from: Date, to: Date, cap: number) {
  const rows = await limitChanges(db, pointId, { from, to }).orderBy(
    asc(auditLog.at),
    asc(auditLog.id),
  );
  return rows.slice(-cap);
}
