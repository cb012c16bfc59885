import { and, eq, inArray, isNull, type SQL } from 'drizzle-orm';
import type { Tx } from '@turnstone/db/client';
import { qualityNotices } from '@turnstone/db/schema';

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
