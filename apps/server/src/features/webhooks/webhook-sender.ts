/**
 * Sends webhook deliveries: claimed under a lease (SKIP LOCKED, as the mail outbox), signed
 * as the Standard Webhooks specification describes, retried with the mail outbox's back-off,
 * and never delivered twice. The rule for "may or may not have arrived" is the mail's:
 *  - no connection was made (refused, unknown host, TLS refused, connect timeout): not sent,
 *    retried after 30 s, 60 s, 120 s … (at most 1 h) until OUTBOX_MAX_ATTEMPTS, then `failed`;
 *  - the receiver answered an error status: it did not take the event; retried the same way;
 *  - a 2xx answer: `sent`;
 *  - the request went out and no answer came (timeout, connection reset), or a sender died
 *    mid-request (`sending_started_at` set, no `sent_at`, found again after its lease): the
 *    receiver cannot be asked whether it got the event, so the delivery ends `uncertain` and
 *    is NOT sent again. Receivers that would rather have a repeat than a gap can ask for
 *    the event by its id (`webhook-id`); the Webhooks screen lists uncertain deliveries.
 */
import { createHmac, randomUUID } from 'node:crypto';
import { hostname } from 'node:os';
import type { AppContext } from '../../lib/context.ts';
import { deliveryLoop, inClaimedRounds } from '../../lib/delivery-loop.ts';
import { outboxRetryDelayS } from '../../lib/retry-delay.ts';
import * as repo from './webhooks-repository.ts';

export interface WebhookSender {
  owner: string;
  drain(): Promise<DeliveryResult[]>;
  /** A tick every 5 s (no overlap). */
  start(): void;
  stop(): Promise<void>;
}

export interface DeliveryResult {
  id: number;
  result: 'sent' | 'retry' | 'failed' | 'uncertain' | 'lease-lost';
}

/**
 * The Standard Webhooks signature: `v1,` + base64 HMAC-SHA256 of `id.timestamp.body` under
 * the secret's bytes (the base64 after `whsec_`).
 */
export function signatureOf(secret: string, id: string, timestampS: number, body: string) {
  const key = Buffer.from(secret.replace(/^whsec_/, ''), 'base64');
  return `v1,${createHmac('sha256', key).update(`${id}.${timestampS}.${body}`).digest('base64')}`;
}

const CONNECT_CODES = new Set([
  'ECONNREFUSED',
  'ENOTFOUND',
  'EAI_AGAIN',
  'EHOSTUNREACH',
  'ENETUNREACH',
  'UND_ERR_CONNECT_TIMEOUT',
]);

/** True when the request never reached the receiver (no connection, or TLS refused). */
function neverConnected(err: unknown): boolean {
  const cause = (err as { cause?: { code?: unknown } }).cause;
  const code = typeof cause?.code === 'string' ? cause.code : '';
  return CONNECT_CODES.has(code) || /CERT|^ERR_TLS|SELF_SIGNED|UNABLE_TO_VERIFY/.test(code);
}

const describe = (err: unknown) => {
  const e = err as { message?: string; cause?: { code?: string; message?: string } };
  return [e.message, e.cause?.code ?? e.cause?.message].filter(Boolean).join(': ');
};

export function createWebhookSender(
  ctx: AppContext,
  options: { owner?: string; batch?: number; timeoutMs?: number } = {},
): WebhookSender {
  const owner = options.owner ?? `hook:${hostname()}:${process.pid}:${randomUUID().slice(0, 8)}`;
  const timeoutMs = options.timeoutMs ?? 10_000;

  type Claimed = Awaited<ReturnType<typeof repo.claimDeliveries>>[number];

  async function notTaken(row: Claimed['delivery'], status: number | null, message: string) {
    if (row.attempts >= ctx.config.OUTBOX_MAX_ATTEMPTS) {
      await repo.markFinal(ctx.db, row.id, owner, 'failed', status, message);
      return 'failed' as const;
    }
    await repo.markRetry(ctx.db, row.id, owner, status, message, outboxRetryDelayS(row.attempts));
    ctx.log.warn('webhook not delivered; will retry', { deliveryId: row.id, message });
    return 'retry' as const;
  }

  async function sendOne({
    delivery: row,
    url,
    secret,
  }: Claimed): Promise<DeliveryResult['result']> {
    if (row.sendingStartedAt) {
      await repo.markFinal(
        ctx.db,
        row.id,
        owner,
        'uncertain',
        row.lastStatus,
        `A delivery started at ${row.sendingStartedAt.toISOString()} and never finished; the receiver cannot be asked whether it arrived, so it is not sent again.`,
      );
      return 'uncertain';
    }
    if (!(await repo.markSendingStarted(ctx.db, row.id, owner))) return 'lease-lost';
    const timestampS = Math.floor(Date.now() / 1000);
    let res: Response;
    try {
      res = await fetch(url, {
        method: 'POST',
        headers: {
          'content-type': 'application/json',
          'user-agent': 'Turnstone-Webhooks/1',
          'webhook-id': row.eventId,
          'webhook-timestamp': String(timestampS),
          'webhook-signature': signatureOf(secret, row.eventId, timestampS, row.body),
        },
        body: row.body,
        redirect: 'manual',
        signal: AbortSignal.timeout(timeoutMs),
      });
      await res.arrayBuffer().catch(() => undefined);
    } catch (err) {
      if (neverConnected(err)) return notTaken(row, null, describe(err));
      await repo.markFinal(
        ctx.db,
        row.id,
        owner,
        'uncertain',
        null,
        `The request went out and no answer came (${describe(err)}); it is not sent again.`,
      );
      ctx.log.warn('webhook delivery uncertain', { deliveryId: row.id, err: describe(err) });
      return 'uncertain';
    }
    if (res.status >= 200 && res.status < 300) {
      await repo.markSent(ctx.db, row.id, owner, res.status);
      return 'sent';
    }
    return notTaken(row, res.status, `The receiver answered ${res.status}.`);
  }

  async function drainInner(): Promise<DeliveryResult[]> {
    return inClaimedRounds(
      () => repo.claimDeliveries(ctx.db, owner, ctx.config.OUTBOX_LEASE_S, options.batch ?? 10),
      async (row) => ({ id: row.delivery.id, result: await sendOne(row) }),
    );
  }

  return {
    owner,
    ...deliveryLoop(ctx.log, {
      name: 'webhooks',
      unavailable: 'webhooks: database unavailable, will retry',
      failed: 'webhook tick failed',
      drainOnce: drainInner,
    }),
  };
}
