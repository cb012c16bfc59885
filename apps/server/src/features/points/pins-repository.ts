/** Pinned captures (capture_pins): retention keeps them whole. */
import { eq, inArray } from 'drizzle-orm';
import type { Db, Tx } from '@turnstone/db/client';
import { capturePins, users } from '@turnstone/db/schema';

/** Who pinned which of `analysisIds`, when, and why. */
export async function pinsOf(db: Db, analysisIds: number[]) {
  if (analysisIds.length === 0) return new Map<number, { by: string; at: Date; note: string }>();
  const rows = await db
    .select({
      analysisId: capturePins.analysisId,
      by: users.name,
      at: capturePins.pinnedAt,
      note: capturePins.note,
    })
    .from(capturePins)
    .innerJoin(users, eq(users.id, capturePins.pinnedBy))
    .where(inArray(capturePins.analysisId, analysisIds));
  return new Map(rows.map((r) => [r.analysisId, { by: r.by, at: r.at, note: r.note }]));
}

/** Pins (or re-notes) a capture. */
export async function pinCapture(
  db: Db | Tx,
  analysisId: number,
  userId: number,
  note: string,
  at: Date,
): Promise<void> {
  await db
    .insert(capturePins)
    .values({ analysisId, pinnedBy: userId, pinnedAt: at, note })
    .onDuplicateKeyUpdate({ set: { pinnedBy: userId, pinnedAt: at, note } });
}

/** Removes a pin; whether there was one. */
export async function unpinCapture(db: Db | Tx, analysisId: number): Promise<boolean> {
  const [r] = await db.delete(capturePins).where(eq(capturePins.analysisId, analysisId));
  return r.affectedRows > 0;
}
