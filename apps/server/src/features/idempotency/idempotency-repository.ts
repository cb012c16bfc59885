import { and, eq, lt, sql } from 'drizzle-orm';
import type { Db } from '@turnstone/db/client';
import { idempotencyKeys } from '@turnstone/db/schema';
import { isDuplicateKey } from '@turnstone/db/errors';

export type IdempotencyRow = typeof idempotencyKeys.$inferSelect;

/**
 * Claims (user, key) for a request with this hash: the new row's id, or the row already
 * there (a live one: an expired row is removed and the claim made again).
 */
export async function claimKey(
  db: Db,
  userId: number,
  idemKey: string,
  requestHash: string,
  ttlS: number,
): Promise<{ claimed: number } | { existing: IdempotencyRow }> {
  for (let round = 0; round < 2; round++) {
    try {
      const [row] = await db
        .insert(idempotencyKeys)
        .values({
          userId,
          idemKey,
          requestHash,
          expiresAt: sql`CURRENT_TIMESTAMP(3) + INTERVAL ${ttlS} SECOND`,
        })
        .$returningId();
      return { claimed: row!.id };
    } catch (err) {
      if (!isDuplicateKey(err)) throw err;
    }
    const [existing] = await db
      .select()
      .from(idempotencyKeys)
      .where(and(eq(idempotencyKeys.userId, userId), eq(idempotencyKeys.idemKey, idemKey)));
    if (!existing) continue; // expired and purged meanwhile
    if (existing.expiresAt.getTime() > Date.now()) return { existing };
    await db
      .delete(idempotencyKeys)
      .where(
        and(
          eq(idempotencyKeys.id, existing.id),
          lt(idempotencyKeys.expiresAt, sql`CURRENT_TIMESTAMP(3)`),
        ),
      );
  }
  throw new Error('idempotency key could not be claimed');
}

export async function completeKey(db: Db, id: number, status: number, body: string | null) {
  await db
    .update(idempotencyKeys)
    .set({ status, responseBody: body })
    .where(eq(idempotencyKeys.id, id));
}

/** The request failed: nothing was created, so the key is free for the retry. */
export async function releaseKey(db: Db, id: number) {
  await db.delete(idempotencyKeys).where(eq(idempotencyKeys.id, id));
}

/** Removes expired keys, a bounded batch at a time. */
export async function purgeExpired(db: Db, limit = 500): Promise<number> {
  const [res] = await db
    .delete(idempotencyKeys)
    .where(lt(idempotencyKeys.expiresAt, sql`CURRENT_TIMESTAMP(3)`))
    .limit(limit);
  return res.affectedRows;
}
