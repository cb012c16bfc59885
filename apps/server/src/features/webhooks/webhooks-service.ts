/**
 * Outgoing webhooks: administration (create with a secret shown once, change, delete, the
 * deliveries of one) and `queueWebhookEvent`, which writes one delivery per subscribed
 * webhook inside the caller's transaction, so an event is queued exactly when its change
 * commits. Sending is webhook-sender.ts's.
 */
import { randomBytes, randomUUID } from 'node:crypto';
import type { z } from 'zod';
import type { Tx } from '@turnstone/db/client';
import type {
  Webhook,
  WebhookEvent,
  WebhookEventType,
  createWebhookSchema,
  updateWebhookSchema,
} from '@turnstone/contracts/webhooks';
import type { AppContext } from '../../lib/context.ts';
import { notFound } from '../../lib/app-error.ts';
import type { SessionUser } from '../../lib/session-user.ts';
import { auditAction } from '../audit/audit-repository.ts';
import * as repo from './webhooks-repository.ts';

const iso = (d: Date | null) => d?.toISOString() ?? null;

function toWebhook(w: Awaited<ReturnType<typeof repo.listWebhooks>>[number]): Webhook {
  return {
    id: w.id,
    name: w.name,
    url: w.url,
    events: w.events as Webhook['events'],
    enabled: Boolean(w.enabled),
    createdAt: w.createdAt.toISOString(),
    updatedAt: w.updatedAt.toISOString(),
    pending: w.pending,
    undelivered: w.undelivered,
  };
}

const auditView = (w: Pick<repo.WebhookRow, 'name' | 'url' | 'events' | 'enabled'>) => ({
  name: w.name,
  url: w.url,
  events: w.events,
  enabled: Boolean(w.enabled),
});

export async function listWebhooks(ctx: AppContext) {
  return { items: (await repo.listWebhooks(ctx.db)).map(toWebhook) };
}

async function loadOne(ctx: AppContext, id: number): Promise<Webhook> {
  const [row] = await repo.listWebhooks(ctx.db, id);
  if (!row) throw notFound('Webhook');
  return toWebhook(row);
}

export async function createWebhook(
  ctx: AppContext,
  actor: SessionUser,
  input: z.output<typeof createWebhookSchema>,
) {
  const secret = `whsec_${randomBytes(32).toString('base64')}`;
  const id = await ctx.db.transaction(async (tx) => {
    const newId = await repo.insertWebhook(tx, { ...input, secret, createdBy: actor.id });
    await auditAction(tx, actor, 'webhook.create', newId, {
      after: auditView({ ...input, enabled: true }),
    });
    return newId;
  });
  return { ...(await loadOne(ctx, id)), secret };
}

export async function updateWebhook(
  ctx: AppContext,
  actor: SessionUser,
  id: number,
  input: z.output<typeof updateWebhookSchema>,
) {
  await ctx.db.transaction(async (tx) => {
    const before = await repo.lockWebhook(tx, id);
    if (!before) throw notFound('Webhook');
    const set = Object.fromEntries(Object.entries(input).filter(([, v]) => v !== undefined));
    await repo.updateWebhook(tx, id, set);
    await auditAction(tx, actor, 'webhook.update', id, {
      before: auditView(before),
      after: auditView({ ...before, ...set }),
    });
  });
  return loadOne(ctx, id);
}

export async function deleteWebhook(ctx: AppContext, actor: SessionUser, id: number) {
  await ctx.db.transaction(async (tx) => {
    const before = await repo.lockWebhook(tx, id);
    if (!before) throw notFound('Webhook');
    await repo.deleteWebhook(tx, id);
    await auditAction(tx, actor, 'webhook.delete', id, { before: auditView(before) });
  });
}

export async function listDeliveries(ctx: AppContext, id: number) {
  await loadOne(ctx, id);
  const rows = await repo.listDeliveries(ctx.db, id);
  return {
    items: rows.map((r) => ({
      id: r.id,
      eventId: r.eventId,
      eventType: r.eventType,
      attempts: r.attempts,
      createdAt: r.createdAt.toISOString(),
      sentAt: iso(r.sentAt),
      nextAttemptAt: r.nextAttemptAt.toISOString(),
      lastStatus: r.lastStatus,
      lastError: r.lastError,
      outcome: r.outcome,
    })),
  };
}

/**
 * Queues `type` with `data` (the alert or finding as the API lists it) for every enabled
 * webhook that wants it, in the caller's transaction.
 */
export async function queueWebhookEvent(
  tx: Tx,
  type: WebhookEventType,
  data: Record<string, unknown>,
): Promise<void> {
  const targets = await repo.subscribersOf(tx, type);
  if (targets.length === 0) return;
  const event: WebhookEvent = {
    id: `evt_${randomUUID()}`,
    type,
    occurredAt: new Date().toISOString(),
    data,
  };
  const body = JSON.stringify(event);
  await repo.insertDeliveries(
    tx,
    targets.map((t) => ({ webhookId: t.id, eventId: event.id, eventType: type, body })),
  );
}
