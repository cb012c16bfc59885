import { desc, eq, inArray } from 'drizzle-orm';
import { z } from 'zod';
import type { Db } from '@turnstone/db/client';
import { gateways, sites } from '@turnstone/db/schema';
import { AppError, notFound } from '../../lib/app-error.ts';
import type { SessionUser } from '../../lib/session-user.ts';
import { writeAudit } from '../audit/audit-repository.ts';
import { newGatewayKey } from './gateway-keys.ts';

export const createGatewaySchema = z.object({
  siteId: z.number().int().positive(),
  name: z.string().trim().min(1).max(200),
});

const publicView = (g: typeof gateways.$inferSelect) => ({
  id: g.id,
  siteId: g.siteId,
  name: g.name,
  keyPrefix: g.keyPrefix,
  revokedAt: g.revokedAt?.toISOString() ?? null,
  lastSeenAt: g.lastSeenAt?.toISOString() ?? null,
  createdAt: g.createdAt.toISOString(),
});

export async function listGateways(db: Db, user: SessionUser) {
  const rows = await db
    .select()
    .from(gateways)
    .where(inArray(gateways.siteId, user.siteIds.length ? user.siteIds : [-1]))
    .orderBy(desc(gateways.createdAt));
  return { items: rows.map(publicView) };
}

/** Creates a gateway; the key is in the answer only, never stored or shown again. */
export async function createGateway(
  db: Db,
  user: SessionUser,
  input: z.infer<typeof createGatewaySchema>,
) {
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
  const [g] = await db.select().from(gateways).where(eq(gateways.id, id));
  if (!g) throw notFound('Gateway');
  return g;
}

export async function revokeGateway(db: Db, user: SessionUser, id: number) {
  const g = await load(db, id);
  const revokedAt = g.revokedAt ?? new Date();
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
  return publicView({ ...g, revokedAt });
}

/** A new key for the same gateway; the old one stops working at once. */
export async function rotateGatewayKey(db: Db, user: SessionUser, id: number) {
  const g = await load(db, id);
  const k = newGatewayKey();
  await db.transaction(async (tx) => {
    await tx
      .update(gateways)
      .set({ keyPrefix: k.prefix, keyHash: k.hash, revokedAt: null })
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
  return { id, apiKey: k.key, keyPrefix: k.prefix };
}
