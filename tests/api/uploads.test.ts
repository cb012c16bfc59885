import { execFile } from 'node:child_process';
import { promisify } from 'node:util';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeWav } from '@turnstone/dsp';
import { decodeSpectraDetail } from '@turnstone/db/spectra-codec';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { prng, toneCounts } from '../support/signals.ts';
import { floatWavBytes, pcmWavBytes } from '../support/wav-bytes.ts';

let srv: TestServer;
let engineer: string;
let pointId: number;

const q = (sqlText: string, params: unknown[] = []) => srv.q(sqlText, params);
const snapshotCount = async () => Number((await q('SELECT COUNT(*) AS n FROM snapshots'))[0]!.n);

function upload(
  file: Uint8Array | string,
  name: string,
  fields: Record<string, string> = {},
  id = pointId,
) {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.append(k, v);
  const bytes = typeof file === 'string' ? new TextEncoder().encode(file) : file;
  form.append('file', new Blob([bytes as Uint8Array<ArrayBuffer>]), name);
  return srv.call('POST', `/api/v1/points/${id}/uploads`, { cookie: engineer, raw: form });
}

/** 0.5 g peak at 100 Hz, 16-bit ADC at ±5 V, 100 mV/g (the test tone generator). */
const TONE = { hz: 100, peakG: 0.5 };
function goodWav(seed = 1) {
  const counts = toneCounts({ n: 8192, fs: 10240, tones: [TONE], noiseG: 0.001, seed });
  return writeWav(counts, 10240, 'int16');
}
const wavFields = { sensitivityMvPerG: '100', fullScaleV: '5', bits: '16', speedRpm: '1480' };

beforeAll(async () => {
  srv = await startTestServer();
  engineer = await srv.signIn('engineer');
  const [p] = await q('SELECT id FROM points WHERE tag = ?', ['MFP-P102-MDE-H']);
  pointId = Number(p!.id);
});
afterAll(async () => {
  await srv?.stop();
});

