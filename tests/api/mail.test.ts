/**
 * Mail against the running local SMTP fake (nothing mocked): alert notifications from
 * ingested captures, the outbox's no-double-send rule, retries, and the weekly digest.
 */
import { describe, expect, it } from 'vitest';
import nodemailer from 'nodemailer';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import {
  createOutboxSender,
  messageIdOf,
} from '../../apps/server/src/features/mail/outbox-sender.ts';
import {
  claimOutbox,
  markSendingStarted,
} from '../../apps/server/src/features/mail/outbox-repository.ts';
import { queueWeeklyDigests } from '../../apps/server/src/features/mail/digest-service.ts';
import { SAFETY_CAUTION } from '../../apps/server/src/features/mail/mail-templates.ts';
import { testServerForFile } from '../support/api-suite.ts';
import { queueMail } from '../support/mail-inbox.ts';
import { postVelocities } from '../support/alert-captures.ts';

const srv = testServerForFile({ env: { OUTBOX_LEASE_S: '1' }, signIn: ['admin'], gateway: true });
// 30 days back, so a capture after the 5-day clear off-delay is not in the future
const t0 = Date.now() - 30 * 24 * 3600_000;
let seq = 0;
const TAG = 'MFP-P101-MDE-H';
const ENGINEER = 'engineer@turnstone.local';
const PLANNER = 'planner@turnstone.local';
/** The demo operator works at MFP and has every operator's default: its alerts, at once. */
const OPERATOR = 'operator@turnstone.local';

type Row = Record<string, unknown>;
const q = (sqlText: string, params: unknown[] = []) => srv.q<Row>(sqlText, params);

async function capture(velocities: number[]) {
  seq = await postVelocities(srv, srv.key, TAG, velocities, { t0, from: seq, uidPrefix: 'm' });
  await createWorker(srv.ctx, { owner: 'mail-test' }).drain();
}

/** Messages the fake received whose subject contains `part`, by recipient. */
async function received(part: string) {
  return q('SELECT * FROM mail_messages WHERE subject LIKE ? ORDER BY id', [`%${part}%`]);
}

const overallAlert = async () =>
  (
    await q(
      `SELECT a.* FROM alerts a JOIN points p ON p.id = a.point_id
        WHERE p.tag = ? AND a.band_key = 'overall-velocity' ORDER BY a.id DESC LIMIT 1`,
      [TAG],
    )
  )[0]!;

