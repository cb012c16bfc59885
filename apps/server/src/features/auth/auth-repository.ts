import { eq, inArray, sql } from 'drizzle-orm';
import type { Db } from '@turnstone/db/client';
import { sites, userSites, users } from '@turnstone/db/schema';

export type UserRow = typeof users.$inferSelect;

export async function findUserByEmail(db: Db, email: string): Promise<UserRow | undefined> {
  const [row] = await db.select().from(users).where(eq(users.email, email)).limit(1);
  return row;
}

export async function findUserById(db: Db, id: number): Promise<UserRow | undefined> {
  const [row] = await db.select().from(users).where(eq(users.id, id)).limit(1);
  return row;
}

/** Admins see every site; everyone else the sites they are assigned to. */
export async function siteIdsOf(db: Db, user: Pick<UserRow, 'id' | 'role'>): Promise<number[]> {
  const rows =
    user.role === 'admin'
      ? await db.select({ id: sites.id }).from(sites)
      : await db
          .select({ id: userSites.siteId })
          .from(userSites)
          .where(eq(userSites.userId, user.id));
  return rows.map((r) => r.id).sort((a, b) => a - b);
}

/** The distinct time zones of these sites. */
export async function zonesOfSites(db: Db, siteIds: number[]): Promise<string[]> {
  if (siteIds.length === 0) return [];
  const rows = await db
    .selectDistinct({ timeZone: sites.timeZone })
    .from(sites)
    .where(inArray(sites.id, siteIds));
  return rows.map((r) => r.timeZone);
}

export async function bumpTokenVersion(db: Db, userId: number): Promise<void> {
  await db
    .update(users)
    .set({ tokenVersion: sql`${users.tokenVersion} + 1` })
    .where(eq(users.id, userId));
}

export async function touchSignIn(db: Db, userId: number): Promise<void> {
  await db.update(users).set({ lastSignInAt: new Date() }).where(eq(users.id, userId));
}
