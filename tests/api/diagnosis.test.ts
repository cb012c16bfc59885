import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { alertDetailSchema } from '@turnstone/contracts/alerts';
import { analysisListSchema, machineDetailSchema } from '@turnstone/contracts/points';
import { demoChannels } from '@turnstone/demo-scenario/plant-channels';
import { encodeSamples } from '@turnstone/dsp/sample-codec';
import { simulateSnapshot, toIngestItem } from '@turnstone/demo-scenario/simulated-snapshot';
import { synthesizeCapture, toneAccelPeakG } from '@turnstone/demo-scenario/synthesize-capture';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { base64Of, prng } from '../support/signals.ts';

// Diagnosis hints and the 1× vector stored with each analysis and returned by the API.

let srv: TestServer;
let admin: string;
let key: string;

const q = (sqlText: string, params: unknown[] = []) => srv.q(sqlText, params);
const get = (path: string) => srv.call('GET', `/api/v1${path}`, { cookie: admin });
async function ingest(body: unknown) {
  const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
    body,
    headers: { authorization: `Bearer ${key}` },
  });
  expect(res.status).toBe(201);
}
async function pointIdOf(tag: string) {
  const [p] = await q('SELECT id FROM points WHERE tag = ?', [tag]);
  return Number(p!.id);
}
async function analysesOf(tag: string) {
  const res = await get(`/points/${await pointIdOf(tag)}/analyses`);
  expect(res.status).toBe(200);
  return analysisListSchema.parse(await res.json()).items;
}
const channel = (tag: string) => demoChannels('MFP').find((c) => c.tag === tag)!;

beforeAll(async () => {
  srv = await startTestServer();
  admin = await srv.signIn('admin');
  const [site] = await q("SELECT id FROM sites WHERE code = 'MFP'");
  const res = await srv.call('POST', '/api/v1/gateways', {
    cookie: admin,
    body: { siteId: Number(site!.id), name: 'gw-diagnosis' },
  });
  key = (await res.json()).apiKey;
});
afterAll(async () => {
  await srv?.stop();
});

