/**
 * API tokens for service accounts. Issuing creates the service account (a `users` row of
 * kind `service`: no password, no mail) with the role and sites the token acts with, and the
 * token: 32 random bytes, base64url, behind a recognisable prefix; only its SHA-256 is kept
 * (a token of that entropy needs no slow hash). A request with `Authorization: Bearer` is
 * that account; a person signing out (which ends that person's sessions) ends nothing here.
 * Revoking ends the token and disables its account at once.
 */
import { createHash, randomBytes } from 'node:crypto';
import type { ApiToken, IssueApiToken, IssuedApiToken } from '@turnstone/contracts/api-tokens';
import type { AppContext } from '../../lib/context.ts';
import { AppError, notFound } from '../../lib/app-error.ts';
import type { SessionUser } from '../../lib/session-user.ts';
import { auditAction } from '../audit/audit-repository.ts';
import { checkSites } from '../users/users-service.ts';
import { sessionUserOf } from '../auth/auth-service.ts';
import * as usersRepo from '../users/users-repository.ts';
import * as repo from './api-tokens-repository.ts';

export const TOKEN_PREFIX = 'tst_';
const iso = (d: Date | null) => d?.toISOString() ?? null;
export const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

function toApiToken(r: Awaited<ReturnType<typeof repo.listTokens>>[number]): ApiToken {
  return {
    id: r.token.id,
    userId: r.token.userId,
    name: r.name,
    role: r.role,
    siteIds: r.siteIds,
    tokenPrefix: r.token.tokenPrefix,
    createdBy: r.createdByName ?? null,
    createdAt: r.token.createdAt.toISOString(),
    lastUsedAt: iso(r.token.lastUsedAt),
    revokedAt: iso(r.token.revokedAt),
  };
}

export async function listTokens(ctx: AppContext): Promise<{ items: ApiToken[] }> {
  return { items: (await repo.listTokens(ctx.db)).map(toApiToken) };
}

async function loadOne(ctx: AppContext, id: number): Promise<ApiToken> {
  const [row] = await repo.listTokens(ctx.db, id);
  if (!row) throw notFound('API token');
  return toApiToken(row);
}

export async function issueToken(
  ctx: AppContext,
  actor: SessionUser,
  input: IssueApiToken,
): Promise<IssuedApiToken> {
  const siteIds = await checkSites(ctx.db, input.siteIds);
  if (input.role !== 'admin' && siteIds.length === 0)
    throw new AppError('validation_failed', 'Give the token at least one site.', 400, [
      { path: ['siteIds'], message: 'Choose the sites the integration may read and change.' },
    ]);
  const token = `${TOKEN_PREFIX}${randomBytes(32).toString('base64url')}`;
  const tokenPrefix = token.slice(0, 12);
  const id = await ctx.db.transaction(async (tx) => {
    // A unique address the account can never receive mail at (RFC 2606 reserves .invalid).
    const email = `service-${randomBytes(6).toString('hex')}@api-token.invalid`;
    const userId = await repo.insertServiceAccount(tx, {
      name: input.name,
      email,
      role: input.role,
    });
    await usersRepo.setSites(tx, userId, input.role === 'admin' ? [] : siteIds);
    const tokenId = await repo.insertToken(tx, {
      userId,
      tokenPrefix,
      tokenHash: hashToken(token),
      createdBy: actor.id,
    });
    await auditAction(tx, actor, 'api-token.issue', tokenId, {
      after: { name: input.name, role: input.role, siteIds, tokenPrefix, userId },
    });
    return tokenId;
  });
  return { ...(await loadOne(ctx, id)), token };
}

export async function revokeToken(
  ctx: AppContext,
  actor: SessionUser,
  id: number,
): Promise<ApiToken> {
  await ctx.db.transaction(async (tx) => {
    const token = await repo.lockToken(tx, id);
    if (!token) throw notFound('API token');
    if (token.revokedAt) return;
    await repo.revokeToken(tx, token);
    await auditAction(tx, actor, 'api-token.revoke', id, {
      before: { tokenPrefix: token.tokenPrefix, revokedAt: null },
      after: { tokenPrefix: token.tokenPrefix, revoked: true },
    });
  });
  return loadOne(ctx, id);
}

/** The service account behind a bearer token, or null when the token is unknown or revoked. */
export async function userFromApiToken(
  ctx: AppContext,
  token: string,
): Promise<SessionUser | null> {
  if (!token.startsWith(TOKEN_PREFIX) || token.length > 200) return null;
  const row = await repo.findLiveToken(ctx.db, hashToken(token));
  if (!row) return null;
  await repo.touchLastUsed(ctx.db, row.token.id);
  return sessionUserOf(ctx.db, row.user);
}
