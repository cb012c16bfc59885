/**
 * Single-use links for invites (72 h) and password resets (1 h). The link carries 32
 * random bytes; only their SHA-256 is stored, so a copy of the database opens no account.
 * The token travels in the URL fragment (`#token=`), which browsers never send to a
 * server or in a Referer header.
 */
import { createHash, randomBytes } from 'node:crypto';
import { and, eq, gt, isNull } from 'drizzle-orm';
import type { Db, Tx } from '@turnstone/db/client';
import { userTokens } from '@turnstone/db/schema';

export const TOKEN_HOURS = { invite: 72, reset: 1 } as const;
export type TokenPurpose = keyof typeof TOKEN_HOURS;

export const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

/** Issues a new link token; earlier unused tokens of the same purpose stop working. */
export async function issueToken(tx: Tx, userId: number, purpose: TokenPurpose): Promise<string> {
  const token = randomBytes(32).toString('base64url');
  await tx
    .update(userTokens)
    .set({ usedAt: new Date() })
    .where(
      and(
        eq(userTokens.userId, userId),
        eq(userTokens.purpose, purpose),
        isNull(userTokens.usedAt),
      ),
    );
  await tx.insert(userTokens).values({
    userId,
    purpose,
    tokenHash: hashToken(token),
    expiresAt: new Date(Date.now() + TOKEN_HOURS[purpose] * 3600_000),
  });
  return token;
}

/**
 * The user of a token that could be used now (known, of this purpose, unused, not expired),
 * or null; reads only, so a caller can refuse a bad link before doing any costly work.
 */
export async function findUsableToken(
  db: Db | Tx,
  token: string,
  purpose: TokenPurpose,
): Promise<number | null> {
  const [row] = await db
    .select({ userId: userTokens.userId })
    .from(userTokens)
    .where(
      and(
        eq(userTokens.tokenHash, hashToken(token)),
        eq(userTokens.purpose, purpose),
        isNull(userTokens.usedAt),
        gt(userTokens.expiresAt, new Date()),
      ),
    )
    .limit(1);
  return row?.userId ?? null;
}

/**
 * Uses a token once: marks it used inside the caller's transaction and returns its user,
 * or null when it is unknown, expired, used or of another purpose. The conditional
 * UPDATE makes two concurrent uses of one link succeed at most once.
 */
export async function consumeToken(
  tx: Tx,
  token: string,
  purpose: TokenPurpose,
): Promise<number | null> {
  const hash = hashToken(token);
  const [row] = await tx
    .select({ id: userTokens.id, userId: userTokens.userId })
    .from(userTokens)
    .where(eq(userTokens.tokenHash, hash))
    .limit(1);
  if (!row) return null;
  const [res] = await tx
    .update(userTokens)
    .set({ usedAt: new Date() })
    .where(
      and(
        eq(userTokens.id, row.id),
        eq(userTokens.purpose, purpose),
        isNull(userTokens.usedAt),
        gt(userTokens.expiresAt, new Date()),
      ),
    );
  return res.affectedRows === 1 ? row.userId : null;
}
