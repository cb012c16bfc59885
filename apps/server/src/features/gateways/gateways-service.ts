import type { Db } from '@turnstone/db/client';
import { createGatewaySchema, type CreateGatewayInput } from '@turnstone/contracts/gateways';

import { AppError, notFound } from '../../lib/app-error.ts';
import type { SessionUser } from '../../lib/session-user.ts';
import { auditAction } from '../audit/audit-repository.ts';
import { newGatewayKey } from '../../lib/gateway-keys.ts';
import * as repo from './gateways-repository.ts';
import { forgetGatewayKeys } from '../ingest/ingest-service.ts';

export { createGatewaySchema };

type SiteNames = { siteName: string; siteCode: string };
const publicView = (g: repo.GatewayRow, site: SiteNames, postsLastHour = 0) => ({
  id: g.id,
  siteId: g.siteId,
  siteName: site.siteName,
  siteCode: site.siteCode,
  name: g.name,
  keyPrefix: g.keyPrefix,
  revokedAt: g.revokedAt?.toISOString() ?? null,
  lastSeenAt: g.lastSeenAt?.toISOString() ?? null,
  postsLastHour,
  createdAt: g.createdAt.toISOString(),
});

export async function listGateways(db: Db, user: SessionUser) {
  const rows = await repo.gatewaysOfSites(db, user.siteIds);
  const posts = await repo.postCountsSince(
    db,
    rows.map((r) => r.g.id),
    new Date(Date.now() - 3600_000),
  );
  return { items: rows.map((r) => publicView(r.g, r, posts.get(r.g.id) ?? 0)) };
}

/** Creates a gateway; the key is in the answer only, never stored or shown again. */
export async function createGateway(db: Db, user: SessionUser, input: CreateGatewayInput) {
  if (!(await repo.siteExists(db, input.siteId)))
    throw new AppError('validation_failed', 'That site does not exist.', 400, [
      { path: 'siteId', message: 'unknown site' },
    ]);
  const k = newGatewayKey();
  const id = await db.transaction(async (tx) => {
    const gatewayId = await repo.insertGateway(tx, {
      siteId: input.siteId,
      name: input.name,
      keyPrefix: k.prefix,
      keyHash: k.hash,
    });
    await auditAction(tx, user, 'gateway.create', gatewayId, {
      after: { siteId: input.siteId, name: input.name, keyPrefix: k.prefix },
    });
    return gatewayId;
  });
  return { id, apiKey: k.key, keyPrefix: k.prefix };
}

async function load(db: Db, id: number) {
  const row = await repo.gatewayWithSite(db, id);
  if (!row) throw notFound('Gateway');
  return row;
}

/** Revoking is final and idempotent: a second revoke changes nothing and logs nothing. */
export async function revokeGateway(db: Db, user: SessionUser, id: number) {
  const row = await load(db, id);
  const g = row.g;
  if (g.revokedAt) return publicView(g, row);
  const revokedAt = new Date();
  await db.transaction(async (tx) => {
    await repo.setRevoked(tx, id, revokedAt);
    await auditAction(tx, user, 'gateway.revoke', id, {
      before: { revokedAt: g.revokedAt },
      after: { revokedAt },
    });
  });
  forgetGatewayKeys();
  return publicView({ ...g, revokedAt }, row);
}

/**
 * A new key for the same gateway; the old one stops working at once. A revoked gateway
 * stays revoked (a revoked key may be in the wrong hands): create a new gateway instead.
 */
export async function rotateGatewayKey(db: Db, user: SessionUser, id: number) {
  const { g } = await load(db, id);
  if (g.revokedAt)
    throw new AppError(
      'gateway_revoked',
      'This gateway is revoked; revoked gateways stay revoked. Create a new gateway instead.',
      409,
    );
  const k = newGatewayKey();
  await db.transaction(async (tx) => {
    await repo.setKey(tx, id, { keyPrefix: k.prefix, keyHash: k.hash });
    await auditAction(tx, user, 'gateway.rotate', id, {
      before: { keyPrefix: g.keyPrefix },
      after: { keyPrefix: k.prefix },
    });
  });
  forgetGatewayKeys();
  return { id, apiKey: k.key, keyPrefix: k.prefix };
}
