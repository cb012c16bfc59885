/**
 * A point through the dashboard API: its trend (time order, levels in force, thinning for a
 * chart, CSV), the machine and point detail, and per-site access. Spectra, waveforms and
 * downloads: points-spectra.test.ts.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { trendResponseSchema } from '@turnstone/contracts/trend';
import { TREND_MAX_BUCKETS } from '@turnstone/condition/trend-decimation';
import { machineDetailSchema, pointDetailSchema } from '@turnstone/contracts/points';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { rebuildPointHours } from '../../apps/server/src/features/analysis/band-hours-repository.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { snapshotBody } from '../support/signals.ts';
import { analysisOfSnapshot, postSnapshot } from '../support/alert-captures.ts';

let srv: TestServer;
const TAG = 'MFP-P102-MDE-H';
const keys: Record<string, string> = {};
let admin: string;
let operator: string;
let pointId: number;
let trbTag: string;

const ingest = (
  tag: string,
  uid: string,
  o: Parameters<typeof snapshotBody>[2] = {},
  site = 'MFP',
) => postSnapshot(srv, keys[site]!, snapshotBody(tag, uid, o));
const analysisOf = (snapshotId: number) => analysisOfSnapshot(srv, snapshotId);
const get = (path: string, cookie = admin) => srv.call('GET', `/api/v1${path}`, { cookie });

beforeAll(async () => {
  srv = await startTestServer();
  admin = await srv.signIn('admin');
  operator = await srv.signIn('operator');
  for (const code of ['MFP', 'TRB']) {
    const [site] = await srv.q('SELECT id FROM sites WHERE code = ?', [code]);
    keys[code] = await srv.gatewayKey(Number(site!.id), `gw-${code}`);
  }
  const [p] = await srv.q('SELECT id FROM points WHERE tag = ?', [TAG]);
  pointId = Number(p!.id);
  const [t] = await srv.q(
    `SELECT p.tag FROM points p JOIN machines m ON m.id = p.machine_id JOIN areas a ON a.id = m.area_id
     JOIN sites s ON s.id = a.site_id WHERE s.code = 'TRB' ORDER BY p.id LIMIT 1`,
  );
  trbTag = String(t!.tag);
});
afterAll(async () => {
  await srv?.stop();
});

describe('trend', () => {
  it('returns the band values in time order with the levels in force', async () => {
    const t0 = Date.parse('2026-11-01T00:00:00Z');
    const uids: string[] = [];
    // Late arrival first: the trend must still come back oldest first.
    for (const i of [3, 0, 2, 1, 4, 5]) {
      uids.push(`tr-${i}`);
      await ingest(TAG, `tr-${i}`, {
        takenAt: new Date(t0 + i * 86_400_000).toISOString(),
        tones: [{ hz: 24.7, peakG: 0.1 + 0.02 * i }],
        seed: i,
      });
    }
    await createWorker(srv.ctx).drain();
    const res = await get(
      `/points/${pointId}/trend?band=overall-velocity&from=2026-10-30T00:00:00Z&to=2026-11-10T00:00:00Z`,
    );
    expect(res.status).toBe(200);
    const body = trendResponseSchema.parse(await res.json());
    expect(body.items).toHaveLength(6);
    const times = body.items.map((i) => Date.parse(i.t));
    expect(times).toEqual([...times].sort((a, b) => a - b));
    // Each value from the definition: a tone of peak a (g) at f has velocity RMS
    // a·g₀/(2πf)/√2 (v = a/(2πf), textbook; g₀ = 9806.65 mm/s², ISO 80000-3), within 2 %
    // for the noise and the window.
    body.items.forEach((item, day) => {
      const expected = ((0.1 + 0.02 * day) * 9806.65) / (2 * Math.PI * 24.7) / Math.SQRT2;
      expect(Math.abs(item.v / expected - 1)).toBeLessThan(0.02);
    });
    expect(body.band.unit).toBe('mm/s');
    // ISO 20816-3, group 2 (the pump's 160 kW), rigid foundation: zone boundaries
    // B/C 2.8 mm/s and C/D 4.5 mm/s RMS, the fixed alert and danger levels.
    expect(body.levels).toEqual({ alert: 2.8, danger: 4.5, source: 'fixed' });
    // The latest value (8.9 mm/s) is already above danger: nothing left to project to.
    expect(body.projection.outcome).toBe('above-danger');
    expect(body.projection.target).toBeNull();
    expect(body.projection.crossingAt).toBeNull();
  });

  it('answers a year of hourly values thinned for a chart, keeping its peak and alert values', async () => {
    // Only the trend's read path is under test, so a year of band values is written straight
    // into the table (foreign keys off on this one connection: no analyses behind them), and
    // their hour summaries built by the product's own recomputation, as any writer does.
    // The year before this file's other values, so theirs stay the latest.
    const yearPoint = pointId;
    const from = Date.parse('2024-11-01T00:00:00Z');
    const hours = 365 * 24;
    const valueAt = (h: number) => (h === 5000 ? 9.9 : 2 + Math.sin(h / 50) * 0.3 + (h % 7) * 0.01);
    const conn = await srv.ctx.dbHandle.pool.getConnection();
    try {
      await conn.query('SET FOREIGN_KEY_CHECKS = 0');
      for (let h0 = 0; h0 < hours; h0 += 2000) {
        const rows = [];
        for (let h = h0; h < Math.min(hours, h0 + 2000); h++)
          rows.push([
            50_000_000 + h,
            yearPoint,
            'overall-velocity',
            new Date(from + h * 3_600_000),
            valueAt(h),
            'ok',
          ]);
        await conn.query(
          'INSERT INTO band_values (analysis_id, point_id, band_key, taken_at, value, quality_verdict) VALUES ?',
          [rows],
        );
      }
      // An alert raised 20 minutes after hour 7000's capture (a value of no note of its own).
      const [a] = (await conn.query(
        `INSERT INTO alerts (point_id, band_key, band_name, level, state, unit, limit_value,
           first_value, last_value, peak_value, first_at, last_at, peak_at)
         VALUES (?, 'overall-velocity', 'Overall velocity', 'alert', 'cleared', 'mm/s', 2.8,
           2.9, 2.9, 2.9, ?, ?, ?)`,
        [yearPoint, ...Array(3).fill(new Date(from + 7000 * 3_600_000))],
      )) as unknown as [{ insertId: number }];
      await conn.query(
        "INSERT INTO alert_events (alert_id, kind, level, value, at) VALUES (?, 'raised', 'alert', 2.9, ?)",
        [a.insertId, new Date(from + 7000 * 3_600_000 + 20 * 60_000)],
      );
    } finally {
      await conn.query('SET FOREIGN_KEY_CHECKS = 1');
      conn.release();
    }
    await rebuildPointHours(srv.ctx.db, yearPoint);
    const res = await get(
      `/points/${yearPoint}/trend?band=overall-velocity&from=2024-11-01T00:00:00Z&to=2025-10-31T23:59:59Z`,
    );
    expect(res.status).toBe(200);
    const text = await res.text();
    const body = trendResponseSchema.parse(JSON.parse(text));
    expect(body.decimation).toEqual({ total: hours, bucketMs: expect.any(Number) });
    expect(body.items.length).toBeLessThanOrEqual(2 * TREND_MAX_BUCKETS + 3);
    expect(body.items.length).toBeGreaterThan(TREND_MAX_BUCKETS);
    // The answer a chart needs, not the year: the bound for a one-year trend.
    expect(Buffer.byteLength(text)).toBeLessThanOrEqual(60_000);
    const at = (h: number) => new Date(from + h * 3_600_000).toISOString();
    const values = new Map(body.items.map((i) => [i.t, i.v]));
    expect(values.get(at(5000))).toBe(9.9); // the peak
    expect(values.get(at(7000))).toBe(valueAt(7000)); // the value behind the alert
    expect(values.get(at(0))).toBe(valueAt(0));
    expect(values.get(at(hours - 1))).toBe(valueAt(hours - 1)); // the latest value
    // A short period comes whole.
    const week = trendResponseSchema.parse(
      await (
        await get(
          `/points/${yearPoint}/trend?band=overall-velocity&from=2025-06-01T00:00:00Z&to=2025-06-07T23:59:59Z`,
        )
      ).json(),
    );
    expect(week.decimation).toBeNull();
    expect(week.items).toHaveLength(7 * 24);
    await srv.q('DELETE FROM band_values WHERE analysis_id >= 50000000');
    await rebuildPointHours(srv.ctx.db, yearPoint);
    await srv.q('DELETE FROM alerts WHERE point_id = ? AND first_at < ?', [
      yearPoint,
      new Date(from + hours * 3_600_000),
    ]);
  });

  it('the trend CSV has a header with the unit and one row per value', async () => {
    const res = await get(
      `/points/${pointId}/trend.csv?band=overall-velocity&from=2026-10-30T00:00:00Z&to=2026-11-10T00:00:00Z`,
    );
    expect(res.status).toBe(200);
    expect(res.headers.get('content-disposition')).toContain(
      'filename="MFP-P102-MDE-H_overall-velocity_2026-10-30_2026-11-10.csv"',
    );
    const lines = (await res.text()).trim().split('\n');
    expect(lines[0]).toBe('taken_at_utc,overall-velocity_mm_per_s,quality,band_from_hz,band_to_hz');
    expect(lines).toHaveLength(7);
    // each row names the band its value covers: the same band the analyses list gives for
    // that capture (the stored summary's ISO band)
    const analyses = (await (await get(`/points/${pointId}/analyses?limit=100`)).json()).items as {
      takenAt: string;
      overall: { velocityBandHz: [number, number] | null };
    }[];
    for (const line of lines.slice(1)) {
      const [t, , , from, to] = line.split(',');
      const a = analyses.find((x) => Date.parse(x.takenAt) === Date.parse(t!))!;
      expect(a.overall.velocityBandHz).not.toBeNull();
      expect([Number(from), Number(to)]).toEqual(a.overall.velocityBandHz);
    }
  });

  it('an unknown band answers 404 naming the band', async () => {
    const res = await get(`/points/${pointId}/trend?band=no-such-band`);
    expect(res.status).toBe(404);
    expect((await res.json()).error.message).toContain('no-such-band');
  });
});

describe('machine and point detail', () => {
  it('the machine lists its points with latest values, ISO zone and a small trend', async () => {
    const [m] = await srv.q('SELECT machine_id FROM points WHERE id = ?', [pointId]);
    const res = await get(`/machines/${Number(m!.machine_id)}`);
    expect(res.status).toBe(200);
    const body = machineDetailSchema.parse(await res.json());
    const p = body.points.find((x) => x.id === pointId)!;
    expect(p.latest).not.toBeNull();
    // The zone of the latest velocity by the boundaries of ISO 20816-3 group 2 (the pump's
    // 160 kW) on a rigid foundation: A/B 1.4, B/C 2.8, C/D 4.5 mm/s RMS (from memory).
    const vel = p.latest!.overall.velocityRmsMmS;
    expect(p.latest!.isoZone).toBe(vel >= 4.5 ? 'D' : vel >= 2.8 ? 'C' : vel >= 1.4 ? 'B' : 'A');
    expect(p.recentVelocity.length).toBeGreaterThan(5);
    const ts = p.recentVelocity.map((r) => Date.parse(r.t));
    expect(ts).toEqual([...ts].sort((a, b) => a - b));
    // 1× order is 1 by definition; Hz at the nominal speed (r/min ÷ 60).
    const oneX = body.faultFrequencies.find((f) => f.name === '1×')!;
    expect(oneX.order).toBe(1);
    expect(oneX.hz).toBeCloseTo(body.nominalRpm / 60, 9);
    expect(body.faultFrequencies.some((f) => f.kind === 'bpfo')).toBe(true);
  });

  it('the point shows its machine, latest analysis and bands with levels', async () => {
    const body = pointDetailSchema.parse(await (await get(`/points/${pointId}`)).json());
    expect(body.tag).toBe(TAG);
    expect(body.latest).not.toBeNull();
    // every overall value states its band: velocity over the ISO band, acceleration from
    // the ISO band's lower edge to Fmax (ISO 20816-3 band edges, from memory)
    const velocityBand = body.latest!.overall.velocityBandHz!;
    expect([2, 10]).toContain(velocityBand[0]);
    expect(velocityBand[1]).toBeLessThanOrEqual(1000);
    expect(body.latest!.overall.accelBandHz![0]).toBe(velocityBand[0]);
    const band = body.bands.find((b) => b.key === 'overall-velocity')!;
    expect(band.unit).toBe('mm/s');
    expect(band.dangerLevel).toBeGreaterThan(band.alertLevel);
  });

  it('the analyses list is newest first and honours the limit', async () => {
    const body = await (await get(`/points/${pointId}/analyses?limit=3`)).json();
    expect(body.items).toHaveLength(3);
    const ts = body.items.map((i: { takenAt: string }) => Date.parse(i.takenAt));
    expect(ts).toEqual([...ts].sort((a, b) => b - a));
  });
});

describe('per-site access', () => {
  let trbAnalysis: number;
  let trbPoint: number;
  beforeAll(async () => {
    const id = await ingest(trbTag, 'trb-1', {}, 'TRB');
    await createWorker(srv.ctx).drain();
    trbAnalysis = await analysisOf(id);
    const [p] = await srv.q('SELECT id FROM points WHERE tag = ?', [trbTag]);
    trbPoint = Number(p!.id);
  });

  it.each([
    ['point', () => `/points/${trbPoint}`],
    ['trend', () => `/points/${trbPoint}/trend`],
    ['trend CSV', () => `/points/${trbPoint}/trend.csv`],
    ['analyses', () => `/points/${trbPoint}/analyses`],
    ['waterfall', () => `/points/${trbPoint}/waterfall`],
    ['spectrum', () => `/analyses/${trbAnalysis}/spectrum`],
    ['waveform', () => `/analyses/${trbAnalysis}/waveform`],
    ['WAV', () => `/analyses/${trbAnalysis}/waveform.wav`],
  ])('an operator of another site gets 403 for the %s', async (_name, path) => {
    const res = await get(path(), operator);
    expect(res.status).toBe(403);
  });

  it('an operator of another site gets 403 for the machine', async () => {
    const [m] = await srv.q('SELECT machine_id FROM points WHERE id = ?', [trbPoint]);
    expect((await get(`/machines/${Number(m!.machine_id)}`, operator)).status).toBe(403);
  });

  it('the same operator reads points of their own site', async () => {
    expect((await get(`/points/${pointId}`, operator)).status).toBe(200);
    expect((await get(`/points/${pointId}/trend`, operator)).status).toBe(200);
  });

  it('a missing point or analysis answers 404, without a session 401', async () => {
    expect((await get('/points/999999')).status).toBe(404);
    expect((await get('/analyses/999999/spectrum')).status).toBe(404);
    expect((await srv.call('GET', `/api/v1/points/${pointId}`)).status).toBe(401);
  });
});
