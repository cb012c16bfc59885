import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readWav } from '@turnstone/dsp';
import { decodeFloat32Base64 } from '@turnstone/contracts/points';
import { trendResponseSchema } from '@turnstone/contracts/trend';
import { TREND_MAX_BUCKETS } from '@turnstone/condition/trend-decimation';
import {
  machineDetailSchema,
  pointDetailSchema,
  spectrumSchema,
  waveformSchema,
} from '@turnstone/contracts/points';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { expireRawSamples } from '../../apps/server/src/features/worker/retention.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { snapshotBody, toneCounts } from '../support/signals.ts';

let srv: TestServer;
const TAG = 'MFP-P102-MDE-H';
const keys: Record<string, string> = {};
let admin: string;
let operator: string;
let pointId: number;
let trbTag: string;

const q = (sqlText: string, params: unknown[] = []) => srv.q(sqlText, params);
async function ingest(
  tag: string,
  uid: string,
  o: Parameters<typeof snapshotBody>[2] = {},
  site = 'MFP',
) {
  const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
    body: snapshotBody(tag, uid, o),
    headers: { authorization: `Bearer ${keys[site]}` },
  });
  expect(res.status).toBe(201);
  return (await res.json()).snapshotId as number;
}
async function analysisOf(snapshotId: number) {
  const [a] = await q('SELECT id FROM analyses WHERE snapshot_id = ?', [snapshotId]);
  return Number(a!.id);
}
const get = (path: string, cookie = admin) => srv.call('GET', `/api/v1${path}`, { cookie });

beforeAll(async () => {
  srv = await startTestServer();
  admin = await srv.signIn('admin');
  operator = await srv.signIn('operator');
  for (const code of ['MFP', 'TRB']) {
    const [site] = await q('SELECT id FROM sites WHERE code = ?', [code]);
    const res = await srv.call('POST', '/api/v1/gateways', {
      cookie: admin,
      body: { siteId: Number(site!.id), name: `gw-${code}` },
    });
    keys[code] = (await res.json()).apiKey;
  }
  const [p] = await q('SELECT id FROM points WHERE tag = ?', [TAG]);
  pointId = Number(p!.id);
  const [t] = await q(
    `SELECT p.tag FROM points p JOIN machines m ON m.id = p.machine_id JOIN areas a ON a.id = m.area_id
     JOIN sites s ON s.id = a.site_id WHERE s.code = 'TRB' ORDER BY p.id LIMIT 1`,
  );
  trbTag = String(t!.tag);
});
afterAll(async () => {
  await srv?.stop();
});