describe('uploads of recordings', () => {
  it('a good WAV is queued, analysed by the worker, and its tone amplitude reads back', async () => {
    const res = await upload(goodWav(), 'pump-de.wav', wavFields);
    expect(res.status).toBe(201);
    const body = await res.json();
    expect(body).toMatchObject({
      status: 'queued',
      samples: 8192,
      sampleRateHz: 10240,
      encoding: 'int16',
    });
    expect(await createWorker(srv.ctx).drain()).toBe(1);
    const snap = await (
      await srv.call('GET', `/api/v1/snapshots/${body.snapshotId}`, { cookie: engineer })
    ).json();
    expect(snap.status).toBe('done');
    expect(snap.fileName).toBe('pump-de.wav');
    // A sine's RMS is its peak / √2 (definition of RMS): 0.5 g peak → 0.3536 g RMS.
    expect(snap.analysis.overall.accelRmsG).toBeCloseTo(0.3536, 2);
    expect(snap.analysis.verdict).toBe('ok');
    expect(snap.analysis.speedRpm).toBe(1480);
    // every overall value states its band: at 1480 r/min the ISO 20816-3 band is 10–1000 Hz
    // (above 600 r/min, from memory), and overall acceleration runs from its lower edge
    expect(snap.analysis.overall.velocityBandHz).toEqual([10, 1000]);
    expect(snap.analysis.overall.accelBandHz[0]).toBe(10);
  });

  it('the same file again answers 200 already-uploaded and stores nothing new', async () => {
    const before = await snapshotCount();
    const res = await upload(goodWav(), 'pump-de.wav', wavFields);
    expect(res.status).toBe(200);
    expect((await res.json()).status).toBe('already-uploaded');
    expect(await snapshotCount()).toBe(before);
    // The first upload is in the audit log with its file; the repeat is not.
    const audit = await srv.q<{ after: unknown }>(
      "SELECT after FROM audit_log WHERE action = 'upload.create'",
    );
    expect(audit).toHaveLength(1);
    const after =
      typeof audit[0]!.after === 'string' ? JSON.parse(audit[0]!.after) : audit[0]!.after;
    expect(after).toMatchObject({ fileName: 'pump-de.wav', samples: 8192, sampleRateHz: 10240 });
  });

  it('the same file with other capture settings answers 409 and stores nothing', async () => {
    const before = await snapshotCount();
    const res = await upload(goodWav(), 'pump-de.wav', { ...wavFields, sensitivityMvPerG: '10' });
    expect(res.status).toBe(409);
    expect((await res.json()).error.message).toMatch(/other capture settings/);
    expect(await snapshotCount()).toBe(before);
  });

  it('a good two-column CSV in g is analysed at the rate of its time column', async () => {
    // 0.2 g peak at 80 Hz sampled at 5120 Hz → 0.1414 g RMS (peak / √2).
    const fs = 5120;
    const lines = ['time_s,accel_g'];
    for (let i = 0; i < 4096; i++)
      lines.push(
        `${(i / fs).toFixed(7)},${(0.2 * Math.sin((2 * Math.PI * 80 * i) / fs)).toFixed(6)}`,
      );
    const res = await upload(lines.join('\n'), 'route-17.csv', {
      unit: 'g',
      sensitivityMvPerG: '100',
    });
    expect(res.status).toBe(201);
    const body = await res.json();
    expect(body.sampleRateHz).toBeCloseTo(5120, 3);
    await createWorker(srv.ctx).drain();
    const snap = await (
      await srv.call('GET', `/api/v1/snapshots/${body.snapshotId}`, { cookie: engineer })
    ).json();
    expect(snap.status).toBe('done');
    expect(snap.analysis.overall.accelRmsG).toBeCloseTo(0.1414, 2);
  });

  it('a one-column CSV without a sample rate is refused with a message naming the field', async () => {
    const res = await upload(
      Array.from({ length: 512 }, (_, i) => String(Math.sin(i))).join('\n'),
      'a.csv',
    );
    expect(res.status).toBe(400);
    expect((await res.json()).error.message).toMatch(/sample rate/);
  });

  const truncated = () => goodWav().subarray(0, 3000);
  const lyingSize = () => {
    const w = goodWav().slice();
    new DataView(w.buffer).setUint32(40, 10_000_000, true); // data chunk claims 10 MB
    return w;
  };
  const mixedCsv = () =>
    ['0,1.0', '0.001,2.0', '3.0', '0.003,4.0'].join('\n') + '\n' + '0.5\n'.repeat(300);
  const png = () =>
    new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 1, 2, 3]);

  it.each([
    ['not WAV or CSV (a PNG)', png, 'picture.wav', /neither WAV .* nor CSV/],
    ['a truncated WAV', truncated, 'cut.wav', /Not a readable WAV file: .*truncated/],
    ['a WAV whose data size lies', lyingSize, 'liar.wav', /claims 10000000 bytes/],
    ['a CSV with mixed column counts', mixedCsv, 'mixed.csv', /line 3 has 1 columns, expected 2/],
    ['an empty file', () => new Uint8Array(0), 'empty.wav', /empty/],
    [
      'a password file named ../../etc/passwd',
      () => 'root:x:0:0:root:/root:/bin/bash\n',
      '../../etc/passwd',
      /./,
    ],
  ])('%s gets 400 with a clear message and stores nothing', async (_what, make, name, message) => {
    const before = await snapshotCount();
    const res = await upload(make(), name, wavFields);
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.message).toMatch(message);
    expect(await snapshotCount()).toBe(before);
  });

  it('bad capture settings answer 400 naming the field; planners get 403', async () => {
    const res = await upload(goodWav(2), 'x.wav', { sensitivityMvPerG: 'lots' });
    expect(res.status).toBe(400);
    expect((await res.json()).error.details[0].path).toBe('sensitivityMvPerG');
    const planner = await srv.signIn('planner');
    const form = new FormData();
    form.append('file', new Blob([goodWav(3) as Uint8Array<ArrayBuffer>]), 'x.wav');
    const denied = await srv.call('POST', `/api/v1/points/${pointId}/uploads`, {
      cookie: planner,
      raw: form,
    });
    expect(denied.status).toBe(403);
  });
});

