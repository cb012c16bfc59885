/**
 * The unit-system preference: stored with the account, in the session, and followed by the
 * trend CSV, the review CSV and the alert e-mail of each recipient. Values stay stored in
 * metric; 1 in = 25.4 mm exactly (NIST SP 811 appendix B; 1959 international yard and pound
 * agreement), so an imperial value is the metric one ÷ 25.4.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { strFromU8, unzipSync } from 'fflate';
import Papa from 'papaparse';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { captureVelocities, gatewayKey } from '../support/alert-captures.ts';

let srv: TestServer;
const TAG = 'MFP-P101-MDE-H';

beforeAll(async () => {
  srv = await startTestServer();
});
afterAll(async () => {
  await srv?.stop();
});

const session = async (cookie: string) =>
  (await (await srv.call('GET', '/api/v1/auth/session', { cookie })).json()).user;

describe('unit system preference', () => {
  it('when a user chooses imperial, it is stored with the account and named in the session', async () => {
    const engineer = await srv.signIn('engineer');
    expect((await session(engineer)).unitSystem).toBe('metric');
    const got = await srv.call('GET', '/api/v1/account/preferences', { cookie: engineer });
    expect(await got.json()).toEqual({ unitSystem: 'metric' });

    const put = await srv.call('PUT', '/api/v1/account/preferences', {
      cookie: engineer,
      body: { unitSystem: 'imperial' },
    });
    expect(put.status).toBe(200);
    expect(await put.json()).toEqual({ unitSystem: 'imperial' });
    expect((await session(engineer)).unitSystem).toBe('imperial');
    const [row] = await srv.q<{ unit_system: string }>(
      'SELECT unit_system FROM users WHERE email = ?',
      ['engineer@turnstone.local'],
    );
    expect(row!.unit_system).toBe('imperial');
    // Another user's preference is their own.
    expect((await session(await srv.signIn('operator'))).unitSystem).toBe('metric');
  });

  it('when the unit system is not one of the two, it answers 400 and keeps the stored one', async () => {
    const engineer = await srv.signIn('engineer');
    const bad = await srv.call('PUT', '/api/v1/account/preferences', {
      cookie: engineer,
      body: { unitSystem: 'SI' },
    });
    expect(bad.status).toBe(400);
    expect((await bad.json()).error.details[0].path).toBe('unitSystem');
    expect((await session(engineer)).unitSystem).toBe('imperial');
  });

  it('when captures raise an alert, the imperial recipient reads in/s and the metric one mm/s', async () => {
    // P-101 (ISO 20816-3 group 2 rigid; template alert 2.8 mm/s, persistence 2, from memory):
    // two captures at 3.5 mm/s raise the overall velocity alert.
    await captureVelocities(srv, await gatewayKey(srv, 1), TAG, [1.5, 3.5, 3.5]);
    await srv.mail.sender.drain();
    const mails = await srv.q<{
      mail_to: string;
      text_body: string;
      html_body: string;
      subject: string;
    }>(
      `SELECT mail_to, text_body, html_body, subject FROM mail_messages
        WHERE subject LIKE '%Alert raised%' AND subject LIKE '%Overall%' ORDER BY id`,
    );
    const engineer = mails.find((m) => m.mail_to === 'engineer@turnstone.local')!;
    const operator = mails.find((m) => m.mail_to === 'operator@turnstone.local')!;
    const [alert] = await srv.q<{ last_value: number; limit_value: number }>(
      `SELECT a.last_value, a.limit_value FROM alerts a JOIN points p ON p.id = a.point_id
        WHERE p.tag = ? AND a.band_key = 'overall-velocity'`,
      [TAG],
    );
    // 2.8 / 25.4 = 0.11024 in/s (by hand); the value is the raising event's, ÷ 25.4.
    expect(engineer.text_body).toMatch(
      /Value:\s+0\.1[2-4]\d in\/s against the alert level 0\.110 in\/s/,
    );
    expect(engineer.text_body).not.toContain('mm/s');
    expect(engineer.subject).toContain('in/s');
    // The HTML part too: the band picture's alt text and the picture itself (an SVG data URL).
    const html = String(engineer.html_body);
    expect(html).toMatch(
      /alt="Trend of [^"]*latest 0\.1[2-4]\d in\/s against the alert level 0\.110 in\/s"/,
    );
    // The sent message carries the picture as an attachment (cid:); the outbox keeps the
    // rendered HTML with the SVG inline.
    const [queued] = await srv.q<{ html_body: string }>(
      `SELECT html_body FROM outbox WHERE to_address = ? AND subject = ?`,
      [engineer.mail_to, engineer.subject],
    );
    const svg = /data:image\/svg\+xml;base64,([A-Za-z0-9+/=]+)/.exec(String(queued!.html_body));
    expect(svg).not.toBeNull();
    const picture = Buffer.from(svg![1]!, 'base64').toString('utf8');
    expect(picture).toContain('in/s');
    for (const part of [html, picture]) expect(part).not.toContain('mm/s');
    expect(String(operator.html_body)).toMatch(/alt="Trend of [^"]*2\.80 mm\/s"/);
    expect(operator.text_body).toMatch(
      /Value:\s+3\.[3-7]\d mm\/s against the alert level 2\.80 mm\/s/,
    );
    expect(alert!.limit_value).toBeCloseTo(2.8, 6); // stored metric, whatever anyone reads
  });

  it('when an imperial user exports the trend, the CSV column is in/s and each value is the metric one ÷ 25.4', async () => {
    const [p] = await srv.q<{ id: number }>('SELECT id FROM points WHERE tag = ?', [TAG]);
    const url = `/api/v1/points/${p!.id}/trend.csv?band=overall-velocity`;
    const imperial = await (
      await srv.call('GET', url, { cookie: await srv.signIn('engineer') })
    ).text();
    const metric = await (
      await srv.call('GET', url, { cookie: await srv.signIn('operator') })
    ).text();
    const rows = (t: string) => t.trim().split('\n');
    expect(rows(imperial)[0]).toMatch(/^taken_at_utc,overall-velocity_in_per_s,quality/);
    expect(rows(metric)[0]).toMatch(/^taken_at_utc,overall-velocity_mm_per_s,quality/);
    expect(rows(imperial).length).toBe(rows(metric).length);
    expect(rows(metric).length).toBeGreaterThan(3);
    for (let i = 1; i < rows(metric).length; i++) {
      const m = Number(rows(metric)[i]!.split(',')[1]);
      const v = Number(rows(imperial)[i]!.split(',')[1]);
      expect(v).toBeCloseTo(m / 25.4, 12);
    }
  });

  it('when an imperial planner exports the review, its velocity columns are in in/s', async () => {
    const planner = await srv.signIn('planner');
    await srv.call('PUT', '/api/v1/account/preferences', {
      cookie: planner,
      body: { unitSystem: 'imperial' },
    });
    const week = new Date().toISOString().slice(0, 10);
    const res = await srv.call('GET', `/api/v1/review.zip?weekEnding=${week}`, { cookie: planner });
    expect(res.status).toBe(200);
    const files = unzipSync(new Uint8Array(await res.arrayBuffer()));
    const alerts = Papa.parse<Record<string, string>>(
      strFromU8(files['open-alerts.csv']!).replace(/^\uFEFF/, ''),
      { header: true, skipEmptyLines: true },
    );
    const row = alerts.data.find((r) => r.point === TAG && r.band?.startsWith('Overall velocity'));
    expect(row).toBeDefined();
    expect(row!.unit).toBe('in/s');
    // The limit 2.8 mm/s ÷ 25.4 = 0.1102362… in/s (by hand).
    expect(Number(row!.limit)).toBeCloseTo(2.8 / 25.4, 5);
    for (const name of Object.keys(files)) expect(strFromU8(files[name]!)).not.toContain('mm/s');
  });

  it('when an imperial engineer reads the audit log, a changed level is written in in/s and the metric admin reads mm/s', async () => {
    const engineer = await srv.signIn('engineer'); // imperial since the first test
    const [p] = await srv.q<{ id: number }>('SELECT id FROM points WHERE tag = ?', [TAG]);
    const url = `/api/v1/points/${p!.id}/limits`;
    const set = await (await srv.call('GET', url, { cookie: engineer })).json();
    const bands = set.bands.map((b: { key: string; alertLevel: number }) =>
      b.key === 'overall-velocity' ? { ...b, alertLevel: 3.1 } : b,
    );
    const put = await srv.call('PUT', url, {
      cookie: engineer,
      body: { bands, reason: "Audit in the reader's units" },
    });
    expect(put.status).toBe(200);
    const change = async (cookie: string) => {
      const page = await (await srv.call('GET', '/api/v1/audit?entity=point', { cookie })).json();
      const entry = page.items.find((e: { changes: { field: string }[] }) =>
        e.changes.some((c) => c.field.endsWith('· alert level')),
      );
      return entry.changes.find((c: { field: string }) => c.field.endsWith('· alert level'));
    };
    // 2.8 / 25.4 = 0.110236… → 0.1102 and 3.1 / 25.4 = 0.122047… → 0.1220 in/s, four
    // significant digits (by hand).
    expect(await change(engineer)).toMatchObject({ before: '0.1102 in/s', after: '0.1220 in/s' });
    expect(await change(await srv.signIn('admin'))).toMatchObject({
      before: '2.8 mm/s',
      after: '3.1 mm/s',
    });
  });
});