describe('spectrum', () => {
  let analysisId: number;
  beforeAll(async () => {
    // 1 g peak at 100 Hz; fs 10240 Hz makes 100 Hz fall on a line for any power-of-two
    // segment length ≥ 1024 (df = 10240/N: 100/df is an integer).
    const id = await ingest(TAG, 'sp-1', {
      n: 16384,
      tones: [{ hz: 100, peakG: 1 }],
      noiseG: 0.0005,
      speedRpm: 1500,
    });
    await createWorker(srv.ctx).drain();
    analysisId = await analysisOf(id);
  });

  it('a 1 g peak tone at 100 Hz reads 0.7071 g RMS on its line in the acceleration spectrum', async () => {
    const res = await get(`/analyses/${analysisId}/spectrum?kind=acceleration`);
    expect(res.status).toBe(200);
    const body = spectrumSchema.parse(await res.json());
    expect(body.axis).toBe('hz');
    expect(body.unit).toBe('g');
    const values = decodeFloat32Base64(body.values);
    expect(values.length).toBe(body.lines);
    const k = Math.round(100 / body.dfHz!);
    expect(k * body.dfHz!).toBeCloseTo(100, 9);
    // Sine RMS = peak/√2 = 0.7071 g (definition of RMS). On a line the Hann window's coherent
    // gain is applied exactly (scalloping 0 dB on-bin, up to 1.42 dB between lines,
    // Harris 1978): allow 0.5 % for noise and float32.
    expect(values[k]!).toBeGreaterThan(0.7071 * 0.995);
    expect(values[k]!).toBeLessThan(0.7071 * 1.005);
    const top = body.peaks[0]!;
    expect(top.hz).toBeCloseTo(100, 0);
    expect(top.amplitude).toBeCloseTo(0.7071, 2);
    // 1× at 1500 r/min = 25 Hz.
    const oneX = body.faultFrequencies.find((f) => f.name === '1×')!;
    expect(oneX.hz).toBeCloseTo(25, 6);
    expect(body.speed.source).toBe('rpm');
  });

  it('with a known rpm the orders axis puts a 1× tone at order 1.000', async () => {
    // 1500 r/min = 25 Hz shaft; a 0.5 g tone at 25 Hz is 1× (common practice, no source).
    const id = await ingest(TAG, 'ord-1', {
      n: 16384,
      tones: [{ hz: 25, peakG: 0.5 }],
      noiseG: 0.0005,
      speedRpm: 1500,
    });
    await createWorker(srv.ctx).drain();
    const a = await analysisOf(id);
    const body = spectrumSchema.parse(
      await (await get(`/analyses/${a}/spectrum?kind=order`)).json(),
    );
    expect(body.axis).toBe('order');
    const values = decodeFloat32Base64(body.values);
    let best = 1;
    for (let i = 1; i < values.length; i++) if (values[i]! > values[best]!) best = i;
    expect(best * body.dOrder!).toBeGreaterThan(1 - body.dOrder! / 2 - 1e-9);
    expect(best * body.dOrder!).toBeLessThan(1 + body.dOrder! / 2 + 1e-9);
    expect(body.speed.rpm).toBe(1500);
  });

  it('an unknown spectrum kind is refused with 400 and the field named', async () => {
    const res = await get(`/analyses/${analysisId}/spectrum?kind=phase`);
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.code).toBe('validation_failed');
    expect(JSON.stringify(body.error.details)).toContain('kind');
  });

  it('stores all of an analysis’s spectra in the one compact column, the old float32 columns empty', async () => {
    const [row] = await q(
      `SELECT LENGTH(spectra) AS compact, accel_spectrum, velocity_spectrum, envelope_spectrum,
              order_spectrum FROM analyses WHERE id = ?`,
      [analysisId],
    );
    expect(Number(row!.compact)).toBeGreaterThan(0);
    expect([
      row!.accel_spectrum,
      row!.velocity_spectrum,
      row!.envelope_spectrum,
      row!.order_spectrum,
    ]).toEqual([null, null, null, null]);
  });

  it('an analysis stored before the compact column still reads its float32 spectra, alone and in the waterfall', async () => {
    // Rows written before migration 0008 hold each spectrum as little-endian float32 in its
    // own column and nothing in `spectra`: make one such row from a fresh capture.
    const id = await ingest(TAG, 'sp-old-form', {
      n: 16384,
      tones: [{ hz: 100, peakG: 1 }],
      noiseG: 0.0005,
      speedRpm: 1500,
      takenAt: new Date(Date.now() + 60_000).toISOString(),
    });
    await createWorker(srv.ctx).drain();
    const old = await analysisOf(id);
    const newForm = spectrumSchema.parse(
      await (await get(`/analyses/${old}/spectrum?kind=acceleration`)).json(),
    );
    // Values unlike the compact ones (× 1.5), so an answer from the wrong column shows.
    const accel = Float32Array.from(decodeFloat32Base64(newForm.values), (v) => v * 1.5);
    const velocity = Float32Array.from({ length: 801 }, (_, k) => k / 1024);
    await q(
      `UPDATE analyses SET spectra = NULL, accel_spectrum = ?, velocity_spectrum = ?,
              envelope_spectrum = NULL, order_spectrum = NULL WHERE id = ?`,
      [Buffer.from(accel.buffer), Buffer.from(velocity.buffer), old],
    );
    const a = spectrumSchema.parse(
      await (await get(`/analyses/${old}/spectrum?kind=acceleration`)).json(),
    );
    expect(a.values).toBe(Buffer.from(accel.buffer).toString('base64'));
    expect(a.lines).toBe(accel.length);
    const v = spectrumSchema.parse(
      await (await get(`/analyses/${old}/spectrum?kind=velocity`)).json(),
    );
    expect(v.values).toBe(Buffer.from(velocity.buffer).toString('base64'));
    const none = await get(`/analyses/${old}/spectrum?kind=envelope`);
    expect(none.status).toBe(404);
    expect((await none.json()).error.code).toBe('spectrum_unavailable');

    // The waterfall mixes the old row (newest) with compact ones.
    const wf = await (await get(`/points/${pointId}/waterfall?kind=acceleration&limit=5`)).json();
    expect(wf.items[0].analysisId).toBe(old);
    expect(wf.items[0].values).toBe(Buffer.from(accel.buffer).toString('base64'));
    const compact = wf.items.find((i: { analysisId: number }) => i.analysisId === analysisId);
    const line = Math.round(100 / newForm.dfHz!);
    // The compact row's 100 Hz line: 0.7071 g RMS within 0.5 % (see the first test).
    expect(decodeFloat32Base64(compact.values)[line]).toBeCloseTo(0.7071, 2);
  });

  it('the waterfall lists the newest spectra first, at most the limit', async () => {
    const res = await get(`/points/${pointId}/waterfall?kind=acceleration&limit=1`);
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.items).toHaveLength(1);
    const two = await (await get(`/points/${pointId}/waterfall?kind=acceleration&limit=5`)).json();
    expect(two.items.length).toBeGreaterThanOrEqual(2);
    expect(Date.parse(two.items[0].takenAt)).toBeGreaterThanOrEqual(
      Date.parse(two.items[1].takenAt),
    );
  });
  it('each waterfall spectrum carries its running speed (for orders) and the amplitude scale', async () => {
    // 1494 r/min given by the gateway: 1× = 1494 / 60 = 24.9 Hz (definition of r/min).
    const snap = await ingest(TAG, 'wf-speed-1', {
      n: 16384,
      tones: [{ hz: 50, peakG: 0.5 }],
      speedRpm: 1494,
    });
    await createWorker(srv.ctx).drain();
    const id = await analysisOf(snap);
    const wf = await (await get(`/points/${pointId}/waterfall?kind=velocity&limit=50`)).json();
    const item = wf.items.find((i: { analysisId: number }) => i.analysisId === id);
    expect(item.shaftHz).toBeCloseTo(24.9, 6);
    // The scale and the speed are the ones the single spectrum states for that capture.
    const one = await (await get(`/analyses/${id}/spectrum?kind=velocity`)).json();
    expect(wf.scale).toBe(one.scale);
    expect(item.shaftHz).toBeCloseTo(one.speed.hz, 9);
  });
});

