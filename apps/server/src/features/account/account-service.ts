/** The signed-in user's own account: password change and notification settings. */

import type {
  ChangePassword,
  Preferences,
  SubscriptionSettings,
} from '@turnstone/contracts/account';
import type { AppContext } from '../../lib/context.ts';
import { AppError } from '../../lib/app-error.ts';
import type { SessionUser } from '../../lib/session-user.ts';
import { auditAction } from '../audit/audit-repository.ts';
import * as userRepo from '../users/users-repository.ts';
import * as repo from './account-repository.ts';
import * as subscriptionsRepo from '../mail/subscriptions-repository.ts';
import { hashPassword, verifyPassword } from '../../lib/passwords.ts';

/** Checks the current password, sets the new one and returns the new token version. */
export async function changePassword(
  ctx: AppContext,
  user: SessionUser,
  input: ChangePassword,
): Promise<number> {
  const row = await userRepo.findUser(ctx.db, user.id);
  if (!row?.passwordHash || !(await verifyPassword(input.currentPassword, row.passwordHash)))
    throw new AppError('invalid_credentials', 'The current password is not correct.', 400, [
      { path: ['currentPassword'], message: 'The current password is not correct.' },
    ]);
  const hash = await hashPassword(input.newPassword);
  const version = row.tokenVersion + 1;
  await ctx.db.transaction(async (tx) => {
    // A new token version ends every other session; the caller gets a fresh cookie.
    await userRepo.setPasswordHash(tx, user.id, hash);
    await auditAction(tx, user, 'user.change-password', user.id);
  });
  return version;
}

async function options(ctx: AppContext, user: SessionUser) {
  const siteRows = await repo.sitesOf(ctx.db, user.siteIds);
  const machineRows = await repo.machinesOfSites(
    ctx.db,
    siteRows.map((s) => s.id),
  );
  return { sites: siteRows, machines: machineRows };
}

export async function getSubscriptions(ctx: AppContext, user: SessionUser) {
  const rows = await subscriptionsRepo.subscriptionsOf(ctx.db, user.id);
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
  const rows: subscriptionsRepo.SubscriptionRow[] = input.items.map((s) => ({
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
  await subscriptionsRepo.replaceSubscriptions(ctx.db, user.id, rows);
  return getSubscriptions(ctx, user);
}

/** Stores the user's unit system; their screens, CSV exports and e-mails follow it. */
export async function putPreferences(
  ctx: AppContext,
  user: SessionUser,
  input: Preferences,
): Promise<Preferences> {
  await repo.setUnitSystem(ctx.db, user.id, input.unitSystem);
  return { unitSystem: input.unitSystem };
}
