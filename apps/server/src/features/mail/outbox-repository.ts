/**
 * The outbox table as a mail queue. Rows are written inside the transaction of the change
 * they tell about; senders claim due rows with SELECT … FOR UPDATE SKIP LOCKED (MariaDB ≥
 * 10.6, as the jobs queue does) and hold them under a lease.
 */
import { and, asc, desc, eq, gt, inArray, isNull, lte, ne, or, sql } from 'drizzle-orm';
import type { Db, Tx } from '@turnstone/db/client';
import { mailMessages, outbox, settings } from '@turnstone/db/schema';
import { LINK_TOKEN_KINDS, TOKEN_IN_LINK_SQL } from './link-tokens.ts';

export type OutboxRow = typeof outbox.$inferSelect;

/** Rows for "hourly" subscribers: never sent alone, folded into one summary per hour. */
export const HOURLY_KIND = 'alert-hourly';
type Writer = Pick<Db, 'insert'>;

export interface NewMail {
  kind: string;
  /** One message per key, ever: a repeat is silently dropped. */
  dedupeKey: string;
  to: string;
  subject: string;
  text: string;
  html: string;
  /** When to send at the earliest; now when absent. */
  notBefore?: Date;
}

/** Queues one message; a repeat of its dedupe key leaves the first row as it was. */
export async function enqueueMail(db: Writer, m: NewMail): Promise<void> {
  await db
    .insert(outbox)
    .values({
      kind: m.kind,
      dedupeKey: m.dedupeKey.slice(0, 191),
      toAddress: m.to,
      subject: m.subject.slice(0, 300),
      textBody: m.text,
      htmlBody: m.html,
      ...(m.notBefore ? { nextAttemptAt: m.notBefore } : {}),
    })
    .onDuplicateKeyUpdate({ set: { dedupeKey: sql`${outbox.dedupeKey}` } });
}

export async function claimOutbox(
  db: Db,
  owner: string,
  leaseS: number,
  limit: number,
): Promise<OutboxRow[]> {
  return db.transaction(async (tx) => {
    const now = sql`CURRENT_TIMESTAMP(3)`;
    const due = await tx
      .select({ id: outbox.id })
      .from(outbox)
      .where(
        and(
          isNull(outbox.sentAt),
          lte(outbox.nextAttemptAt, now),
          isNull(outbox.outcome),
          ne(outbox.kind, HOURLY_KIND),
          or(isNull(outbox.leaseExpiresAt), lte(outbox.leaseExpiresAt, now)),
        ),
      )
      .orderBy(asc(outbox.nextAttemptAt))
      .limit(limit)
      .for('update', { skipLocked: true });
    const ids = due.map((r) => r.id);
    if (ids.length === 0) return [];
    await tx
      .update(outbox)
      .set({
        leaseOwner: owner,
        leaseExpiresAt: sql`CURRENT_TIMESTAMP(3) + INTERVAL ${Math.round(leaseS * 1000)} * 1000 MICROSECOND`,
        attempts: sql`${outbox.attempts} + 1`,
      })
      .where(inArray(outbox.id, ids));
    return tx.select().from(outbox).where(inArray(outbox.id, ids)).orderBy(asc(outbox.id));
  });
}

const mine = (id: number, owner: string) =>
  and(eq(outbox.id, id), eq(outbox.leaseOwner, owner), isNull(outbox.sentAt));

/** Written before the SMTP conversation starts; fenced by the lease. */
export async function markSendingStarted(db: Db, id: number, owner: string): Promise<boolean> {
  const [res] = await db
    .update(outbox)
    .set({ sendingStartedAt: sql`CURRENT_TIMESTAMP(3)` })
    .where(mine(id, owner));
  return res.affectedRows === 1;
}

/**
 * Marks a message sent. The outbox keeps what a re-send would need, and a sent message is
 * never sent again: so the single-use link of an invite or reset is masked once it is out
 * (a failed or uncertain one keeps it until an administrator sends it again).
 */
export async function markSent(db: Db, id: number, sentAt?: Date): Promise<void> {
  const kinds = sql.join(
    LINK_TOKEN_KINDS.map((k) => sql`${k}`),
    sql`, `,
  );
  const masked = (column: typeof outbox.textBody | typeof outbox.htmlBody) =>
    sql`CASE WHEN ${outbox.kind} IN (${kinds}) THEN REGEXP_REPLACE(${column}, ${TOKEN_IN_LINK_SQL}, ${'\\1hidden'}) ELSE ${column} END`;
  await db
    .update(outbox)
    .set({
      sentAt: sentAt ?? sql`CURRENT_TIMESTAMP(3)`,
      outcome: 'sent',
      leaseOwner: null,
      leaseExpiresAt: null,
      textBody: masked(outbox.textBody),
      htmlBody: masked(outbox.htmlBody),
    })
    .where(and(eq(outbox.id, id), isNull(outbox.sentAt)));
}

/** A definite refusal or a failure before any data went out: retry after `delayS`. */
export async function markRetry(
  db: Db,
  row: OutboxRow,
  owner: string,
  message: string,
  delayS: number,
  keepStarted: boolean,
): Promise<void> {
  await db
    .update(outbox)
    .set({
      lastError: message.slice(0, 4000),
      leaseOwner: null,
      leaseExpiresAt: null,
      ...(keepStarted ? {} : { sendingStartedAt: null }),
      nextAttemptAt: sql`CURRENT_TIMESTAMP(3) + INTERVAL ${Math.round(delayS)} SECOND`,
    })
    .where(mine(row.id, owner));
}

