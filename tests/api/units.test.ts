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
    const mails = await srv.q<{ mail_to: string; text_body: string; subject: string }>(
      `SELECT mail_to, text_body, subject FROM mail_messages
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
});
