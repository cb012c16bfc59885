/**
 * The long trend from stored hour summaries (`band_value_hours`) against the long trend from
 * every raw band value (the path it replaces), on a real MariaDB:
 * - the hours the worker keeps equal hours computed here from the raw rows (an independent
 *   grouping by UTC hour), with captures exactly on hour boundaries, a late capture into an
 *   hour already summed, an unusable (clipped) capture, a re-analysis replacing a capture's
 *   values, and the point's deletion;
 * - the thinned answer from the hours equals the one from the raw values (same buckets, the
 *   same values at the same times, the same kept values) over a year with gaps, values tied
 *   within an hour, two captures at one instant, unusable spikes, periods that start and end
 *   mid-hour, and a period bounded in a zone with a clock change (Europe/Berlin, 2025-03-30):
 *   buckets are whole UTC hours whatever the zone, so the clock change moves nothing.
 * The rule both follow (each bucket's lowest and highest value, the first in time order
 * among equals) is min/max bucket aggregation as in M4 (Jugel et al., PVLDB 7(10), 2014);
 * ties broken by (taken_at, analysis id) is our own rule (common practice, no source).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mulberry32 } from '@turnstone/dsp/seeded-random';
import { trendResponseSchema } from '@turnstone/contracts/trend';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { deletePoints } from '../../apps/server/src/features/setup/setup-repository.ts';
import {
  rebuildPointHours,
  refreshBandHours,
} from '../../apps/server/src/features/analysis/band-hours-repository.ts';
import {
  trendValues,
  trendValuesFromRaw,
} from '../../apps/server/src/features/points/trend-values.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { snapshotBody } from '../support/signals.ts';

const H = 3_600_000;
let srv: TestServer;
let key: string;
let admin: string;

beforeAll(async () => {
  srv = await startTestServer();
  admin = await srv.signIn('admin');
  const [site] = await srv.q("SELECT id FROM sites WHERE code = 'MFP'");
  key = await srv.gatewayKey(Number(site!.id), 'gw-hours');
});
afterAll(async () => {
  await srv?.stop();
});

const pointOf = async (tag: string) =>
  Number((await srv.q<{ id: number }>('SELECT id FROM points WHERE tag = ?', [tag]))[0]!.id);

interface Raw {
  bandKey: string;
  t: number;
  value: number;
  quality: string;
  analysisId: number;
}

/** The point's hours as stored, keyed band|hour. */
async function storedHours(pointId: number) {
  const rows = await srv.q<Record<string, unknown>>(
    `SELECT band_key, UNIX_TIMESTAMP(hour_at) * 1000 AS h, n, sum_value, min_value,
            UNIX_TIMESTAMP(min_at) * 1000 AS min_t, min_analysis_id, min_quality, max_value,
            UNIX_TIMESTAMP(max_at) * 1000 AS max_t, max_analysis_id, max_quality
       FROM band_value_hours WHERE point_id = ? ORDER BY band_key, hour_at`,
    [pointId],
  );
  return rows.map((r) => ({
    key: `${r.band_key}|${Number(r.h)}`,
    n: Number(r.n),
    sum: Number(r.sum_value),
    lo: [Number(r.min_value), Number(r.min_t), Number(r.min_analysis_id), r.min_quality],
    hi: [Number(r.max_value), Number(r.max_t), Number(r.max_analysis_id), r.max_quality],
  }));
}

/** The same hours grouped here from the raw rows (not by the code under test). */
async function expectedHours(pointId: number) {
  const raw = (
    await srv.q<Record<string, unknown>>(
      `SELECT band_key, UNIX_TIMESTAMP(taken_at) * 1000 AS t, value, quality_verdict,
              analysis_id FROM band_values WHERE point_id = ?`,
      [pointId],
    )
  ).map((r): Raw => ({
    bandKey: String(r.band_key),
    t: Number(r.t),
    value: Number(r.value),
    quality: String(r.quality_verdict),
    analysisId: Number(r.analysis_id),
  }));
  raw.sort(
    (a, b) => a.bandKey.localeCompare(b.bandKey) || a.t - b.t || a.analysisId - b.analysisId,
  );
  const out = new Map<string, { n: number; sum: number; lo: Raw; hi: Raw }>();
  for (const r of raw) {
    const k = `${r.bandKey}|${Math.floor(r.t / H) * H}`;
    const g = out.get(k);
    if (!g) out.set(k, { n: 1, sum: r.value, lo: r, hi: r });
    else {
      g.n++;
      g.sum += r.value;
      if (r.value < g.lo.value) g.lo = r;
      if (r.value > g.hi.value) g.hi = r;
    }
  }
  const of = (r: Raw) => [r.value, r.t, r.analysisId, r.quality];
  return [...out]
    .map(([k, g]) => ({ key: k, n: g.n, sum: g.sum, lo: of(g.lo), hi: of(g.hi) }))
    .sort((a, b) => (a.key < b.key ? -1 : 1));
}