export async function markFinal(
  db: Db,
  row: OutboxRow,
  owner: string,
  outcome: 'failed' | 'uncertain',
  message: string,
): Promise<void> {
  await db
    .update(outbox)
    .set({ outcome, lastError: message.slice(0, 4000), leaseOwner: null, leaseExpiresAt: null })
    .where(mine(row.id, owner));
}

/** When the local fake is the relay: did a message with this Message-ID arrive? */
export async function receivedAt(db: Db, messageId: string): Promise<Date | null> {
  const [row] = await db
    .select({ at: mailMessages.receivedAt })
    .from(mailMessages)
    .where(eq(mailMessages.messageId, messageId))
    .limit(1);
  return row?.at ?? null;
}

export interface MailRuntimeSetting {
  /** Base URL for links in messages (PUBLIC_URL wins over this). */
  baseUrl: string;
  /** The local fake's address when it is the relay; null with a real SMTP_URL. */
  fakeSmtpUrl: string | null;
}

const RUNTIME_KEY = 'mail.runtime';

/** Shared through the database so a separate worker process finds the web process's fake. */
export async function saveRuntime(db: Db, value: MailRuntimeSetting): Promise<void> {
  await db
    .insert(settings)
    .values({ key: RUNTIME_KEY, value, updatedAt: new Date() })
    .onDuplicateKeyUpdate({ set: { value, updatedAt: new Date() } });
}

export async function loadRuntime(db: Pick<Db, 'select'>): Promise<MailRuntimeSetting | null> {
  const [row] = await db.select().from(settings).where(eq(settings.key, RUNTIME_KEY)).limit(1);
  return (row?.value as MailRuntimeSetting | undefined) ?? null;
}

/**
 * Folds due hourly rows into one summary row per recipient, in one transaction: the
 * summary is queued and the folded rows are closed (`outcome` sent, `lease_owner` naming
 * the summary row), so each event reaches the summary exactly once.
 */
export async function foldHourlyRows(
  db: Db,
  build: (rows: OutboxRow[]) => { subject: string; text: string; html: string },
): Promise<number> {
  return db.transaction(async (tx) => {
    const due = await tx
      .select()
      .from(outbox)
      .where(
        and(
          isNull(outbox.sentAt),
          lte(outbox.nextAttemptAt, sql`CURRENT_TIMESTAMP(3)`),
          isNull(outbox.outcome),
          eq(outbox.kind, HOURLY_KIND),
        ),
      )
      .orderBy(asc(outbox.id))
      .limit(1000)
      .for('update', { skipLocked: true });
    const byTo = new Map<string, OutboxRow[]>();
    for (const r of due) byTo.set(r.toAddress, [...(byTo.get(r.toAddress) ?? []), r]);
    for (const [to, rows] of byTo) {
      const key = `summary:${rows[0]!.id}:${to}`;
      await enqueueMail(tx, { kind: 'alert-summary', dedupeKey: key, to, ...build(rows) });
      const [summary] = await tx
        .select({ id: outbox.id })
        .from(outbox)
        .where(eq(outbox.dedupeKey, key.slice(0, 191)));
      await tx
        .update(outbox)
        .set({
          outcome: 'sent',
          sentAt: sql`CURRENT_TIMESTAMP(3)`,
          leaseOwner: `summary:${summary!.id}`,
        })
        .where(
          inArray(
            outbox.id,
            rows.map((r) => r.id),
          ),
        );
    }
    return byTo.size;
  });
}

/**
 * Messages that need a person's eye, newest first: final `failed` or `uncertain`, and those
 * still waiting for a retry after a refusal (hourly alert summaries being gathered are not
 * listed: they have not been tried).
 */
export async function listUndelivered(db: Db, limit = 100): Promise<OutboxRow[]> {
  return db
    .select()
    .from(outbox)
    .where(
      or(
        inArray(outbox.outcome, ['failed', 'uncertain']),
        and(isNull(outbox.outcome), isNull(outbox.sentAt), gt(outbox.attempts, 0)),
      ),
    )
    .orderBy(desc(outbox.id))
    .limit(limit);
}

/**
 * Puts a failed or uncertain message back in the queue as new: the sender tries it again
 * with its full number of attempts. Answers the row as it was, or null when it is not
 * failed or uncertain (sent, or still being tried).
 */
export async function requeueUndelivered(tx: Tx, id: number): Promise<OutboxRow | null> {
  const [row] = await tx.select().from(outbox).where(eq(outbox.id, id)).for('update');
  if (!row || (row.outcome !== 'failed' && row.outcome !== 'uncertain')) return null;
  await tx
    .update(outbox)
    .set({
      outcome: null,
      attempts: 0,
      nextAttemptAt: sql`CURRENT_TIMESTAMP(3)`,
      leaseOwner: null,
      leaseExpiresAt: null,
      sendingStartedAt: null,
    })
    .where(eq(outbox.id, id));
  return row;
}
