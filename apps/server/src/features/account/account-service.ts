/** The signed-in user's own account: password change and notification settings. */
import { asc, eq, inArray } from 'drizzle-orm';
import { areas, machines, sites, subscriptions, users } from '@turnstone/db/schema';
import type { ChangePassword, SubscriptionSettings } from '@turnstone/contracts/account';
import type { AppContext } from '../../lib/context.ts';
import { AppError } from '../../lib/app-error.ts';
import type { SessionUser } from '../../lib/session-user.ts';
import { writeAudit } from '../audit/audit-repository.ts';
import { hashPassword, verifyPassword } from '../../lib/passwords.ts';

/** Checks the current password, sets the new one and returns the new token version. */
export async function changePassword(
  ctx: AppContext,
  user: SessionUser,
  input: ChangePassword,
): Promise<number> {
  const [row] = await ctx.db.select().from(users).where(eq(users.id, user.id)).limit(1);
  if (!row?.passwordHash || !(await verifyPassword(input.currentPassword, row.passwordHash)))
    throw new AppError('invalid_credentials', 'The current password is not correct.', 400, [
      { path: ['currentPassword'], message: 'The current password is not correct.' },
    ]);
  const hash = await hashPassword(input.newPassword);
  const version = row.tokenVersion + 1;
  await ctx.db.transaction(async (tx) => {
    // A new token version ends every other session; the caller gets a fresh cookie.
    await tx
      .update(users)
      .set({ passwordHash: hash, tokenVersion: version })
      .where(eq(users.id, user.id));
    await writeAudit(tx, {
      actorUserId: user.id,
      action: 'user.change-password',
      entity: 'user',
      entityId: user.id,
    });
  });
  return version;
}

async function options(ctx: AppContext, user: SessionUser) {
  const siteRows = await ctx.db
    .select({ id: sites.id, code: sites.code, name: sites.name })
    .from(sites)
    .where(inArray(sites.id, user.siteIds.length ? user.siteIds : [-1]))
    .orderBy(asc(sites.code));
  const machineRows = siteRows.length
    ? await ctx.db
        .select({ id: machines.id, siteId: areas.siteId, name: machines.name })
        .from(machines)
        .innerJoin(areas, eq(areas.id, machines.areaId))
        .where(
          inArray(
            areas.siteId,
            siteRows.map((s) => s.id),
          ),
        )
        .orderBy(asc(machines.name))
    : [];
  return { sites: siteRows, machines: machineRows };
}

export async function getSubscriptions(ctx: AppContext, user: SessionUser) {
  const rows = await ctx.db
    .select()
    .from(subscriptions)
    .where(eq(subscriptions.userId, user.id))
    .orderBy(asc(subscriptions.id));
  return {
    items: rows
      .filter((r) => r.siteId !== null || r.machineId !== null)
      .map((r) => ({
        siteId: r.siteId,
        machineId: r.machineId,
        minLevel: r.minLevel,
        cadence: r.cadence,
      })),
    weeklyDigest: rows.some((r) => r.weeklyDigest),
    options: await options(ctx, user),
  };
}

/** Replaces the user's settings; scopes must be sites (or machines of sites) they can see. */
export async function putSubscriptions(
  ctx: AppContext,
  user: SessionUser,
  input: SubscriptionSettings,
) {
  const allowed = await options(ctx, user);
  const siteOk = new Set(allowed.sites.map((s) => s.id));
  const machineOk = new Set(allowed.machines.map((m) => m.id));
  input.items.forEach((s, i) => {
    const ok = s.siteId !== null ? siteOk.has(s.siteId) : machineOk.has(s.machineId!);
    if (!ok)
      throw new AppError('validation_failed', 'Not one of your sites or machines.', 400, [
        { path: ['items', i], message: 'Not one of your sites or machines.' },
      ]);
  });
  await ctx.db.transaction(async (tx) => {
    await tx.delete(subscriptions).where(eq(subscriptions.userId, user.id));
    const rows = input.items.map((s) => ({
      userId: user.id,
      siteId: s.siteId,
      machineId: s.machineId,
      minLevel: s.minLevel,
      cadence: s.cadence,
      weeklyDigest: input.weeklyDigest,
    }));
    // The digest alone is a row without scope.
    if (rows.length === 0 && input.weeklyDigest)
      rows.push({
        userId: user.id,
        siteId: null,
        machineId: null,
        minLevel: 'alert',
        cadence: 'immediate',
        weeklyDigest: true,
      });
    if (rows.length) await tx.insert(subscriptions).values(rows);
  });
  return getSubscriptions(ctx, user);
}
