/**
 * Sends outbox rows through nodemailer, with a lease per row, retries with back-off and a
 * rule that no message goes out twice.
 *
 * The rule for a send that may or may not have happened. `sending_started_at` is written
 * (under the lease) before the SMTP conversation and `sent_at` after the relay accepted
 * the message; each message carries a Message-ID derived from its outbox row. A row found
 * again with `sending_started_at` set and no `sent_at` had its sender die (or time out)
 * mid-send. Then:
 *  - when the local fake is the relay, the sender asks it (the `mail_messages` table) for
 *    that Message-ID: there → the row is marked sent with the time it arrived, not resent;
 *    absent → it never arrived, so it is sent now;
 *  - with a real relay (SMTP_URL), nobody can tell, so the row ends as `uncertain` with
 *    the reason in `last_error` and is NOT resent: a missed e-mail is the lesser harm,
 *    since the alert itself is on the Alerts screen, while a second "danger" e-mail for one
 *    event teaches people to ignore them.
 * A refusal by the relay (an SMTP reply code) or a connection that never opened is a
 * definite "not sent": the row is retried after 30 s, 60 s, 120 s … (at most 1 h) until
 * OUTBOX_MAX_ATTEMPTS, then ends as `failed`.
 */
import { randomUUID } from 'node:crypto';
import { hostname } from 'node:os';
import nodemailer, { type SendMailOptions, type Transporter } from 'nodemailer';
import type { AppContext } from '../../lib/context.ts';
import { deliveryLoop, inClaimedRounds } from '../../lib/delivery-loop.ts';
import * as repo from './outbox-repository.ts';
import { renderHourlySummary } from './alert-mail.ts';
import { outboxRetryDelayS } from '../../lib/retry-delay.ts';

export interface OutboxSenderOptions {
  smtpUrl: string;
  /** True when `smtpUrl` is the local fake, so arrival can be checked in `mail_messages`. */
  canConfirmArrival: boolean;
  owner?: string;
  /** Rows claimed per round. @default 10 */
  batch?: number;
}

export interface OutboxSender {
  owner: string;
  /** Sends every due row; returns what happened to each. */
  drain(): Promise<SendResult[]>;
  /** A tick every 5 s (no overlap). */
  start(): void;
  stop(): Promise<void>;
}

export interface SendResult {
  id: number;
  result: 'sent' | 'confirmed-earlier' | 'uncertain' | 'retry' | 'failed' | 'lease-lost';
}

/** Message-ID of an outbox row: the same on every attempt, unique per installation row. */
export function messageIdOf(row: Pick<repo.OutboxRow, 'id' | 'createdAt'>): string {
  return `<outbox-${row.id}.${row.createdAt.getTime().toString(36)}@turnstone.mail>`;
}

/** Back-off after the n-th failed attempt: 30 s · 2^(n−1), at most one hour. */
/** The message nodemailer sends for an outbox row. */
export function messageOf(
  row: Pick<repo.OutboxRow, 'toAddress' | 'subject' | 'textBody' | 'htmlBody' | 'kind'>,
  from: string,
  messageId: string,
): SendMailOptions {
  return {
    from,
    to: row.toAddress,
    subject: row.subject,
    text: row.textBody,
    ...(row.htmlBody ? { html: row.htmlBody } : {}),
    // Data-URL images (an alert's trend picture) travel as inline CID attachments, which
    // mail clients show more readily than data URLs.
    attachDataUrls: true,
    messageId,
    headers: { 'X-Turnstone-Kind': row.kind },
  };
}

export { outboxRetryDelayS };

// Errors where nodemailer never got as far as handing over the message.
const NOT_SENT_CODES = new Set(['ECONNECTION', 'EDNS', 'EAUTH', 'EENVELOPE', 'EMESSAGE', 'ETLS']);

function definitelyNotSent(err: unknown): boolean {
  const e = err as { responseCode?: unknown; code?: unknown; command?: unknown };
  if (typeof e.responseCode === 'number') return true;
  // A socket error while connecting ("CONN") means no message data was ever written.
  if (e.command === 'CONN') return true;
  return typeof e.code === 'string' && NOT_SENT_CODES.has(e.code);
}

export function createOutboxSender(ctx: AppContext, options: OutboxSenderOptions): OutboxSender {
  const owner = options.owner ?? `mail:${hostname()}:${process.pid}:${randomUUID().slice(0, 8)}`;
  const transport: Transporter = nodemailer.createTransport(options.smtpUrl, {
    from: ctx.config.MAIL_FROM,
  });

  async function sendOne(row: repo.OutboxRow): Promise<SendResult['result']> {
    const messageId = messageIdOf(row);
    if (row.sendingStartedAt) {
      if (!options.canConfirmArrival) {
        await repo.markFinal(
          ctx.db,
          row,
          owner,
          'uncertain',
          `A send started at ${row.sendingStartedAt.toISOString()} and never finished; the relay cannot be asked whether it arrived, so it is not sent again.`,
        );
        return 'uncertain';
      }
      const arrived = await repo.receivedAt(ctx.db, messageId);
      if (arrived) {
        await repo.markSent(ctx.db, row.id, arrived);
        return 'confirmed-earlier';
      }
    }
    if (!(await repo.markSendingStarted(ctx.db, row.id, owner))) return 'lease-lost';
    try {
      await transport.sendMail(messageOf(row, ctx.config.MAIL_FROM, messageId));
    } catch (err) {
      const message = err instanceof Error ? err.message : String(err);
      const sure = definitelyNotSent(err);
      if (row.attempts >= ctx.config.OUTBOX_MAX_ATTEMPTS && sure) {
        await repo.markFinal(ctx.db, row, owner, 'failed', message);
        return 'failed';
      }
      // An ambiguous failure (timeout after DATA) keeps sending_started_at: the next
      // attempt goes through the arrival rule above instead of sending blindly.
      await repo.markRetry(ctx.db, row, owner, message, outboxRetryDelayS(row.attempts), !sure);
      ctx.log.warn('mail not sent; will retry', { outboxId: row.id, message });
      return 'retry';
    }
    await repo.markSent(ctx.db, row.id);
    return 'sent';
  }

  async function drainInner(): Promise<SendResult[]> {
    await repo.foldHourlyRows(ctx.db, renderHourlySummary);
    return inClaimedRounds(
      () => repo.claimOutbox(ctx.db, owner, ctx.config.OUTBOX_LEASE_S, options.batch ?? 10),
      async (row) => ({ id: row.id, result: await sendOne(row) }),
    );
  }

  return {
    owner,
    ...deliveryLoop(ctx.log, {
      name: 'outbox',
      unavailable: 'outbox: database unavailable, will retry',
      failed: 'outbox tick failed',
      drainOnce: drainInner,
      afterStop: () => transport.close(),
    }),
  };
}