async function expectHoursExact(pointId: number) {
  const stored = await storedHours(pointId);
  const expected = await expectedHours(pointId);
  const bare = (hs: { sum: number }[]) => hs.map((h) => ({ ...h, sum: 0 }));
  expect(bare(stored)).toEqual(bare(expected));
  // sums in another order of addition: equal to rounding
  stored.forEach((h, i) => expect(h.sum).toBeCloseTo(expected[i]!.sum, 9));
}

describe('the hours the worker keeps', () => {
  const tag = 'MFP-P102-MNDE-H';
  const at = (s: string) => `2024-02-10T${s}Z`;
  async function post(uid: string, takenAt: string, peakG: number) {
    const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
      body: snapshotBody(tag, uid, { takenAt, tones: [{ hz: 24.7, peakG }], seed: uid.length }),
      headers: { authorization: `Bearer ${key}` },
    });
    expect(res.status).toBe(201);
  }

  it('equal hours summed from the raw rows, through boundaries, late captures, clipping, re-analysis and deletion', async () => {
    const pointId = await pointOf(tag);
    await post('h-1', at('10:00:00.000'), 0.01); // on the hour: hour 10
    await post('h-2', at('10:59:59.999'), 0.014); // last instant of hour 10
    await post('h-3', at('11:00:00.000'), 0.012); // on the hour: hour 11
    await post('h-4', at('12:30:00.000'), 80); // 80 g on a ±50 g channel: clipped, unusable
    await createWorker(srv.ctx, { owner: 'hours-test' }).drain();
    await expectHoursExact(pointId);
    const hour10 = () =>
      storedHours(pointId).then((hs) =>
        hs.find((h) => h.key === `overall-velocity|${Date.parse(at('10:00:00.000'))}`),
      );
    expect((await hour10())!.n).toBe(2);
    const clipped = (await storedHours(pointId)).find(
      (h) => h.key === `overall-velocity|${Date.parse(at('12:00:00.000'))}`,
    );
    expect(clipped!.hi[3]).toBe('unusable');

    // (small tones, under any alert level: the point is deleted at the end)
    // A late capture into hour 10, after hours 11 and 12 were written: the new maximum.
    await post('h-5', at('10:20:00.000'), 0.03);
    await createWorker(srv.ctx, { owner: 'hours-test' }).drain();
    await expectHoursExact(pointId);
    const late = await hour10();
    expect(late!.n).toBe(3);
    expect(late!.hi[1]).toBe(Date.parse(at('10:20:00.000')));

    // A re-analysis replaces that capture's values (new analysis id, far lower values) in one
    // transaction with the refresh: the hour's maximum goes back to an earlier capture.
    const [a] = await srv.q<{ id: number }>(
      "SELECT analysis_id AS id FROM band_values WHERE point_id = ? AND taken_at = '2024-02-10 10:20:00'",
      [pointId],
    );
    await srv.ctx.db.transaction(async (tx) => {
      type Conn = { query(text: string, params: unknown[]): Promise<unknown> };
      const conn = (tx as unknown as { session: { client: Conn } }).session.client;
      await conn.query(
        `INSERT INTO band_values (analysis_id, point_id, band_key, taken_at, value, quality_verdict)
         SELECT ?, point_id, band_key, taken_at, value / 100, quality_verdict FROM band_values
          WHERE analysis_id = ? AND taken_at = '2024-02-10 10:20:00'`,
        [Number(a!.id) + 1_000_000, a!.id],
      );
      await conn.query(
        "DELETE FROM band_values WHERE analysis_id = ? AND taken_at = '2024-02-10 10:20:00'",
        [a!.id],
      );
      await refreshBandHours(tx, [{ pointId, hourAt: new Date(at('10:20:00.000')) }]);
    });
    await expectHoursExact(pointId);
    const replaced = await hour10();
    expect(replaced!.n).toBe(3);
    expect(replaced!.hi[1]).not.toBe(Date.parse(at('10:20:00.000')));
    expect(replaced!.lo[2]).toBe(Number(a!.id) + 1_000_000);

    // Recomputing everything gives what the worker kept.
    const kept = await storedHours(pointId);
    await srv.ctx.db.transaction((tx) => rebuildPointHours(tx, pointId));
    expect(await storedHours(pointId)).toEqual(kept);

    // The point's deletion takes its hours.
    await srv.ctx.db.transaction((tx) => deletePoints(tx, [pointId]));
    expect(await srv.q('SELECT 1 FROM band_value_hours WHERE point_id = ?', [pointId])).toEqual([]);
  });
});