describe('diagnosis hints stored with the analysis', () => {
  const TAG = 'MFP-P201-MDE-H';

  it("the simulator's developing unbalance on P-201 gives an unbalance hint with the 1× peak as evidence, and the 1× vector", async () => {
    // The simulator's 'unbalance-rising' story at its end (progress 1): 1× grows to several
    // times the pump's healthy level while 2×, 3× stay small. Two captures a day apart, so
    // the overall-velocity band (persistence 2) raises its alert.
    const c = channel(TAG);
    expect(c.speedInput).toBe('tach');
    for (const [i, at] of ['2026-11-20T08:00:00Z', '2026-11-21T08:00:00Z'].entries()) {
      const s = simulateSnapshot(c, new Date(at), 0.99 + 0.01 * i, { faults: false });
      await ingest(toIngestItem(s));
    }
    await createWorker(srv.ctx).drain();
    const [latest] = await analysesOf(TAG);
    const d = latest!.diagnosis!;
    expect(d).not.toBeNull();
    // Source of the gate: the point's own overall velocity alert level (the template's).
    expect(d.severitySource).toMatch(/alert level/);
    expect(latest!.overall.velocityRmsMmS).toBeGreaterThanOrEqual(d.severityMmS);
    const codes = d.hints.map((h) => h.code);
    expect(codes[0]).toBe('unbalance');
    expect(codes).not.toContain('looseness');
    expect(codes).not.toContain('misalignment');
    const oneX = d.hints[0]!.evidence.find((e) => e.label === '1×')!;
    // 1× of a 1490 r/min pump is 24.83 Hz (definition of 1×); the tach measures the
    // simulated speed, which wanders a little around the nominal.
    expect(oneX.hz).toBeGreaterThan(24.83 * 0.98);
    expect(oneX.hz).toBeLessThan(24.83 * 1.02);
    expect(oneX.order).toBeCloseTo(1, 2);
    expect(oneX.spectrum).toBe('velocity');
    // The 1× vector (tach-synchronous) and the spectrum's 1× line measure the same tone:
    // within a few percent (Hann amplitude on a line vs. synchronous averaging; common
    // practice, no source).
    const v1 = latest!.shaftVectors!.find((v) => v.order === 1)!;
    expect(v1.velocityRmsMmS / oneX.amplitude).toBeGreaterThan(0.93);
    expect(v1.velocityRmsMmS / oneX.amplitude).toBeLessThan(1.07);
    expect(latest!.shaftVectors!.map((v) => v.order)).toEqual([1, 2]);

    // The machine page carries the point's latest analysis with its hints.
    const [m] = await q('SELECT machine_id FROM points WHERE tag = ?', [TAG]);
    const machine = machineDetailSchema.parse(
      await (await get(`/machines/${Number(m!.machine_id)}`)).json(),
    );
    const point = machine.points.find((p) => p.tag === TAG)!;
    expect(point.latest!.diagnosis!.hints[0]!.code).toBe('unbalance');

    // The alert detail shows the current hints.
    const [a] = await q(
      "SELECT a.id FROM alerts a JOIN points p ON p.id = a.point_id WHERE p.tag = ? AND a.band_key = 'overall-velocity'",
      [TAG],
    );
    expect(a).toBeDefined();
    const alert = alertDetailSchema.parse(await (await get(`/alerts/${Number(a!.id)}`)).json());
    expect(alert.currentDiagnosis!.analysisId).toBe(latest!.id);
    expect(alert.currentDiagnosis!.diagnosis.hints[0]!.code).toBe('unbalance');

    // The alert mail names the top hint with its evidence and keeps the safety caution.
    const [mail] = await q(
      "SELECT text_body FROM outbox WHERE kind = 'alert-raised' AND subject LIKE ? AND subject LIKE '%Overall%'",
      [`%${TAG}%`],
    );
    const text = String(mail!.text_body);
    expect(text).toContain('Likely cause (hint)');
    expect(text).toMatch(/Unbalance: 1× dominant/);
    expect(text).toMatch(/Evidence: +1× 2\d\.\d Hz \(1\.00×\) \d\.\d\d mm\/s RMS/);
    expect(text).toContain('not a machine-protection system');
  });

  it('a healthy capture (P-102, same pump size and speed) gives no hint', async () => {
    const tag = 'MFP-P102-MDE-H';
    const s = simulateSnapshot(channel(tag), new Date('2026-11-21T09:00:00Z'), 1, {
      faults: false,
    });
    await ingest(toIngestItem(s));
    await createWorker(srv.ctx).drain();
    const [latest] = await analysesOf(tag);
    expect(latest!.diagnosis!.hints).toEqual([]);
    expect(latest!.diagnosis!.notes.join(' ')).toMatch(/below/);
    // Speed from a speed value, no tach: no vector.
    expect(latest!.shaftVectors).toBeNull();
  });

  it('a sum of sines with a tach: 1× phase lag and 2× vector stored as synthesised', async () => {
    // 1500 r/min (25 Hz), one pulse a revolution at t = m/25 s. Acceleration
    // a = 0.5·cos(θ − 60°) + 0.2·cos(2θ − 200°) g: phase lag 60° at 1×, 200° at 2× (the lag
    // convention of the vector: the positive peak comes φ degrees of its cycle after the
    // pulse). Velocity lags acceleration by 90° (v = ∫a dt, definition).
    const fs = 10240;
    const n = 16384;
    const f = 25;
    const sens = 0.1; // V/g
    const countsPerV = 2 ** 15 / 5;
    const rand = prng(7);
    const counts = new Int16Array(n);
    for (let i = 0; i < n; i++) {
      const th = 2 * Math.PI * f * (i / fs);
      const g =
        0.5 * Math.cos(th - (60 * Math.PI) / 180) +
        0.2 * Math.cos(2 * th - (200 * Math.PI) / 180) +
        0.002 * (rand() + rand() + rand() - 1.5);
      counts[i] = Math.round(g * sens * countsPerV);
    }
    const pulses: number[] = [];
    for (let m = 0; m / f < (n - 1) / fs; m++) pulses.push(m / f);
    await ingest({
      uid: 'vec-1',
      pointTag: 'MFP-P101-MDE-H',
      takenAt: '2026-11-21T10:00:00Z',
      sampleRateHz: fs,
      encoding: 'int16',
      samples: base64Of(counts),
      adc: { bits: 16, fullScaleV: 5 },
      sensor: { sensitivityMvPerG: 100 },
      tach: { pulseTimesS: pulses, pulsesPerRev: 1 },
    });
    await createWorker(srv.ctx).drain();
    const [latest] = await analysesOf('MFP-P101-MDE-H');
    expect(latest!.speedSource).toBe('tach');
    const [v1, v2] = latest!.shaftVectors!;
    expect(v1!.accelPeakG).toBeCloseTo(0.5, 2);
    expect(v1!.accelPhaseDeg).toBeCloseTo(60, 0);
    expect(v1!.velocityPhaseDeg).toBeCloseTo(150, 0);
    expect(v2!.accelPeakG).toBeCloseTo(0.2, 2);
    expect(v2!.accelPhaseDeg).toBeCloseTo(200, 0);
    // 0.5 g peak at 25 Hz = 0.5·9806.65/(2π·25)/√2 = 22.07 mm/s RMS (v = a/2πf, definition).
    expect(v1!.velocityRmsMmS).toBeCloseTo(22.07, 1);
  });
});

