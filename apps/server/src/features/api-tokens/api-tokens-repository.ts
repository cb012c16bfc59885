import { and, desc, eq, isNull, lt, or, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/mysql-core';
import type { Db, Tx } from '@turnstone/db/client';
import { apiTokens, userSites, users } from '@turnstone/db/schema';

export type ApiTokenRow = typeof apiTokens.$inferSelect;

const issuer = alias(users, 'issuer');

/** Every token, newest first, with its service account and who issued it. */
export async function listTokens(db: Db | Tx, id?: number) {
  const rows = await db
    .select({
      token: apiTokens,
      name: users.name,
      role: users.role,
      createdByName: issuer.name,
    })
    .from(apiTokens)
    .innerJoin(users, eq(users.id, apiTokens.userId))
    .leftJoin(issuer, eq(issuer.id, apiTokens.createdBy))
    .where(id === undefined ? undefined : eq(apiTokens.id, id))
    .orderBy(desc(apiTokens.id));
  const links = await db.select().from(userSites);
  const bySite = new Map<number, number[]>();
  for (const l of links) bySite.set(l.userId, [...(bySite.get(l.userId) ?? []), l.siteId]);
  return rows.map((r) => ({
    ...r,
    siteIds: (bySite.get(r.token.userId) ?? []).sort((a, b) => a - b),
  }));
}

export async function insertServiceAccount(
  tx: Tx,
  values: { name: string; email: string; role: (typeof users.$inferInsert)['role'] },
): Promise<number> {
  const [row] = await tx
    .insert(users)
    .values({ ...values, kind: 'service', passwordHash: null })
    .$returningId();
  return row!.id;
}

export async function insertToken(
  tx: Tx,
  values: Pick<typeof apiTokens.$inferInsert, 'userId' | 'tokenPrefix' | 'tokenHash' | 'createdBy'>,
): Promise<number> {
  const [row] = await tx.insert(apiTokens).values(values).$returningId();
  return row!.id;
}

/** The live token with this hash and its service account (null when revoked or unknown). */
export async function findLiveToken(db: Db, tokenHash: string) {
  const [row] = await db
    .select({ token: apiTokens, user: users })
    .from(apiTokens)
    .innerJoin(users, eq(users.id, apiTokens.userId))
    .where(
      and(
        eq(apiTokens.tokenHash, tokenHash),
        isNull(apiTokens.revokedAt),
        isNull(users.disabledAt),
      ),
    )
    .limit(1);
  return row ?? null;
}

/** Records use, at most once a minute per token (a busy integration is not a write per call). */
export async function touchLastUsed(db: Db, id: number): Promise<void> {
  await db
    .update(apiTokens)
    .set({ lastUsedAt: sql`CURRENT_TIMESTAMP(3)` })
    .where(
      and(
        eq(apiTokens.id, id),
        or(
          isNull(apiTokens.lastUsedAt),
          lt(apiTokens.lastUsedAt, sql`CURRENT_TIMESTAMP(3) - INTERVAL 1 MINUTE`),
        ),
      ),
    );
}

export async function lockToken(tx: Tx, id: number): Promise<ApiTokenRow | undefined> {
  const [row] = await tx.select().from(apiTokens).where(eq(apiTokens.id, id)).for('update');
  return row;
}

/** Revokes the token and disables its service account, in the caller's transaction. */
export async function revokeToken(tx: Tx, token: ApiTokenRow): Promise<void> {
  await tx
    .update(apiTokens)
    .set({ revokedAt: sql`CURRENT_TIMESTAMP(3)` })
    .where(and(eq(apiTokens.id, token.id), isNull(apiTokens.revokedAt)));
  await tx
    .update(users)
    .set({
      disabledAt: sql`COALESCE(${users.disabledAt}, CURRENT_TIMESTAMP(3))`,
      tokenVersion: sql`${users.tokenVersion} + 1`,
    })
    .where(eq(users.id, token.userId));
}
