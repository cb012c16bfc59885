/**
 * Webhooks and their deliveries. A delivery is an outbox row written in the transaction of
 * the change it tells about; senders claim due rows with SELECT … FOR UPDATE SKIP LOCKED and
 * hold them under a lease, as the mail outbox does (mail/outbox-repository.ts).
 */
import { and, asc, desc, eq, inArray, isNull, lte, or, sql } from 'drizzle-orm';
import type { Db, Tx } from '@turnstone/db/client';
import { webhookDeliveries, webhooks } from '@turnstone/db/schema';

export type WebhookRow = typeof webhooks.$inferSelect;
export type DeliveryRow = typeof webhookDeliveries.$inferSelect;

export async function listWebhooks(db: Db, id?: number) {
  const rows = await db
    .select()
    .from(webhooks)
    .where(id === undefined ? undefined : eq(webhooks.id, id))
    .orderBy(asc(webhooks.id));
  const counts = await db
    .select({
      webhookId: webhookDeliveries.webhookId,
      pending: sql<number>`SUM(${webhookDeliveries.outcome} IS NULL AND ${webhookDeliveries.attempts} > 0)`,
      undelivered: sql<number>`SUM(${webhookDeliveries.outcome} IN ('failed', 'uncertain'))`,
    })
    .from(webhookDeliveries)
    .groupBy(webhookDeliveries.webhookId);
  const by = new Map(counts.map((c) => [c.webhookId, c]));
  return rows.map((w) => ({
    ...w,
    pending: Number(by.get(w.id)?.pending ?? 0),
    undelivered: Number(by.get(w.id)?.undelivered ?? 0),
  }));
}

export async function insertWebhook(
  tx: Tx,
  values: Pick<typeof webhooks.$inferInsert, 'name' | 'url' | 'secret' | 'events' | 'createdBy'>,
): Promise<number> {
  const [row] = await tx.insert(webhooks).values(values).$returningId();
  return row!.id;
}

export async function lockWebhook(tx: Tx, id: number): Promise<WebhookRow | undefined> {
  const [row] = await tx.select().from(webhooks).where(eq(webhooks.id, id)).for('update');
  return row;
}

export async function updateWebhook(
  tx: Tx,
  id: number,
  set: Partial<Pick<WebhookRow, 'name' | 'url' | 'events' | 'enabled'>>,
) {
  await tx
    .update(webhooks)
    .set({ ...set, updatedAt: sql`CURRENT_TIMESTAMP(3)` })
    .where(eq(webhooks.id, id));
}

export async function deleteWebhook(tx: Tx, id: number) {
  await tx.delete(webhooks).where(eq(webhooks.id, id));
}

/** Enabled webhooks that want `eventType`. */
export async function subscribersOf(tx: Tx, eventType: string) {
  return tx
    .select({ id: webhooks.id })
    .from(webhooks)
    .where(
      and(
        eq(webhooks.enabled, true),
        sql`JSON_CONTAINS(${webhooks.events}, JSON_QUOTE(${eventType}))`,
      ),
    );
}

export async function insertDeliveries(
  tx: Tx,
  rows: Pick<
    typeof webhookDeliveries.$inferInsert,
    'webhookId' | 'eventId' | 'eventType' | 'body'
  >[],
) {
  if (rows.length) await tx.insert(webhookDeliveries).values(rows);
}

export async function listDeliveries(db: Db, webhookId: number, limit = 100) {
  return db
    .select()
    .from(webhookDeliveries)
    .where(eq(webhookDeliveries.webhookId, webhookId))
    .orderBy(desc(webhookDeliveries.id))
    .limit(limit);
}

/** Due rows of enabled webhooks, leased to `owner`, with each webhook's URL and secret. */
export async function claimDeliveries(db: Db, owner: string, leaseS: number, limit: number) {
  return db.transaction(async (tx) => {
    const now = sql`CURRENT_TIMESTAMP(3)`;
    const due = await tx
      .select({ id: webhookDeliveries.id })
      .from(webhookDeliveries)
      .where(
        and(
          isNull(webhookDeliveries.sentAt),
          lte(webhookDeliveries.nextAttemptAt, now),
          isNull(webhookDeliveries.outcome),
          or(isNull(webhookDeliveries.leaseExpiresAt), lte(webhookDeliveries.leaseExpiresAt, now)),
          // A disabled webhook's events wait, untried, until it is enabled again.
          sql`${webhookDeliveries.webhookId} IN (SELECT ${webhooks.id} FROM ${webhooks} WHERE ${webhooks.enabled})`,
        ),
      )
      .orderBy(asc(webhookDeliveries.nextAttemptAt), asc(webhookDeliveries.id))
      .limit(limit)
      .for('update', { skipLocked: true });
    const ids = due.map((r) => r.id);
    if (ids.length === 0) return [];
    await tx
      .update(webhookDeliveries)
      .set({
        leaseOwner: owner,
        leaseExpiresAt: sql`CURRENT_TIMESTAMP(3) + INTERVAL ${Math.round(leaseS * 1000)} * 1000 MICROSECOND`,
        attempts: sql`${webhookDeliveries.attempts} + 1`,
      })
      .where(inArray(webhookDeliveries.id, ids));
    return tx
      .select({
        delivery: webhookDeliveries,
        url: webhooks.url,
        secret: webhooks.secret,
        enabled: webhooks.enabled,
      })
      .from(webhookDeliveries)
      .innerJoin(webhooks, eq(webhooks.id, webhookDeliveries.webhookId))
      .where(inArray(webhookDeliveries.id, ids))
      .orderBy(asc(webhookDeliveries.id));
  });
}

const mine = (id: number, owner: string) =>
  and(
    eq(webhookDeliveries.id, id),
    eq(webhookDeliveries.leaseOwner, owner),
    isNull(webhookDeliveries.sentAt),
  );

/** Written before the request goes out; fenced by the lease. */
export async function markSendingStarted(db: Db, id: number, owner: string): Promise<boolean> {
  const [res] = await db
    .update(webhookDeliveries)
    .set({ sendingStartedAt: sql`CURRENT_TIMESTAMP(3)` })
    .where(mine(id, owner));
  return res.affectedRows === 1;
}

export async function markSent(db: Db, id: number, owner: string, status: number) {
  await db
    .update(webhookDeliveries)
    .set({
      sentAt: sql`CURRENT_TIMESTAMP(3)`,
      outcome: 'sent',
      lastStatus: status,
      lastError: null,
      leaseOwner: null,
      leaseExpiresAt: null,
    })
    .where(mine(id, owner));
}

/** A definite "not taken" (no connection, or an error answer): retry after `delayS`. */
export async function markRetry(
  db: Db,
  id: number,
  owner: string,
  status: number | null,
  message: string,
  delayS: number,
) {
  await db
    .update(webhookDeliveries)
    .set({
      lastStatus: status,
      lastError: message.slice(0, 4000),
      leaseOwner: null,
      leaseExpiresAt: null,
      sendingStartedAt: null,
      nextAttemptAt: sql`CURRENT_TIMESTAMP(3) + INTERVAL ${Math.round(delayS)} SECOND`,
    })
    .where(mine(id, owner));
}

export async function markFinal(
  db: Db,
  id: number,
  owner: string,
  outcome: 'failed' | 'uncertain',
  status: number | null,
  message: string,
) {
  await db
    .update(webhookDeliveries)
    .set({
      outcome,
      lastStatus: status,
      lastError: message.slice(0, 4000),
      leaseOwner: null,
      leaseExpiresAt: null,
    })
    .where(mine(id, owner));
}
