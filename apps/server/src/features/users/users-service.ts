/**
 * Users admin (invite, edit role/sites/name, disable/enable) and the public link flows
 * (accept an invite, forgot / reset password). Every admin change is audited.
 */

import type { Db } from '@turnstone/db/client';

import type { InviteUser, UpdateUser, UserSummary } from '@turnstone/contracts/users';
import type { AppContext } from '../../lib/context.ts';
import { AppError, notFound } from '../../lib/app-error.ts';
import type { SessionUser } from '../../lib/session-user.ts';
import { auditAction, writeAudit } from '../audit/audit-repository.ts';
import { hashPassword } from '../../lib/passwords.ts';
import { enqueueMail } from '../mail/outbox-repository.ts';
import { mailBaseUrl } from '../mail/mail-links.ts';
import * as repo from './users-repository.ts';
import {
  dropSubscriptionsOutside,
  subscribeToSiteAlerts,
} from '../mail/subscriptions-repository.ts';
import {
  consumeToken,
  findUsableToken,
  issueToken,
  type TokenPurpose,
} from './user-tokens-repository.ts';
import { renderInvite, renderReset } from './user-mail.ts';

const iso = (d: Date | null) => d?.toISOString() ?? null;

function summary(u: repo.UserRow & { siteIds: number[] }): UserSummary {
  return {
    id: u.id,
    email: u.email,
    name: u.name,
    role: u.role,
    siteIds: u.siteIds,
    invitePending: u.passwordHash === null,
    disabledAt: iso(u.disabledAt),
    lastSignInAt: iso(u.lastSignInAt),
    createdAt: u.createdAt.toISOString(),
  };
}

export async function listUsers(db: Db) {
  const [rows, sites] = await Promise.all([repo.listUsers(db), repo.listSites(db)]);
  return { items: rows.map(summary), sites };
}

/** The given site ids, each checked to exist (400 naming the unknown ones), sorted. */
export async function checkSites(db: Db, ids: number[]) {
  const unique = [...new Set(ids)];
  const known = await repo.existingSiteIds(db, unique);
  const unknown = unique.filter((id) => !known.includes(id));
  if (unknown.length)
    throw new AppError('validation_failed', 'Unknown site.', 400, [
      { path: ['siteIds'], message: `Unknown site id ${unknown.join(', ')}.` },
    ]);
  return unique.sort((a, b) => a - b);
}

async function loadSummary(db: Db, id: number) {
  const u = await repo.findUser(db, id);
  if (!u) throw notFound('User');
  return summary({ ...u, siteIds: await repo.assignedSites(db, id) });
}

export async function inviteUser(ctx: AppContext, actor: SessionUser, input: InviteUser) {
  const siteIds = await checkSites(ctx.db, input.siteIds);
  const dup = await repo.findUserByEmail(ctx.db, input.email);
  if (dup)
    throw new AppError('email_taken', 'A user with this e-mail address exists.', 409, [
      { path: ['email'], message: 'A user with this e-mail address exists.' },
    ]);
  const base = await mailBaseUrl(ctx);
  const id = await ctx.db.transaction(async (tx) => {
    const userId = await repo.insertUser(tx, {
      email: input.email,
      name: input.name,
      role: input.role,
      passwordHash: null,
    });
    await repo.setSites(tx, userId, siteIds);
    // Operators hear of their sites' alerts unless they choose otherwise (Account screen).
    if (input.role === 'operator') await subscribeToSiteAlerts(tx, userId, siteIds);
    const token = await issueToken(tx, userId, 'invite');
    await enqueueMail(tx, {
      kind: 'invite',
      dedupeKey: `invite:${userId}:${Date.now()}`,
      to: input.email,
      ...renderInvite(input.name, actor.name, `${base}/accept-invite#token=${token}`),
    });
    await auditAction(tx, actor, 'user.invite', userId, {
      after: { email: input.email, name: input.name, role: input.role, siteIds },
    });
    return userId;
  });
  return loadSummary(ctx.db, id);
}

export async function updateUser(
  ctx: AppContext,
  actor: SessionUser,
  id: number,
  input: UpdateUser,
) {
  const before = await loadSummary(ctx.db, id);
  if (id === actor.id && input.role && input.role !== before.role)
    throw new AppError('own_role', 'You cannot change your own role.', 400);
  const siteIds = input.siteIds ? await checkSites(ctx.db, input.siteIds) : undefined;
  await ctx.db.transaction(async (tx) => {
    await repo.updateProfile(tx, id, {
      ...(input.role ? { role: input.role } : {}),
      ...(input.name ? { name: input.name } : {}),
    });
    if (siteIds) {
      await repo.setSites(tx, id, siteIds);
      await dropSubscriptionsOutside(tx, id, siteIds);
    }
    // An operator given sites (or a user made operator) hears of their alerts by default.
    const role = input.role ?? before.role;
    if (role === 'operator') {
      const now = siteIds ?? before.siteIds;
      const added =
        before.role === 'operator' ? now.filter((s) => !before.siteIds.includes(s)) : now;
      await subscribeToSiteAlerts(tx, id, added);
    }
    await auditAction(tx, actor, 'user.update', id, {
      before: { role: before.role, name: before.name, siteIds: before.siteIds },
      after: {
        role: input.role ?? before.role,
        name: input.name ?? before.name,
        siteIds: siteIds ?? before.siteIds,
      },
    });
  });
  // Sessions read role and sites from the database on every request: no re-sign-in needed.
  return loadSummary(ctx.db, id);
}

