/**
 * The alert mail's signed link and picture, and the alert detail's band facts, against the
 * running server, worker and local SMTP fake (nothing mocked): captures raise an alert, the
 * mail goes out, its link opens the alert only with its own signature and still needs a
 * session, and its picture is the band's trend with the levels in force.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import nodemailer from 'nodemailer';
import { messageOf } from '../../apps/server/src/features/mail/outbox-sender.ts';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { SAFETY_CAUTION } from '../../apps/server/src/features/mail/mail-templates.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { postVelocities } from '../support/alert-captures.ts';

let srv: TestServer;
let key = '';
const t0 = Date.now() - 10 * 24 * 3600_000;
let seq = 0;
const TAG = 'MFP-P101-MDE-H';
const OPERATOR = 'operator@turnstone.local';

type Row = Record<string, unknown>;
const q = (sqlText: string, params: unknown[] = []) => srv.q<Row>(sqlText, params);

async function capture(velocities: number[]) {
  seq = await postVelocities(srv, key, TAG, velocities, { t0, from: seq, uidPrefix: 'link' });
  await createWorker(srv.ctx, { owner: 'link-test' }).drain();
}

let alertId = 0;
let operatorMail: Row;

beforeAll(async () => {
  srv = await startTestServer();
  key = await srv.gatewayKey(1, 'gw-link');
  // P-101: ISO 20816-3 group 2 rigid → template alert 2.8 mm/s, danger 4.5 mm/s, raise on 2
  // values in a row (condition package template defaults; ISO 20816-3 zones, from memory).
  await capture([1.5, 1.5, 3.5, 3.5]);
  const [a] = await q(
    `SELECT a.id FROM alerts a JOIN points p ON p.id = a.point_id
      WHERE p.tag = ? AND a.band_key = 'overall-velocity'`,
    [TAG],
  );
  alertId = Number(a!.id);
  await srv.mail.sender.drain();
  const mails = await q(
    `SELECT * FROM mail_messages WHERE mail_to = ? AND subject LIKE '%Alert raised%Overall%'`,
    [OPERATOR],
  );
  expect(mails).toHaveLength(1);
  operatorMail = mails[0]!;
});
afterAll(async () => {
  await srv?.stop();
});

const linkOf = (text: string) =>
  /Open the alert \(sign-in required\): (\S+)/.exec(text)?.[1] ?? 'no link';

describe('the alert mail link', () => {
  it('opens the alert page with the alert selected, and the page still asks for sign-in', async () => {
    const link = linkOf(String(operatorMail.text_body));
    expect(link).toMatch(new RegExp(`^${srv.url}/api/v1/alerts/${alertId}/from-mail\\?sig=`));
    expect(String(operatorMail.html_body)).toContain(`href="${link}"`);
    expect(String(operatorMail.text_body)).toContain(SAFETY_CAUTION);
    const res = await srv.call('GET', link.slice(srv.url.length));
    expect(res.status).toBe(302);
    expect(res.headers.get('location')).toBe(`/alerts?alert=${alertId}`);
    // The link is not a credential: the alert itself still needs a session.
    expect((await srv.call('GET', `/api/v1/alerts/${alertId}`)).status).toBe(401);
    const cookie = await srv.signIn('operator');
    expect((await srv.call('GET', `/api/v1/alerts/${alertId}`, { cookie })).status).toBe(200);
  });

  it('refuses a link bent to another alert, a changed signature, or none', async () => {
    const link = linkOf(String(operatorMail.text_body)).slice(srv.url.length);
    const sig = new URL(link, srv.url).searchParams.get('sig')!;
    const other = await srv.call('GET', `/api/v1/alerts/${alertId + 1}/from-mail?sig=${sig}`);
    expect(other.status).toBe(403);
    expect((await other.json()).error.code).toBe('bad_link_signature');
    const flipped = sig.slice(0, -1) + (sig.endsWith('A') ? 'B' : 'A');
    const changed = await srv.call('GET', `/api/v1/alerts/${alertId}/from-mail?sig=${flipped}`);
    expect(changed.status).toBe(403);
    expect(changed.headers.get('location')).toBeNull();
    const none = await srv.call('GET', `/api/v1/alerts/${alertId}/from-mail`);
    expect(none.status).toBe(400);
  });
});

describe('the alert mail picture', () => {
  it('travels as an inline SVG image of the band values with the alert and danger levels', async () => {
    // Composed as the sender composes it (real nodemailer, its stream transport gives the
    // raw message): the picture is an inline part the HTML names by its Content-ID.
    const [row] = await q(
      `SELECT * FROM outbox WHERE to_address = ? AND kind = 'alert-raised'
      AND subject LIKE '%Overall%'`,
      [OPERATOR],
    );
    const raw = await nodemailer.createTransport({ streamTransport: true, buffer: true }).sendMail(
      messageOf(
        {
          toAddress: String(row!.to_address),
          subject: String(row!.subject),
          textBody: String(row!.text_body),
          htmlBody: String(row!.html_body),
          kind: String(row!.kind),
        },
        'turnstone@test.local',
        '<x@test.local>',
      ),
    );
    const source = (raw.message as Buffer).toString('utf8');
    expect(source).toMatch(/Content-Type: multipart\/related/);
    expect(source).toMatch(/Content-Type: image\/svg\+xml/);
    const cid = /Content-ID: <([^>]+)>/.exec(source)?.[1];
    expect(cid).toBeDefined();
    expect(source).not.toContain('data:image/svg+xml');
    expect(source.replace(/=\r\n/g, '').replace(/=3D/g, '=')).toContain(`src="cid:${cid}"`);
    // As received: the local fake keeps the inline part inside the HTML (a data: URI in
    // place of its cid: reference, for the Mailbox), with alt text for clients that block SVG.
    const html = String(operatorMail.html_body);
    expect(html).not.toContain('cid:');
    const img = /<img src="data:image\/svg\+xml;base64,[^"]+"[^>]*alt="([^"]+)"/.exec(html);
    expect(img, 'an inline image').not.toBeNull();
    expect(img![1]).toMatch(/Trend of Overall velocity.*against the alert level 2\.80 mm\/s/);
    // The picture itself, as queued.
    const m = /src="data:image\/svg\+xml;base64,([^"]+)"/.exec(String(row!.html_body));
    expect(m, 'the queued SVG').not.toBeNull();
    const svg = Buffer.from(m![1]!, 'base64').toString('utf8');
    expect(svg).toMatch(/^<svg[^>]*width="480" height="160"/);
    // The levels in force (template 2.8 / 4.5 mm/s) are drawn and named.
    expect(svg).toContain('alert 2.8');
    expect(svg).toContain('danger 4.5');
    // The four captures' values up to the raising one are the series (title counts them).
    const [n] = await q(
      `SELECT COUNT(*) AS n FROM band_values bv JOIN points p ON p.id = bv.point_id
        WHERE p.tag = ? AND bv.band_key = 'overall-velocity'`,
      [TAG],
    );
    expect(Number(n!.n)).toBe(4);
    expect(svg).toContain('last 4 values (mm/s)');
  });
});

describe('the alert detail', () => {
  it('names what the band measures, the machine zone, the values since raised and the recent values', async () => {
    const cookie = await srv.signIn('operator');
    const res = await srv.call('GET', `/api/v1/alerts/${alertId}`, { cookie });
    const a = await res.json();
    expect(a.bandMeaning).toMatch(/overall RMS vibration velocity from 10 to 1000 Hz/);
    // 3.5 mm/s RMS on a group 2 rigid machine lies between the B/C (2.8) and C/D (4.5 mm/s)
    // boundaries: zone C (ISO 20816-3 Table A.1, from memory). P-101's only captured point.
    expect(a.machineZone).toBe('C');
    // Raised by the second 3.5 value (persistence 2), the newest: no value after it.
    expect(a.valuesSinceRaised).toBe(0);
    expect(a.recentValues).toHaveLength(4);
    expect(a.recentValues[3].value).toBeGreaterThan(3.3);
    expect(a.recentValues[0].value).toBeLessThan(1.7);
    await capture([3.6]);
    const again = await (await srv.call('GET', `/api/v1/alerts/${alertId}`, { cookie })).json();
    expect(again.valuesSinceRaised).toBe(1);
    expect(again.recentValues).toHaveLength(5);
  });
});