describe("electrical hints from the machine's supply frequency", () => {
  // A two-pole motor at 2975 r/min (49.58 Hz) on a 50 Hz supply: 2× running speed is
  // 99.17 Hz, 0.83 Hz from 2 × line frequency (100 Hz) — the classic confusion. The magnetic
  // pull of a stator peaks twice per electrical cycle, so an electrical cause shows at
  // 2 × line frequency (common practice, no source). The capture carries 1× 2.5 mm/s, 2×
  // 0.5 mm/s and a 6.5 mm/s line at 100 Hz: overall ≈ 7 mm/s, above the motors' 2.8 mm/s
  // alert level (ISO 20816-3 group 2 rigid B/C, from memory).
  const RPM = 2975;
  const capture = synthesizeCapture({
    sampleRateHz: 2560,
    sampleCount: 32_768, // 12.8 s
    rpm: RPM,
    tones: [
      { order: 1, velocityMmS: 2.5 },
      { order: 2, velocityMmS: 0.5 },
    ],
    hzTones: [{ hz: 100, g: toneAccelPeakG(6.5, 100) / Math.SQRT2 }],
    noiseG: 0.005,
    sensitivityMvPerG: 100,
    adc: { encoding: 'int24', bits: 24, fullScaleV: 5 },
    tach: true,
    seed: 1717,
  });
  let areaId: number;

  async function machineWithPoints(name: string, lineHz: 50 | null, points: [string, number][]) {
    const res = await srv.call('POST', '/api/v1/machines', {
      cookie: admin,
      body: {
        areaId,
        name,
        type: 'motor',
        nominalRpm: RPM,
        isoGroup: 2,
        foundation: 'rigid',
        criticality: 'medium',
        powerKw: 55,
        bladeCount: null,
        vaneCount: null,
        lineHz,
        bearings: [],
        gears: [],
      },
    });
    expect(res.status).toBe(201);
    const machineId = (await res.json()).id as number;
    for (const [tag, lines] of points) {
      const p = await srv.call('POST', '/api/v1/points', {
        cookie: admin,
        body: {
          machineId,
          tag,
          name: 'Motor drive end, horizontal',
          location: 'Motor DE',
          direction: 'H',
          sensitivityMvPerG: 100,
          bearingId: null,
          fmaxHz: 1000,
          lines,
        },
      });
      expect(p.status).toBe(201);
    }
  }
  async function capturedOn(tag: string) {
    await ingest({
      uid: `electrical-${tag}`,
      pointTag: tag,
      takenAt: '2026-11-22T08:00:00Z',
      sampleRateHz: capture.sampleRateHz,
      encoding: capture.encoding,
      samples: Buffer.from(encodeSamples(capture.counts, capture.encoding)).toString('base64'),
      adc: capture.adc,
      sensor: { sensitivityMvPerG: 100 },
      tach: capture.tach!,
    });
  }

  beforeAll(async () => {
    const [a] = await q(
      "SELECT a.id FROM areas a JOIN sites s ON s.id = a.site_id WHERE s.code = 'MFP' ORDER BY a.id LIMIT 1",
    );
    areaId = Number(a!.id);
    // Fine lines: 6400 lines to 1 kHz at 2560 S/s → 16384-sample segments, Δf 0.156 Hz, so
    // 100 Hz and 99.17 Hz are 5.3 lines apart. Coarse: 800 lines → Δf 1.25 Hz, 0.67 lines.
    await machineWithPoints('Filter wash motor M-160', 50, [
      ['MFP-M160-FINE-H', 6400],
      ['MFP-M160-COARSE-H', 800],
    ]);
    await machineWithPoints('Filter wash motor M-161', null, [['MFP-M161-FINE-H', 6400]]);
    for (const tag of ['MFP-M160-FINE-H', 'MFP-M160-COARSE-H', 'MFP-M161-FINE-H'])
      await capturedOn(tag);
    await createWorker(srv.ctx).drain();
  });

  it('a 50 Hz machine whose resolution separates 2 × line from 2× gets an electrical hint with the 100 Hz line as evidence', async () => {
    const [a] = await analysesOf('MFP-M160-FINE-H');
    expect(a!.speedSource).toBe('tach');
    const d = a!.diagnosis!;
    const hint = d.hints.find((h) => h.code === 'electrical')!;
    expect(hint, JSON.stringify(d)).toBeDefined();
    expect(d.hints[0]!.code).toBe('electrical');
    expect(hint.summary).toMatch(/2 × line frequency \(100 Hz, resolved from 2× at 99\.\d+ Hz\)/);
    expect(hint.evidence).toHaveLength(1);
    const e = hint.evidence[0]!;
    expect(e.label).toBe('2 × line');
    expect(e.spectrum).toBe('velocity');
    // 2 × 50 Hz (definition); interpolated between 0.156 Hz lines.
    expect(e.hz).toBeGreaterThan(99.95);
    expect(e.hz).toBeLessThan(100.05);
    // In orders of the tach-measured 49.58 Hz: 100 / 49.58 = 2.017.
    expect(e.order).toBeCloseTo(100 / (RPM / 60), 2);
    // The synthesised 6.5 mm/s RMS, within the Hann amplitude error between lines (a few
    // percent; Harris 1978, Proc. IEEE 66(1):51–83, scalloping loss ≤ 1.42 dB before the
    // main-lobe sum that recovers most of it).
    expect(e.amplitude).toBeGreaterThan(6.5 * 0.95);
    expect(e.amplitude).toBeLessThan(6.5 * 1.05);
    expect(d.notes.join(' ')).not.toMatch(/not resolved/);
    // The machine page shows the supply frequency the hint came from.
    const [m] = await q('SELECT machine_id FROM points WHERE tag = ?', ['MFP-M160-FINE-H']);
    const machine = machineDetailSchema.parse(
      await (await get(`/machines/${Number(m!.machine_id)}`)).json(),
    );
    expect(machine.lineHz).toBe(50);
  });

  it('the same capture on a machine without a supply frequency gives no electrical hint', async () => {
    const [a] = await analysesOf('MFP-M161-FINE-H');
    const d = a!.diagnosis!;
    expect(d.hints.map((h) => h.code)).not.toContain('electrical');
    expect(d.notes.join(' ')).not.toMatch(/line frequency/);
  });

  it('when the lines cannot separate 2 × line frequency from 2×, there is no electrical hint and the hints say so', async () => {
    const [a] = await analysesOf('MFP-M160-COARSE-H');
    const d = a!.diagnosis!;
    expect(d.hints.map((h) => h.code)).not.toContain('electrical');
    // 0.83 Hz apart at Δf 1.25 Hz is under one line (< 4, a Hann main lobe; Harris 1978).
    expect(d.notes.join(' ')).toMatch(
      /2 × line frequency \(100 Hz\) and 2× running speed \(99\.\d+ Hz\) are 0\.\d+ lines apart at Δf 1\.25 Hz: not resolved/,
    );
    // 2× reads the 100 Hz line: the misalignment hint carries the same caution.
    const mis = d.hints.find((h) => h.code === 'misalignment')!;
    expect(mis, JSON.stringify(d)).toBeDefined();
    expect(mis.summary).toContain(
      'At this resolution 2× cannot be told from 2 × line frequency (100 Hz)',
    );
  });
});
