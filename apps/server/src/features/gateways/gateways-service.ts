import { desc, eq, inArray } from 'drizzle-orm';
import type { Db } from '@turnstone/db/client';
import { createGatewaySchema, type CreateGatewayInput } from '@turnstone/contracts/gateways';
import { gateways, sites } from '@turnstone/db/schema';
import { AppError, notFound } from '../../lib/app-error.ts';
import type { SessionUser } from '../../lib/session-user.ts';
import { writeAudit } from '../audit/audit-repository.ts';
import { newGatewayKey } from './gateway-keys.ts';
import { forgetGatewayKeys } from '../ingest/ingest-service.ts';

export { createGatewaySchema };

type SiteNames = { siteName: string; siteCode: string };
const publicView = (g: typeof gateways.$inferSelect, site: SiteNames) => ({
  id: g.id,
  siteId: g.siteId,
  siteName: site.siteName,
  siteCode: site.siteCode,
  name: g.name,
  keyPrefix: g.keyPrefix,
  revokedAt: g.revokedAt?.toISOString() ?? null,
  lastSeenAt: g.lastSeenAt?.toISOString() ?? null,
  createdAt: g.createdAt.toISOString(),
});

export async function listGateways(db: Db, user: SessionUser) {
  const rows = await db
    .select({ g: gateways, siteName: sites.name, siteCode: sites.code })
    .from(gateways)
    .innerJoin(sites, eq(sites.id, gateways.siteId))
    .where(inArray(gateways.siteId, user.siteIds.length ? user.siteIds : [-1]))
    .orderBy(desc(gateways.createdAt), desc(gateways.id));
  return { items: rows.map((r) => publicView(r.g, r)) };
}

/** Creates a gateway; the key is in the answer only, never stored or shown again. */
export async function createGateway(db: Db, user: SessionUser, input: CreateGatewayInput) {
  const [site] = await db.select({ id: sites.id }).from(sites).where(eq(sites.id, input.siteId));
  if (!site)
    throw new AppError('validation_failed', 'That site does not exist.', 400, [
      { path: 'siteId', message: 'unknown site' },
    ]);
  const k = newGatewayKey();
  const id = await db.transaction(async (tx) => {
    const [row] = await tx
      .insert(gateways)
      .values({ siteId: input.siteId, name: input.name, keyPrefix: k.prefix, keyHash: k.hash })
      .$returningId();
    await writeAudit(tx, {
      actorUserId: user.id,
      action: 'gateway.create',
      entity: 'gateway',
      entityId: row!.id,
      after: { siteId: input.siteId, name: input.name, keyPrefix: k.prefix },
    });
    return row!.id;
  });
  return { id, apiKey: k.key, keyPrefix: k.prefix };
}

async function load(db: Db, id: number) {
  const [row] = await db
    .select({ g: gateways, siteName: sites.name, siteCode: sites.code })
    .from(gateways)
    .innerJoin(sites, eq(sites.id, gateways.siteId))
    .where(eq(gateways.id, id));
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
    await tx.update(gateways).set({ revokedAt }).where(eq(gateways.id, id));
    await writeAudit(tx, {
      actorUserId: user.id,
      action: 'gateway.revoke',
      entity: 'gateway',
      entityId: id,
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
    await tx
      .update(gateways)
      .set({ keyPrefix: k.prefix, keyHash: k.hash })
      .where(eq(gateways.id, id));
    await writeAudit(tx, {
      actorUserId: user.id,
      action: 'gateway.rotate',
      entity: 'gateway',
      entityId: id,
      before: { keyPrefix: g.keyPrefix },
      after: { keyPrefix: k.prefix },
    });
  });
  forgetGatewayKeys();
  return { id, apiKey: k.key, keyPrefix: k.prefix };
}