describe('alert notifications', () => {
  it('when captures raise an alert, each subscribed user gets exactly one message per alert with machine, point, band, value vs level, verdict, link and caution', async () => {
    // P-101: ISO 20816-3 group 2 rigid → template alert 2.8 mm/s, danger 4.5 mm/s,
    // persistence 2 (condition package template defaults; ISO 20816-3 zone boundaries, from memory).
    await capture([1.5, 1.5, 3.5, 3.5]);
    const raisedEvents = await q(
      `SELECT e.id, e.alert_id FROM alert_events e WHERE e.kind = 'raised'`,
    );
    expect(raisedEvents.length).toBeGreaterThan(0);
    const rows = await q(`SELECT * FROM outbox WHERE kind = 'alert-raised'`);
    // Engineer subscribes to every alert on both sites, the operator (by default) to those of
    // MFP; the planner only to danger.
    expect(rows.length).toBe(2 * raisedEvents.length);
    expect(new Set(rows.map((r) => r.to_address))).toEqual(new Set([ENGINEER, OPERATOR]));

    const results = await srv.mail.sender.drain();
    expect(results.filter((r) => r.result === 'sent').length).toBe(rows.length);

    const a = await overallAlert();
    const mails = (await received('Alert raised')).filter((m) =>
      String(m.subject).includes('Overall'),
    );
    expect(mails.map((x) => x.mail_to).sort()).toEqual([ENGINEER, OPERATOR]);
    const m = mails.find((x) => x.mail_to === ENGINEER)!;
    const text = String(m.text_body);
    expect(text).toContain('Intake pump P-101');
    expect(text).toContain(TAG);
    expect(text).toMatch(/Band:\s+Overall velocity/i);
    // 3.5 mm/s RMS sent; the analysed value is within a few per cent (alerts.test.ts bounds).
    expect(text).toMatch(/Value:\s+3\.[3-7]\d mm\/s against the alert level 2\.80 mm\/s/);
    // The verdict named is the one the analysis of that capture recorded.
    const [an] = await q(
      'SELECT quality_verdict FROM analyses WHERE point_id = ? ORDER BY taken_at DESC LIMIT 1',
      [a.point_id],
    );
    // Labels are padded to the longest one in the mail (a hint line makes them wider).
    expect(text).toMatch(new RegExp(`Capture quality:\\s+${String(an!.quality_verdict)}\\b`));
    expect(text).toContain(`${srv.url}/points/${a.point_id}`);
    expect(text).toContain(SAFETY_CAUTION);
    expect(text).not.toMatch(/token|key=|secret/i);
    const html = String(m.html_body);
    expect(html).toContain(`href="${srv.url}/points/${a.point_id}"`);
    expect(html).toContain('Turnstone is not a machine-protection system');
    expect(html).not.toMatch(/<script/i);
    // The document names its language and has a title (WCAG 2.1 SC 3.1.1 and 2.4.2).
    expect(html).toMatch(
      /^<!doctype html><html lang="en"><head>.*<title>Alert raised[^<]*Intake pump P-101<\/title>/i,
    );
  });

  it('when the same alert event is queued again, no second row or message appears', async () => {
    const before = await q('SELECT COUNT(*) AS n FROM outbox');
    const a = await overallAlert();
    const { queueAlertChangeMail } =
      await import('../../apps/server/src/features/mail/alert-mail.ts');
    await srv.ctx.db.transaction((tx) =>
      queueAlertChangeMail(srv.ctx, tx, { alertId: Number(a.id), kind: 'raised' }),
    );
    const after = await q('SELECT COUNT(*) AS n FROM outbox');
    expect(Number(after[0]!.n)).toBe(Number(before[0]!.n));
    expect(await srv.mail.sender.drain()).toEqual([]);
  });

  it('when the alert escalates to danger, the planner (danger only), the operator and the engineer each get one', async () => {
    await capture([6, 6]);
    await srv.mail.sender.drain();
    const esc = (await received('Escalated to danger')).filter((m) =>
      String(m.subject).includes('Overall'),
    );
    expect(esc.map((m) => m.mail_to).sort()).toEqual([ENGINEER, OPERATOR, PLANNER]);
    expect(String(esc[0]!.text_body)).toMatch(/against the danger level 4\.50 mm\/s/);
  });

  it('when values fall back inside the levels, clearing sends one message per subscribed user', async () => {
    // three values below the clear level after the template's 5-day off-delay
    // (TEMPLATE_DEFAULTS, common practice, no source)
    seq += 6 * 24;
    await capture([1.0, 1.0, 1.0]);
    const a = await overallAlert();
    expect(a.state).toBe('cleared');
    await srv.mail.sender.drain();
    const cleared = (await received('cleared')).filter((m) =>
      String(m.subject).includes('Overall'),
    );
    expect(cleared.map((m) => m.mail_to).sort()).toEqual([ENGINEER, OPERATOR, PLANNER]);
    expect(String(cleared[0]!.text_body)).toMatch(/back below the danger level 4\.50 mm\/s/);
  });
});

describe('hourly summaries', () => {
  it('when a subscriber chose hourly, changes wait for the top of the hour and go out as one summary', async () => {
    await q(
      "UPDATE subscriptions SET cadence = 'hourly' WHERE user_id = (SELECT id FROM users WHERE email = ?)",
      [ENGINEER],
    );
    // A new exceedance after the clearing raises a new alert (alert level: planner not told).
    await capture([3.5, 3.5]);
    const held = await q(
      `SELECT id, TIMESTAMPDIFF(SECOND, CURRENT_TIMESTAMP(3), next_attempt_at) AS wait_s
         FROM outbox WHERE kind = 'alert-hourly' AND outcome IS NULL`,
    );
    expect(held.length).toBeGreaterThan(0);
    // Held until the next full hour: between 0 and 3600 s away.
    for (const h of held) {
      expect(Number(h.wait_s)).toBeGreaterThanOrEqual(0);
      expect(Number(h.wait_s)).toBeLessThanOrEqual(3600);
    }
    const before = (await received('alert change')).length;
    await srv.mail.sender.drain();
    expect((await received('alert change')).length).toBe(before);

    // The hour has come.
    await q(
      "UPDATE outbox SET next_attempt_at = CURRENT_TIMESTAMP(3) - INTERVAL 1 SECOND WHERE kind = 'alert-hourly'",
    );
    await srv.mail.sender.drain();
    const summaries = await received('alert change');
    expect(summaries.length).toBe(before + 1);
    const m = summaries.at(-1)!;
    expect(m.mail_to).toBe(ENGINEER);
    expect(m.subject).toBe(
      `[Turnstone] ${held.length} alert change${held.length === 1 ? '' : 's'} in the last hour`,
    );
    const text = String(m.text_body);
    expect(text).toMatch(/Alert raised: Intake pump P-101 MFP-P101-MDE-H — Overall velocity/);
    expect(text.split(SAFETY_CAUTION).length).toBe(2); // the caution once, not per change
    const closed = await q(
      `SELECT outcome, lease_owner FROM outbox WHERE kind = 'alert-hourly' AND id IN (${held.map((h) => h.id).join(',')})`,
    );
    expect(
      closed.every((c) => c.outcome === 'sent' && String(c.lease_owner).startsWith('summary:')),
    ).toBe(true);
    await srv.mail.sender.drain();
    expect((await received('alert change')).length).toBe(before + 1);
    await q("UPDATE subscriptions SET cadence = 'immediate'");
  });
});

