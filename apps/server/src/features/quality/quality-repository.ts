import { and, desc, eq, inArray, isNull, type SQL } from 'drizzle-orm';
import type { Db, Tx } from '@turnstone/db/client';
import { qualityNotices, users } from '@turnstone/db/schema';

/** A point's notices, newest capture first, with the name of whoever reviewed each. */
export async function noticesOfPoint(db: Db, pointId: number, limit: number) {
  return db
    .select({ notice: qualityNotices, reviewerName: users.name })
    .from(qualityNotices)
    .leftJoin(users, eq(users.id, qualityNotices.reviewedBy))
    .where(eq(qualityNotices.pointId, pointId))
    .orderBy(desc(qualityNotices.takenAt), desc(qualityNotices.id))
    .limit(limit);
}

/** The point's unreviewed notices (all, or those of `ids`), locked for the update. */
export async function lockUnreviewed(tx: Tx, pointId: number, ids?: number[]) {
  const where: SQL[] = [eq(qualityNotices.pointId, pointId), isNull(qualityNotices.reviewedAt)];
  if (ids) where.push(inArray(qualityNotices.id, ids));
  return tx
    .select({ id: qualityNotices.id, takenAt: qualityNotices.takenAt })
    .from(qualityNotices)
    .where(and(...where))
    .for('update');
}

export async function markReviewed(tx: Tx, ids: number[], userId: number, at: Date) {
  if (ids.length === 0) return;
  await tx
    .update(qualityNotices)
    .set({ reviewedBy: userId, reviewedAt: at })
    .where(inArray(qualityNotices.id, ids));
}