export async function setDisabled(
  ctx: AppContext,
  actor: SessionUser,
  id: number,
  disabled: boolean,
) {
  const before = await loadSummary(ctx.db, id);
  if (id === actor.id && disabled)
    throw new AppError('own_account', 'You cannot disable your own account.', 400);
  await ctx.db.transaction(async (tx) => {
    await repo.setDisabled(tx, id, disabled);
    await writeAudit(tx, {
      actorUserId: actor.id,
      action: disabled ? 'user.disable' : 'user.enable',
      entity: 'user',
      entityId: id,
      before: { disabledAt: before.disabledAt },
      after: { disabled },
    });
  });
  return loadSummary(ctx.db, id);
}

const badLink = () =>
  new AppError(
    'link_invalid',
    'This link has expired or was used already. Ask for a new one.',
    400,
  );

/**
 * Sets a password from a single-use link (invite or reset); every session of the user ends.
 * The link is checked before any hashing, so an unknown, used or expired token costs one
 * indexed read and no bcrypt; the hash runs off the event loop, then one transaction uses
 * the token (a conditional UPDATE: two concurrent uses succeed at most once) and stores it.
 * Using the token only after hashing means a refused hash (pool full) does not burn the link.
 */
async function setPasswordFromLink(
  ctx: AppContext,
  token: string,
  password: string,
  purpose: TokenPurpose,
) {
  const pending = await findUsableToken(ctx.db, token, purpose);
  if (pending === null) throw badLink();
  const hash = await hashPassword(password);
  await ctx.db.transaction(async (tx) => {
    const userId = await consumeToken(tx, token, purpose);
    if (userId === null) throw badLink();
    const u = await repo.findUser(tx, userId);
    if (!u || u.disabledAt) throw badLink();
    await repo.setPasswordHash(tx, userId, hash);
    await writeAudit(tx, {
      actorUserId: userId,
      action: purpose === 'invite' ? 'user.accept-invite' : 'user.reset-password',
      entity: 'user',
      entityId: userId,
    });
  });
}

/** Sets the password of an invited user; the link works once. */
export const acceptInvite = (ctx: AppContext, token: string, password: string) =>
  setPasswordFromLink(ctx, token, password, 'invite');

/**
 * Queues a reset link when the address belongs to an active user; does nothing otherwise.
 * The route answers 202 before this finishes, so the answer's timing says nothing either.
 */
export async function requestPasswordReset(ctx: AppContext, email: string) {
  const u = await repo.findUserByEmail(ctx.db, email);
  if (!u || u.disabledAt) return;
  const base = await mailBaseUrl(ctx);
  await ctx.db.transaction(async (tx) => {
    const token = await issueToken(tx, u.id, 'reset');
    await enqueueMail(tx, {
      kind: 'reset',
      dedupeKey: `reset:${u.id}:${Date.now()}`,
      to: u.email,
      ...renderReset(u.name, `${base}/reset-password#token=${token}`),
    });
  });
}

/** Sets a new password from a reset link; every session of the user ends. */
export const resetPassword = (ctx: AppContext, token: string, password: string) =>
  setPasswordFromLink(ctx, token, password, 'reset');

/**
 * An administrator created from the command line (`npm run admin -- create`), the way into
 * an install without demo accounts; or, with `resetIfExists`, a new password for an existing
 * administrator who is locked out. Audited with no acting user (the machine's operator).
 */
export async function createAdministrator(
  db: Db,
  input: { email: string; name: string; password: string; resetIfExists?: boolean },
): Promise<{ id: number; created: boolean }> {
  const passwordHash = await hashPassword(input.password);
  return db.transaction(async (tx) => {
    const existing = await repo.findUserByEmail(tx, input.email, { forUpdate: true });
    if (existing) {
      if (!input.resetIfExists)
        throw new AppError('email_taken', `A user with the e-mail ${input.email} exists.`, 409);
      if (existing.role !== 'admin')
        throw new AppError(
          'not_admin',
          `${input.email} is not an administrator; change roles on the Users screen.`,
          409,
        );
      await repo.setPasswordHash(tx, existing.id, passwordHash, { enable: true });
      await writeAudit(tx, {
        actorUserId: null,
        action: 'user.password_set_by_cli',
        entity: 'user',
        entityId: existing.id,
      });
      return { id: existing.id, created: false };
    }
    const id = await repo.insertUser(tx, {
      email: input.email,
      name: input.name,
      role: 'admin',
      passwordHash,
    });
    await writeAudit(tx, {
      actorUserId: null,
      action: 'user.create_by_cli',
      entity: 'user',
      entityId: id,
      after: { email: input.email, name: input.name, role: 'admin' },
    });
    return { id, created: true };
  });
}
