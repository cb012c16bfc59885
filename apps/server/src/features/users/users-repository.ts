import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import type { Db, Tx } from '@turnstone/db/client';
import { sites, userSites, users } from '@turnstone/db/schema';

export type UserRow = typeof users.$inferSelect;

/** People only: service accounts are the API tokens screen's (features/api-tokens). */
const person = eq(users.kind, 'person');

export async function listUsers(db: Db) {
  const rows = await db.select().from(users).where(person).orderBy(asc(users.name));
  const links = await db.select().from(userSites);
  const bySite = new Map<number, number[]>();
  for (const l of links) bySite.set(l.userId, [...(bySite.get(l.userId) ?? []), l.siteId]);
  return rows.map((u) => ({ ...u, siteIds: (bySite.get(u.id) ?? []).sort((a, b) => a - b) }));
}

export async function listSites(db: Db) {
  return db
    .select({ id: sites.id, code: sites.code, name: sites.name })
    .from(sites)
    .orderBy(asc(sites.code));
}

export async function existingSiteIds(db: Db | Tx, ids: number[]): Promise<number[]> {
  if (ids.length === 0) return [];
  const rows = await db.select({ id: sites.id }).from(sites).where(inArray(sites.id, ids));
  return rows.map((r) => r.id);
}

export async function findUser(db: Db | Tx, id: number) {
  const [u] = await db
    .select()
    .from(users)
    .where(and(eq(users.id, id), person))
    .limit(1);
  return u;
}

export async function assignedSites(db: Db | Tx, id: number): Promise<number[]> {
  const rows = await db
    .select({ id: userSites.siteId })
    .from(userSites)
    .where(eq(userSites.userId, id));
  return rows.map((r) => r.id).sort((a, b) => a - b);
}

export async function setSites(tx: Tx, userId: number, siteIds: number[]) {
  await tx.delete(userSites).where(eq(userSites.userId, userId));
  if (siteIds.length)
    await tx.insert(userSites).values(siteIds.map((siteId) => ({ userId, siteId })));
}

export async function findUserByEmail(
  db: Db | Tx,
  email: string,
  opts: { forUpdate?: boolean } = {},
) {
  const q = db
    .select()
    .from(users)
    .where(and(eq(users.email, email), person))
    .limit(1);
  const [u] = opts.forUpdate ? await q.for('update') : await q;
  return u;
}

export type NewUser = Pick<typeof users.$inferInsert, 'email' | 'name' | 'role' | 'passwordHash'>;

export async function insertUser(tx: Tx, values: NewUser): Promise<number> {
  const [row] = await tx.insert(users).values(values).$returningId();
  return row!.id;
}

export async function updateProfile(
  tx: Tx,
  id: number,
  set: { role?: UserRow['role']; name?: string },
) {
  if (set.role === undefined && set.name === undefined) return;
  await tx.update(users).set(set).where(eq(users.id, id));
}

/**
 * A new password hash; bumping token_version ends every session of the user at once (OWASP
 * ASVS 5.0 7.4). With `enable`, a disabled account is enabled again (the CLI's reset).
 */
export async function setPasswordHash(
  tx: Tx,
  id: number,
  passwordHash: string,
  opts: { enable?: boolean } = {},
) {
  await tx
    .update(users)
    .set({
      passwordHash,
      tokenVersion: sql`${users.tokenVersion} + 1`,
      ...(opts.enable ? { disabledAt: null } : {}),
    })
    .where(eq(users.id, id));
}

/** Disabling also bumps token_version, which ends every session at once (OWASP ASVS 5.0 7.4). */
export async function setDisabled(tx: Tx, id: number, disabled: boolean) {
  await tx
    .update(users)
    .set(
      disabled
        ? {
            disabledAt: sql`COALESCE(${users.disabledAt}, CURRENT_TIMESTAMP(3))`,
            tokenVersion: sql`${users.tokenVersion} + 1`,
          }
        : { disabledAt: null },
    )
    .where(eq(users.id, id));
}
