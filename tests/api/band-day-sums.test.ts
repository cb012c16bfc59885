/**
 * The day sums the weekly review reads (band_day_sums): written with the band values by the
 * analysis, keyed by the local day of the point's site, rebuilt when the site's time zone
 * changes, and filled at start for band values that have none. Each capture's local day is
 * decided by Python's zoneinfo (the IANA tz database) run live, not by the product's code.
 */
import { execFileSync } from 'node:child_process';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { fillMissingBandDaySums } from '../../apps/server/src/features/analysis/band-day-sums.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { snapshotBody } from '../support/signals.ts';

let srv: TestServer;
let admin: string;
let pointId: number;

/** Around Berlin's clock change (2026-10-25) and local midnights, where UTC says another day. */
const AT = [
  '2026-10-24T21:30:00Z', // 23:30 CEST on the 24th
  '2026-10-24T22:30:00Z', // 00:30 CEST on the 25th (UTC: the 24th)
  '2026-10-25T00:30:00Z', // 02:30 CEST, before the clocks go back
  '2026-10-25T01:30:00Z', // 02:30 CET, the repeated hour
  '2026-10-25T22:30:00Z', // 23:30 CET on the 25th
  '2026-10-25T23:30:00Z', // 00:30 CET on the 26th (UTC: the 25th)
  '2026-10-26T04:10:00Z', // 05:10 CET; 00:10 in New York, 23:10 the day before in Los Angeles
];

function localDays(zone: string): string[] {
  const code =
    'import sys, json, datetime, zoneinfo\n' +
    `z = zoneinfo.ZoneInfo(${JSON.stringify(zone)})\n` +
    `print(json.dumps([datetime.datetime.fromisoformat(t.replace('Z', '+00:00')).astimezone(z).date().isoformat() for t in ${JSON.stringify(AT)}]))`;
  return JSON.parse(execFileSync('python3', ['-c', code], { encoding: 'utf8' })) as string[];
}

/** The sums expected from the stored band values, grouped by Python's local days. */
async function expectedSums(zone: string) {
  const days = localDays(zone);
  const dayOf = new Map(AT.map((t, i) => [Date.parse(t), days[i]!]));
  const rows = await srv.q(
    `SELECT band_key AS bandKey, taken_at AS takenAt, value FROM band_values
      WHERE point_id = ? AND quality_verdict <> 'unusable'`,
    [pointId],
  );
  const out = new Map<string, { n: number; sumValue: number; sumTakenMs: number }>();
  for (const r of rows) {
    const ms = (r.takenAt as Date).getTime();
    const key = `${String(r.bandKey)}|${dayOf.get(ms)}`;
    const s = out.get(key) ?? { n: 0, sumValue: 0, sumTakenMs: 0 };
    s.n++;
    s.sumValue += Number(r.value);
    s.sumTakenMs += ms;
    out.set(key, s);
  }
  return out;
}

async function storedSums() {
  const rows = await srv.q(
    `SELECT band_key AS bandKey, DATE_FORMAT(day, '%Y-%m-%d') AS day, n, sum_value AS sumValue,
       sum_taken_ms AS sumTakenMs FROM band_day_sums WHERE point_id = ?`,
    [pointId],
  );
  return new Map(
    rows.map((r) => [
      `${String(r.bandKey)}|${String(r.day)}`,
      { n: Number(r.n), sumValue: Number(r.sumValue), sumTakenMs: Number(r.sumTakenMs) },
    ]),
  );
}

async function expectSumsIn(zone: string) {
  const want = await expectedSums(zone);
  const got = await storedSums();
  expect([...got.keys()].sort()).toEqual([...want.keys()].sort());
  for (const [key, w] of want) {
    const g = got.get(key)!;
    expect(g.n, key).toBe(w.n);
    expect(g.sumTakenMs, key).toBe(w.sumTakenMs);
    // Summed in another order than here: equal to rounding (common practice, no source).
    expect(g.sumValue, key).toBeCloseTo(w.sumValue, 9);
  }
}

beforeAll(async () => {
  srv = await startTestServer();
  admin = await srv.signIn('admin');
  const key = (
    await (
      await srv.call('POST', '/api/v1/gateways', { cookie: admin, body: { siteId: 2, name: 'gw' } })
    ).json()
  ).apiKey as string;
  const [p] = await srv.q(
    `SELECT p.id, p.tag FROM points p JOIN sites s ON s.id = p.site_id WHERE s.id = 2 ORDER BY p.id LIMIT 1`,
  );
  pointId = Number(p!.id);
  for (const [i, at] of AT.entries()) {
    const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
      body: snapshotBody(String(p!.tag), `day-sum-${i}`, {
        takenAt: at,
        tones: [{ hz: 24.75, peakG: 0.02 * (1 + i) }],
        noiseG: 0.0005,
        seed: i + 1,
      }),
      headers: { authorization: `Bearer ${key}` },
    });
    expect(res.status, await res.clone().text()).toBe(201);
  }
  await createWorker(srv.ctx).drain();
}, 120_000);
afterAll(async () => {
  await srv?.stop();
});

describe('band day sums', () => {
  it('are written with the band values, by the local day of the site (Europe/Berlin)', async () => {
    const [site] = await srv.q('SELECT time_zone FROM sites WHERE id = 2');
    expect(site!.time_zone).toBe('Europe/Berlin'); // the demo plant's TRB site
    const [bv] = await srv.q('SELECT COUNT(*) AS n FROM band_values WHERE point_id = ?', [pointId]);
    expect(Number(bv!.n)).toBeGreaterThan(AT.length); // several bands per capture
    await expectSumsIn('Europe/Berlin');
  });

  it('follow the site to a new time zone, and an upgraded database is filled at start', async () => {
    const res = await srv.call('PATCH', '/api/v1/sites/2', {
      cookie: admin,
      body: { name: 'Tessel Ridge Board Mill', code: 'TRB', timeZone: 'America/Los_Angeles' },
    });
    expect(res.status, await res.clone().text()).toBe(200);
    await expectSumsIn('America/Los_Angeles');

    // As a database from before the table holds them: band values, no sums.
    await srv.q('DELETE FROM band_day_sums');
    await fillMissingBandDaySums(srv.ctx.db, () => {});
    await expectSumsIn('America/Los_Angeles');
  });
});