// The analyzer CLI (npm run analyze) and an upload read the same file the same way: one
// reader, full scale of the container, float 1.0 = full scale = the given volts.
describe('the analyzer CLI and an upload of the same file', { timeout: 120_000 }, () => {
  const root = resolve(fileURLToPath(new URL('.', import.meta.url)), '../..');
  const dir = mkdtempSync(join(tmpdir(), 'turnstone-same-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  const FS = 25600;
  const N = 16384;
  /** 120 Hz at `fraction` of full scale plus 1 % of noise and a 3.1 kHz tone (definition). */
  const signal = (fraction: number, seed: number) => {
    const r = prng(seed);
    return Array.from(
      { length: N },
      (_, i) =>
        fraction *
        (Math.sin((2 * Math.PI * 120 * i) / FS) +
          0.2 * Math.sin((2 * Math.PI * 3100 * i) / FS + 1) +
          0.01 * (r() - 0.5)),
    );
  };
  const toCodes = (x: number[], bits: number) => x.map((v) => Math.round(v * 2 ** (bits - 1)) || 0);
  const files = [
    // Microsoft WAVEFORMATEXTENSIBLE: 20 valid bits in a 24-bit container
    {
      name: 'extensible-20in24.wav',
      bytes: pcmWavBytes(toCodes(signal(0.4, 1), 20), FS, 24, 20),
      fullScaleV: '2.5',
    },
    // IEEE float: ±1.0 is full scale, here 5 V
    {
      name: 'float.wav',
      bytes: floatWavBytes(signal(0.3, 2), FS),
      fullScaleV: '5',
    },
    {
      name: 'plain-16.wav',
      bytes: pcmWavBytes(toCodes(signal(0.5, 3), 16), FS, 16),
      fullScaleV: '1',
    },
  ];

  it.each(files)('$name gives the same overall values, verdict and bits used', async (f) => {
    const path = join(dir, f.name);
    writeFileSync(path, f.bytes);
    const res = await upload(f.bytes, f.name, {
      sensitivityMvPerG: '100',
      fullScaleV: f.fullScaleV,
      speedRpm: '1480',
    });
    expect(res.status).toBe(201);
    const { snapshotId } = await res.json();
    await createWorker(srv.ctx).drain();
    const snap = await (
      await srv.call('GET', `/api/v1/snapshots/${snapshotId}`, { cookie: engineer })
    ).json();
    expect(snap.status).toBe('done');
    const [p] = await q('SELECT fmax_hz, `lines` FROM points WHERE id = ?', [pointId]);
    const fmax = Math.min(Number(p!.fmax_hz), FS / 2.56);
    // Asynchronously: the server runs in this process and must keep serving meanwhile.
    const cli = await promisify(execFile)(
      join(root, 'node_modules', '.bin', 'tsx'),
      [
        join(root, 'packages/dsp/bin/analyze.ts'),
        path,
        '--json',
        '--rpm',
        '1480',
        '--sensitivity',
        '100',
        '--full-scale',
        f.fullScaleV,
        '--fmax',
        String(fmax),
        '--lines',
        String(p!.lines),
      ],
      { encoding: 'utf8', cwd: root },
    );
    expect(cli.stderr).toBe('');
    const j = JSON.parse(cli.stdout);
    const a = snap.analysis;
    expect(a.verdict).toBe(j.quality.verdict);
    expect(a.verdict).toBe('ok'); // not "clipped", not 16× too high
    expect(a.bitsUsed).toBeCloseTo(j.quality.bitsUsed, 9);
    for (const [ours, theirs] of [
      [a.overall.accelRmsG, j.overall.accelRmsG],
      [a.overall.accelPeakG, j.overall.accelPeakG],
      [a.overall.velocityRmsMmS, j.overall.velocityRmsMmS],
      [a.overall.displacementPkPkUm, j.overall.displacementPkPkUm],
      [a.overall.crestFactor, j.overall.crestFactor],
      [a.overall.kurtosis, j.overall.kurtosis],
    ])
      expect(ours / theirs).toBeCloseTo(1, 9);
  });
});

describe('a point’s envelope band', () => {
  it('is saved with the point, refused when half given, and used by the worker for its captures', async () => {
    const tree = await (await srv.call('GET', '/api/v1/setup', { cookie: engineer })).json();
    const point = tree.machines
      .flatMap((m: { points: { id: number }[] }) => m.points)
      .find((p: { id: number }) => p.id === pointId);
    const { id: _id, ...body } = point;
    const half = await srv.call('PATCH', `/api/v1/points/${pointId}`, {
      cookie: engineer,
      body: { ...body, envelopeLoHz: 4000, envelopeHiHz: null },
    });
    expect(half.status).toBe(400);
    expect((await half.json()).error.details).toEqual([
      expect.objectContaining({ path: 'envelopeHiHz' }),
    ]);
    const saved = await srv.call('PATCH', `/api/v1/points/${pointId}`, {
      cookie: engineer,
      body: { ...body, envelopeLoHz: 4000, envelopeHiHz: 7000 },
    });
    expect(saved.status).toBe(200);
    const again = await (await srv.call('GET', '/api/v1/setup', { cookie: engineer })).json();
    expect(
      again.machines
        .flatMap((m: { points: { id: number }[] }) => m.points)
        .find((p: { id: number }) => p.id === pointId),
    ).toMatchObject({ envelopeLoHz: 4000, envelopeHiHz: 7000 });

    // a 25.6 kHz capture: the band holds below fs/2.56 = 10 kHz, so it is used as set
    const counts = toneCounts({ n: 8192, fs: 25600, tones: [TONE], noiseG: 0.01, seed: 9 });
    const res = await upload(writeWav(counts, 25600, 'int16'), 'band.wav', wavFields);
    expect(res.status).toBe(201);
    const { snapshotId } = await res.json();
    await createWorker(srv.ctx).drain();
    // The spectra's axes are their stored detail, inside the spectra BLOB (stored-summary.ts).
    const [row] = await q('SELECT spectra FROM analyses WHERE snapshot_id = ?', [snapshotId]);
    const detail = decodeSpectraDetail(row!.spectra as Buffer) as {
      spectra: { envelope: { bandHz: [number, number] } };
    };
    const [lo, hi] = detail.spectra.envelope.bandHz;
    // snapped to the capture's lines, 25600 / 8192 = 3.125 Hz apart
    expect(Math.abs(lo - 4000)).toBeLessThan(3.2);
    expect(Math.abs(hi - 7000)).toBeLessThan(3.2);
  });
});