describe('outbox delivery', () => {
  async function deadSend(dedupeKey: string) {
    await queueMail(srv, {
      dedupeKey,
      to: 'someone@example.test',
      subject: `Dead worker ${dedupeKey}`,
    });
    // A worker claims the row, marks the send started … and dies.
    const claimed = await claimOutbox(srv.ctx.db, 'dead-worker', 60, 50);
    const row = claimed.find((r) => r.dedupeKey === dedupeKey)!;
    expect(await markSendingStarted(srv.ctx.db, row.id, 'dead-worker')).toBe(true);
    return row;
  }
  const expireLeases = () =>
    q(
      'UPDATE outbox SET lease_expires_at = CURRENT_TIMESTAMP(3) - INTERVAL 1 SECOND WHERE sent_at IS NULL',
    );
  const copies = async (subject: string) =>
    (await q('SELECT id FROM mail_messages WHERE subject = ?', [subject])).length;

  it('when a worker died mid-send before the fake got the message, the next sender sends it once', async () => {
    const row = await deadSend('dead-1');
    await expireLeases();
    const results = await srv.mail.sender.drain();
    expect(results).toEqual([{ id: row.id, result: 'sent' }]);
    expect(await copies('Dead worker dead-1')).toBe(1);
    const [r] = await q('SELECT sent_at, outcome, attempts FROM outbox WHERE id = ?', [row.id]);
    expect(r!.outcome).toBe('sent');
    expect(Number(r!.attempts)).toBe(2);
    expect(await srv.mail.sender.drain()).toEqual([]);
    expect(await copies('Dead worker dead-1')).toBe(1);
  });

  it('when a worker died after the fake accepted the message, the row is marked sent and not sent again', async () => {
    const row = await deadSend('dead-2');
    // The dead worker's SMTP conversation had finished: the fake holds the message.
    const t = nodemailer.createTransport(srv.mail.smtpUrl);
    await t.sendMail({
      from: 'turnstone@localhost',
      to: row.toAddress,
      subject: row.subject,
      text: row.textBody,
      messageId: messageIdOf(row),
    });
    t.close();
    await expireLeases();
    const results = await srv.mail.sender.drain();
    expect(results).toEqual([{ id: row.id, result: 'confirmed-earlier' }]);
    expect(await copies('Dead worker dead-2')).toBe(1);
    const [r] = await q('SELECT sent_at, outcome FROM outbox WHERE id = ?', [row.id]);
    expect(r!.outcome).toBe('sent');
    expect(r!.sent_at).not.toBeNull();
  });

  it('when the relay cannot be asked (real SMTP_URL), a half-sent row ends uncertain and is not resent', async () => {
    const row = await deadSend('dead-3');
    await expireLeases();
    const relay = createOutboxSender(srv.ctx, {
      smtpUrl: srv.mail.smtpUrl,
      canConfirmArrival: false,
      owner: 'relay-sender',
    });
    const results = await relay.drain();
    await relay.stop();
    expect(results).toEqual([{ id: row.id, result: 'uncertain' }]);
    expect(await copies('Dead worker dead-3')).toBe(0);
    const [r] = await q('SELECT sent_at, outcome, last_error FROM outbox WHERE id = ?', [row.id]);
    expect(r!.outcome).toBe('uncertain');
    expect(r!.sent_at).toBeNull();
    expect(String(r!.last_error)).toMatch(/not sent again/);
    expect(await srv.mail.sender.drain()).toEqual([]);
  });

  it('when the relay is unreachable, the row waits with back-off and its error, and nothing else is held up', async () => {
    await queueMail(srv, {
      dedupeKey: 'unreachable-1',
      to: 'someone@example.test',
      subject: 'Unreachable relay',
    });
    // Port 1 on loopback: nothing listens (connection refused).
    const broken = createOutboxSender(srv.ctx, {
      smtpUrl: 'smtp://127.0.0.1:1',
      canConfirmArrival: false,
      owner: 'broken',
    });
    const results = await broken.drain();
    await broken.stop();
    expect(results.map((r) => r.result)).toEqual(['retry']);
    const [r] = await q(
      `SELECT attempts, last_error, sending_started_at, outcome,
              TIMESTAMPDIFF(SECOND, CURRENT_TIMESTAMP(3), next_attempt_at) AS wait_s
         FROM outbox WHERE dedupe_key = 'unreachable-1'`,
    );
    expect(Number(r!.attempts)).toBe(1);
    expect(String(r!.last_error)).toMatch(/ECONNREFUSED|connect/i);
    expect(r!.sending_started_at).toBeNull();
    expect(r!.outcome).toBeNull();
    // First back-off 30 s (outboxRetryDelayS(1)); common practice, no source.
    expect(Number(r!.wait_s)).toBeGreaterThanOrEqual(28);
    expect(Number(r!.wait_s)).toBeLessThanOrEqual(30);
    // Analysis is unaffected: a capture still goes through while the row waits.
    await capture([1.0]);
    const [snap] = await q(`SELECT status FROM snapshots ORDER BY id DESC LIMIT 1`);
    expect(snap!.status).toBe('done');
  });
});

