/**
 * A point's analysis through the dashboard API: spectra (line amplitudes against the tone
 * posted, orders, the compact and the older float32 storage, the waterfall) and the waveform
 * with its WAV and CSV downloads. Trend, detail and access: points.test.ts.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readWav } from '@turnstone/dsp';
import { decodeFloat32Base64, spectrumSchema, waveformSchema } from '@turnstone/contracts/points';
import { decodeSpectra, decodeSpectraDetail, encodeSpectra } from '@turnstone/db/spectra-codec';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { expireRawSamples } from '../../apps/server/src/features/worker/retention.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { snapshotBody, toneCounts } from '../support/signals.ts';
import { analysisOfSnapshot, postSnapshot } from '../support/alert-captures.ts';

let srv: TestServer;
const TAG = 'MFP-P102-MDE-H';
let key: string;
let admin: string;
let pointId: number;

const ingest = (tag: string, uid: string, o: Parameters<typeof snapshotBody>[2] = {}) =>
  postSnapshot(srv, key, snapshotBody(tag, uid, o));
const analysisOf = (snapshotId: number) => analysisOfSnapshot(srv, snapshotId);
const get = (path: string, cookie = admin) => srv.call('GET', `/api/v1${path}`, { cookie });

beforeAll(async () => {
  srv = await startTestServer();
  admin = await srv.signIn('admin');
  key = await srv.gatewayKey(1, 'gw-MFP'); // the demo seed's site 1 is MFP
  const [p] = await srv.q('SELECT id FROM points WHERE tag = ?', [TAG]);
  pointId = Number(p!.id);
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
    const [row] = await srv.q(
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
    // Such rows hold the spectra's detail (axes, peaks) in their summary.
    const [blob] = await srv.q('SELECT spectra FROM analyses WHERE id = ?', [old]);
    const detail = decodeSpectraDetail(blob!.spectra as Buffer) as Record<string, unknown>;
    await srv.q(
      `UPDATE analyses SET spectra = NULL, accel_spectrum = ?, velocity_spectrum = ?,
              envelope_spectrum = NULL, order_spectrum = NULL,
              summary = JSON_MERGE_PATCH(summary, ?) WHERE id = ?`,
      [Buffer.from(accel.buffer), Buffer.from(velocity.buffer), JSON.stringify(detail), old],
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

  it('keeps the detail of the spectra (axes, peaks, fault frequencies) in the spectra BLOB, not the summary kept for ever; a row written before reads it from its summary', async () => {
    const [row] = await srv.q('SELECT summary, spectra FROM analyses WHERE id = ?', [analysisId]);
    const summary = (
      typeof row!.summary === 'string' ? JSON.parse(row!.summary) : row!.summary
    ) as Record<string, unknown>;
    for (const k of ['spectra', 'peaks', 'faultFrequencies', 'qualityMetrics'])
      expect({ k, inSummary: k in summary }).toEqual({ k, inSummary: false });
    expect(summary.isoBandHz).toEqual([expect.any(Number), expect.any(Number)]);
    const detail = decodeSpectraDetail(row!.spectra as Buffer) as Record<string, unknown>;
    expect(Object.keys(detail).sort()).toEqual(
      ['faultFrequencies', 'peaks', 'qualityMetrics', 'spectra'].sort(),
    );
    const now = await (await get(`/analyses/${analysisId}/spectrum?kind=acceleration`)).json();
    expect(now.peaks.length).toBeGreaterThan(0);
    // The same analysis as a row written before the split: format-1 BLOB, detail in the
    // summary. The answer is the same, peaks and fault frequencies included.
    const spectra = decodeSpectra(row!.spectra as Buffer);
    await srv.q('UPDATE analyses SET spectra = ?, summary = ? WHERE id = ?', [
      encodeSpectra(spectra),
      JSON.stringify({ ...summary, ...detail }),
      analysisId,
    ]);
    try {
      const before = await (await get(`/analyses/${analysisId}/spectrum?kind=acceleration`)).json();
      expect(before).toEqual(now);
    } finally {
      await srv.q('UPDATE analyses SET spectra = ?, summary = ? WHERE id = ?', [
        row!.spectra,
        JSON.stringify(summary),
        analysisId,
      ]);
    }
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
    await srv.q('UPDATE snapshots SET received_at = NOW(3) - INTERVAL 400 DAY WHERE id = ?', [
      snapshotId,
    ]);
    // Taken 400 days back too: a capture taken now, right after the demo's limits and near
    // its alert events, is one retention keeps whole (tests/api/retention.test.ts).
    await srv.q('UPDATE analyses SET taken_at = NOW(3) - INTERVAL 400 DAY WHERE snapshot_id = ?', [
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
