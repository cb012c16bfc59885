/**
 * What mail reads and writes besides the outbox (outbox-repository.ts): the facts of an
 * alert mail, who is subscribed, the digest's planners, the demo's subscriptions and the
 * messages the local SMTP fake received (read by the Mailbox screen).
 */
import { asc, desc, eq, inArray, like, or, sql } from 'drizzle-orm';
import type { Db, Tx } from '@turnstone/db/client';
import { mailMessages, sites, subscriptions, users } from '@turnstone/db/schema';

type Row = Record<string, unknown>;
async function rows(db: Db | Tx, q: ReturnType<typeof sql>): Promise<Row[]> {
  const [r] = (await db.execute(q)) as unknown as [Row[]];
  return r;
}

/** An alert with its point, machine, area and site, as an alert mail names them. */
export async function alertForMail(tx: Tx, alertId: number): Promise<Row | undefined> {
  const [a] = await rows(
    tx,
    sql`SELECT a.id, a.level, a.band_key, a.band_name, a.unit, a.limit_value, a.last_value, a.peak_value,
               a.last_at, a.suspect, p.id AS point_id, p.tag, p.name AS point_name,
               m.id AS machine_id, m.name AS machine_name, ar.name AS area_name,
               s.id AS site_id, s.code AS site_code, s.name AS site_name
          FROM alerts a JOIN points p ON p.id = a.point_id JOIN machines m ON m.id = p.machine_id
          JOIN areas ar ON ar.id = m.area_id JOIN sites s ON s.id = ar.site_id
         WHERE a.id = ${alertId}`,
  );
  return a;
}

/** The alert's latest event of one kind. */
export async function lastAlertEvent(
  tx: Tx,
  alertId: number,
  kind: string,
): Promise<Row | undefined> {
  const [ev] = await rows(
    tx,
    sql`SELECT id, level, value, at FROM alert_events
         WHERE alert_id = ${alertId} AND kind = ${kind} ORDER BY id DESC LIMIT 1`,
  );
  return ev;
}

/** The point's last analysis taken at or before `at` (its verdict and diagnosis). */
export async function analysisAtOrBefore(
  tx: Tx,
  pointId: number,
  at: Date,
): Promise<Row | undefined> {
  const [an] = await rows(
    tx,
    sql`SELECT quality_verdict, diagnosis FROM analyses WHERE point_id = ${pointId} AND taken_at <= ${at}
         ORDER BY taken_at DESC, id DESC LIMIT 1`,
  );
  return an;
}

/**
 * Subscriptions that match an alert: scope (site or machine), level, and site access of an
 * enabled user who has a password; a row per subscription (a user may have several).
 */
export function subscribersOf(tx: Tx, siteId: number, machineId: number, level: string) {
  return rows(
    tx,
    sql`SELECT u.id, u.email, u.unit_system, sub.cadence FROM subscriptions sub
          JOIN users u ON u.id = sub.user_id
         WHERE u.disabled_at IS NULL AND u.password_hash IS NOT NULL
           AND (sub.site_id = ${siteId} OR sub.machine_id = ${machineId})
           AND (sub.min_level = 'alert' OR ${level} = 'danger')
           AND (u.role = 'admin' OR EXISTS (SELECT 1 FROM user_sites us
                 WHERE us.user_id = u.id AND us.site_id = ${siteId}))`,
  );
}

/** Enabled planners with a password who asked for the weekly digest. */
export async function digestRecipientIds(db: Db): Promise<number[]> {
  const found = await rows(
    db,
    sql`SELECT DISTINCT u.id FROM users u JOIN subscriptions s ON s.user_id = u.id
         WHERE s.weekly_digest = 1 AND u.role = 'planner' AND u.disabled_at IS NULL
           AND u.password_hash IS NOT NULL`,
  );
  return found.map((r) => Number(r.id));
}

export function usersByEmail(db: Db, emails: string[]) {
  return db
    .select({ id: users.id, email: users.email })
    .from(users)
    .where(inArray(users.email, emails));
}

export function allSiteIds(db: Db) {
  return db.select({ id: sites.id }).from(sites);
}

export async function addSubscriptions(
  db: Db,
  rows: (typeof subscriptions.$inferInsert)[],
): Promise<void> {
  if (rows.length) await db.insert(subscriptions).values(rows);
}

/** Keeps a message the local SMTP fake received. */
export async function storeReceivedMail(
  db: Db,
  message: typeof mailMessages.$inferInsert,
): Promise<void> {
  await db.insert(mailMessages).values(message);
}

/** Received messages, newest first. */
/** Newest first; `search` narrows to messages whose recipient or subject contain it. */
export function listReceivedMail(db: Db, limit: number, search?: string) {
  const pattern = search ? `%${search.replace(/[\\%_]/g, (c) => `\\${c}`)}%` : null;
  return db
    .select({
      id: mailMessages.id,
      to: mailMessages.mailTo,
      subject: mailMessages.subject,
      receivedAt: mailMessages.receivedAt,
    })
    .from(mailMessages)
    .where(
      pattern
        ? or(like(mailMessages.mailTo, pattern), like(mailMessages.subject, pattern))
        : undefined,
    )
    .orderBy(desc(mailMessages.receivedAt), desc(mailMessages.id))
    .limit(limit);
}

export async function findReceivedMail(db: Db, id: number) {
  const [found] = await db.select().from(mailMessages).where(eq(mailMessages.id, id)).limit(1);
  return found;
}

/** The time zone of the first site made (the digest's schedule when none is configured). */
export async function firstSiteTimeZone(db: Db): Promise<string | undefined> {
  const [first] = await db
    .select({ tz: sites.timeZone })
    .from(sites)
    .orderBy(asc(sites.id))
    .limit(1);
  return first?.tz;
}