describe('the long trend from the hours', () => {
  const tag = 'MFP-P101-MDE-V';
  const band = 'overall-velocity';
  const Y0 = Date.UTC(2025, 0, 1);
  let pointId: number;
  const marks: Date[] = [];

  beforeAll(async () => {
    pointId = await pointOf(tag);
    // one capture through the pipeline first, long before the year: the point's bands
    const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
      body: snapshotBody(tag, 'year-first', { takenAt: '2024-06-01T00:00:00Z' }),
      headers: { authorization: `Bearer ${key}` },
    });
    expect(res.status).toBe(201);
    await createWorker(srv.ctx, { owner: 'hours-test' }).drain();
    // A year of values 5–60 minutes apart, seeded so a failure repeats.
    const r = mulberry32(18);
    const rows: unknown[][] = [];
    let id = 60_000_000;
    for (
      let t = Y0 + 7 * 60_000;
      t < Date.UTC(2026, 0, 1);
      t += Math.floor(5 + 55 * r()) * 60_000
    ) {
      if (t >= Date.UTC(2025, 6, 1) && t < Date.UTC(2025, 6, 22)) continue; // three weeks off
      const i = id++ - 60_000_000;
      const at = i % 50 === 0 ? Math.floor(t / H) * H : t; // some exactly on the hour
      const unusable = i % 97 === 0;
      // values to one decimal: ties within an hour are common
      const v = unusable ? 40 + Math.round(r() * 100) / 10 : Math.round((2 + r()) * 10) / 10;
      const q = unusable ? 'unusable' : i % 13 === 0 ? 'suspect' : 'ok';
      if (i % 37 === 0) {
        // two captures at one instant: the later analysis id inserted first
        rows.push([id + 500_000, pointId, band, new Date(at), v, q]);
        rows.push([id, pointId, band, new Date(at), v, q]);
      } else rows.push([id, pointId, band, new Date(at), v, q]);
      if (i % 701 === 0) marks.push(new Date(at + 60_000));
    }
    marks.push(new Date(Date.UTC(2025, 6, 10)), new Date(Y0 - H)); // in the gap; before every value
    const conn = await srv.ctx.dbHandle.pool.getConnection();
    try {
      for (let i = 0; i < rows.length; i += 2000)
        await conn.query(
          'INSERT INTO band_values (analysis_id, point_id, band_key, taken_at, value, quality_verdict) VALUES ?',
          [rows.slice(i, i + 2000)],
        );
    } finally {
      conn.release();
    }
    await srv.ctx.db.transaction((tx) => rebuildPointHours(tx, pointId));
  });

  const periods: [string, string, string][] = [
    ['the year', '2025-01-01T00:00:00.000Z', '2025-12-31T23:59:59.999Z'],
    ['mid-hour bounds', '2025-01-03T07:13:27.123Z', '2025-11-30T18:45:00.001Z'],
    ['across the gap', '2025-06-20T10:30:00.000Z', '2025-08-02T00:00:00.000Z'],
    ['a clock change in Berlin', '2025-03-29T00:00:00+01:00', '2025-04-30T00:00:00+02:00'],
    ['beyond the values', '2024-10-01T00:00:00.000Z', '2026-03-01T00:00:00.000Z'],
    ['few values, wide buckets', '2025-07-15T00:00:00.000Z', '2025-08-10T00:00:00.000Z'],
  ];
  it.each(periods)('%s: the same answer as from every raw value', async (_, from, to) => {
    const f = new Date(from);
    const t = new Date(to);
    const fromHours = await trendValues(srv.ctx.db, pointId, band, f, t, marks);
    const fromRaw = await trendValuesFromRaw(srv.ctx.db, pointId, band, f, t, marks);
    expect(fromHours).toEqual(fromRaw);
    if (_ !== 'few values, wide buckets') {
      expect(fromRaw.decimation!.bucketMs % H).toBe(0);
      expect(fromRaw.items.length).toBeLessThan(fromRaw.decimation!.total);
    }
  });

  it('reads the hours: a stale hour would show (so the check above can fail)', async () => {
    const f = new Date(periods[0]![1]);
    const t = new Date(periods[0]![2]);
    await srv.q(
      "UPDATE band_value_hours SET max_value = 99 WHERE point_id = ? AND hour_at = '2025-05-05 05:00:00'",
      [pointId],
    );
    const stale = await trendValues(srv.ctx.db, pointId, band, f, t, marks);
    expect(stale.items.some((i) => i.value === 99)).toBe(true);
    await refreshBandHours(srv.ctx.db, [{ pointId, hourAt: new Date('2025-05-05T05:00:00Z') }]);
    expect(await trendValues(srv.ctx.db, pointId, band, f, t, marks)).toEqual(
      await trendValuesFromRaw(srv.ctx.db, pointId, band, f, t, marks),
    );
  });

  it('the trend API answers the year from the hours, within 60 kB', async () => {
    const [from, to] = [periods[0]![1], periods[0]![2]];
    const res = await srv.call(
      'GET',
      `/api/v1/points/${pointId}/trend?band=${band}&from=${from}&to=${to}`,
      { cookie: admin },
    );
    expect(res.status).toBe(200);
    const text = await res.text();
    expect(Buffer.byteLength(text)).toBeLessThanOrEqual(60_000);
    const body = trendResponseSchema.parse(JSON.parse(text));
    const raw = await trendValuesFromRaw(
      srv.ctx.db,
      pointId,
      band,
      new Date(from),
      new Date(to),
      [],
    );
    // the API keeps the values behind this band's alert transitions, of which it has none here
    expect(body.items).toEqual(
      raw.items.map((r) => ({
        t: new Date(r.t).toISOString(),
        v: r.value,
        q: r.quality,
        analysisId: r.analysisId,
      })),
    );
    expect(body.decimation).toEqual(raw.decimation);
  });
});