describe('undelivered mail', () => {
  it('the admin sees mail not delivered and sends an uncertain message again, once; others cannot', async () => {
    const list = async () =>
      (
        await (
          await srv.call('GET', '/api/v1/mail/undelivered', { cookie: srv.cookies.admin })
        ).json()
      ).items as { id: number; subject: string; state: string; nextAttemptAt: string | null }[];
    const items = await list();
    const uncertain = items.find((i) => i.subject.includes('Dead worker dead-3'))!;
    const retrying = items.find((i) => i.subject === 'Unreachable relay')!;
    expect(uncertain).toMatchObject({ state: 'uncertain', nextAttemptAt: null });
    expect(retrying.state).toBe('retrying');
    expect(retrying.nextAttemptAt).not.toBeNull();
    expect(items.some((i) => i.state === 'failed' || i.subject.includes('dead-1'))).toBe(false);

    const engineer = await srv.signIn('engineer');
    expect((await srv.call('GET', '/api/v1/mail/undelivered', { cookie: engineer })).status).toBe(
      403,
    );
    // A message still being retried is the sender's business, not a person's.
    const early = await srv.call('POST', `/api/v1/mail/undelivered/${retrying.id}/resend`, {
      cookie: srv.cookies.admin,
    });
    expect(early.status).toBe(409);

    const res = await srv.call('POST', `/api/v1/mail/undelivered/${uncertain.id}/resend`, {
      cookie: srv.cookies.admin,
    });
    expect(res.status).toBe(204);
    expect(await srv.mail.sender.drain()).toContainEqual({ id: uncertain.id, result: 'sent' });
    expect((await received('Dead worker dead-3')).length).toBe(1);
    expect((await list()).some((i) => i.id === uncertain.id)).toBe(false);
    const [audit] = await q(
      "SELECT actor_user_id, site_id FROM audit_log WHERE action = 'mail.resend' AND entity_id = ?",
      [String(uncertain.id)],
    );
    expect(audit).toMatchObject({ site_id: null });
    // Sent now: sending it again is refused.
    expect(
      (
        await srv.call('POST', `/api/v1/mail/undelivered/${uncertain.id}/resend`, {
          cookie: srv.cookies.admin,
        })
      ).status,
    ).toBe(409);
  });
});

describe('weekly digest', () => {
  it('when the digest runs, the planner gets the review summary built from the captured data, once per week', async () => {
    const weekEnding = new Date().toISOString().slice(0, 10);
    expect(await queueWeeklyDigests(srv.ctx, { weekEnding })).toBe(1);
    expect(await queueWeeklyDigests(srv.ctx, { weekEnding })).toBe(1); // same key: no second row
    await srv.mail.sender.drain();
    const digests = await received('Weekly digest');
    expect(digests.length).toBe(1);
    expect(digests[0]!.mail_to).toBe(PLANNER);
    const text = String(digests[0]!.text_body);
    const [alerts] = await q(
      `SELECT COUNT(*) AS n FROM alerts WHERE state <> 'cleared' AND point_id IN
         (SELECT p.id FROM points p JOIN machines m ON m.id = p.machine_id JOIN areas a ON a.id = m.area_id)`,
    );
    expect(text).toContain(`open alerts: ${Number(alerts!.n)}`);
    expect(text).toContain(`week ending ${weekEnding}`);
    expect(text).toContain(`${srv.url}/review?weekEnding=${weekEnding}`);
    expect(text).toContain(SAFETY_CAUTION);
  });
});