describe('waveform and downloads', () => {
  let analysisId: number;
  let snapshotId: number;
  const fs = 10240;
  const opts = { n: 4096, fs, tones: [{ hz: 100, peakG: 1 }], noiseG: 0.001, seed: 7 };
  beforeAll(async () => {
    snapshotId = await ingest(TAG, 'wf-1', opts);
    await createWorker(srv.ctx).drain();
    analysisId = await analysisOf(snapshotId);
  });

  it('the waveform comes back in g with the ADC rails and bits used', async () => {
    const body = waveformSchema.parse(await (await get(`/analyses/${analysisId}/waveform`)).json());
    expect(body.sampleRateHz).toBe(fs);
    const g = decodeFloat32Base64(body.values);
    expect(g.length).toBe(4096);
    // 16-bit ADC, 5 V full scale, 100 mV/g: one count = 5/32768/0.1 g; rails −32768 and
    // +32767 counts = −50 g and +49.998 g (bipolar transfer function, Kester MT-001).
    expect(body.rails.lowG).toBeCloseTo(-50, 6);
    expect(body.rails.highG).toBeCloseTo((32767 * 5) / 32768 / 0.1, 6);
    const peak = Math.max(...Array.from(g, Math.abs));
    expect(peak).toBeGreaterThan(0.99);
    expect(peak).toBeLessThan(1.01);
    expect(body.clipped).toBe(false);
    // 1 g peak = 655 counts peak, ≈ 1311 p-p: log2(1311) ≈ 10.4 bits used.
    expect(body.bitsUsed!).toBeGreaterThan(10);
    expect(body.bitsUsed!).toBeLessThan(11);
  });

  it('the WAV download reads back through readWav to the same counts, with a file name', async () => {
    const res = await get(`/analyses/${analysisId}/waveform.wav`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toContain('audio/wav');
    expect(res.headers.get('content-disposition')).toMatch(
      /attachment; filename="MFP-P102-MDE-H_\d{4}-\d\d-\d\dT\d{6}Z\.wav"/,
    );
    const bytes = new Uint8Array(await res.arrayBuffer());
    const wav = readWav(bytes);
    expect(wav.sampleRateHz).toBe(fs);
    expect(wav.encoding).toBe('int16');
    expect(Array.from(wav.samples)).toEqual(Array.from(toneCounts(opts)));
  });

  it('the CSV download has a header and one row per sample in g', async () => {
    const res = await get(`/analyses/${analysisId}/waveform.csv`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-disposition')).toMatch(/filename=".*\.csv"/);
    const lines = (await res.text()).trim().split('\n');
    expect(lines[0]).toBe('time_s,acceleration_g');
    expect(lines).toHaveLength(4097);
    const counts = toneCounts(opts);
    const [t, v] = lines[11]!.split(',').map(Number);
    expect(t).toBeCloseTo(10 / fs, 9);
    expect(v).toBeCloseTo((counts[10]! * 5) / 32768 / 0.1, 5);
  });

  it('after retention drops the raw samples the waveform answers 410 with a clear message', async () => {
    await q('UPDATE snapshots SET received_at = NOW(3) - INTERVAL 400 DAY WHERE id = ?', [
      snapshotId,
    ]);
    // Taken 400 days back too: a capture taken now, right after the demo's limits and near
    // its alert events, is one retention keeps whole (tests/api/retention.test.ts).
    await q('UPDATE analyses SET taken_at = NOW(3) - INTERVAL 400 DAY WHERE snapshot_id = ?', [
      snapshotId,
    ]);
    expect(await expireRawSamples(srv.ctx.db, 365)).toBeGreaterThanOrEqual(1);
    for (const path of ['waveform', 'waveform.wav', 'waveform.csv']) {
      const res = await get(`/analyses/${analysisId}/${path}`);
      expect(res.status).toBe(410);
      const body = await res.json();
      expect(body.error.code).toBe('samples_expired');
      expect(body.error.message).toMatch(/retention/);
    }
    // The stored spectrum stays.
    expect((await get(`/analyses/${analysisId}/spectrum`)).status).toBe(200);
  });
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
    // into the table (foreign keys off on this one connection: no analyses behind them).
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
    await q('DELETE FROM band_values WHERE analysis_id >= 50000000');
    await q('DELETE FROM alerts WHERE point_id = ? AND first_at < ?', [
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
    const [m] = await q('SELECT machine_id FROM points WHERE id = ?', [pointId]);
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
    const [p] = await q('SELECT id FROM points WHERE tag = ?', [trbTag]);
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
    const [m] = await q('SELECT machine_id FROM points WHERE id = ?', [trbPoint]);
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
