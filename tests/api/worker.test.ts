import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { claimJobs } from '../../apps/server/src/features/worker/queue-repository.ts';
import { runAnalysisJob } from '../../apps/server/src/features/analysis/analysis-service.ts';
import { expireRawSamples } from '../../apps/server/src/features/worker/retention.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { snapshotBody } from '../support/signals.ts';

let srv: TestServer;
let key: string;
const TAG = 'MFP-P102-MDE-H';

async function q(sqlText: string, params: unknown[] = []) {
  const [rows] = await srv.ctx.dbHandle.pool.query(sqlText, params);
  return rows as Record<string, unknown>[];
}
async function ingest(uid: string, o: Parameters<typeof snapshotBody>[2] = {}) {
  const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
    body: snapshotBody(TAG, uid, o),
    headers: { authorization: `Bearer ${key}` },
  });
  expect(res.status).toBe(201);
  return (await res.json()).snapshotId as number;
}

beforeAll(async () => {
  srv = await startTestServer({ JOB_LEASE_S: '1' });
  const admin = await srv.signIn('admin');
  key = (
    await (
      await srv.call('POST', '/api/v1/gateways', { cookie: admin, body: { siteId: 1, name: 'gw' } })
    ).json()
  ).apiKey;
});
afterAll(async () => {
  await srv?.stop();
});

describe('worker', () => {
  it('turns a queued snapshot into one analysis with band values and marks it done', async () => {
    // 0.5 g peak at 24.7 Hz (1× of a 1480 r/min pump): 0.3536 g RMS (sine: RMS = peak/√2,
    // REFERENCES.md); velocity 0.5·9806.65/(2π·24.7)/√2 = 22.33 mm/s RMS (v = a/2πf).
    const id = await ingest('w-1', { tones: [{ hz: 24.7, peakG: 0.5 }], noiseG: 0.001 });
    const worker = createWorker(srv.ctx, { owner: 'test-worker' });
    expect(await worker.drain()).toBe(1);
    const [a] = await q('SELECT * FROM analyses WHERE snapshot_id = ?', [id]);
    expect(a).toBeDefined();
    expect(Number(a!.accel_rms_g)).toBeCloseTo(0.3536, 2);
    expect(Number(a!.velocity_rms_mm_s)).toBeGreaterThan(21.5);
    expect(Number(a!.velocity_rms_mm_s)).toBeLessThan(23.2);
    expect(a!.quality_verdict).toBe('ok');
    const bands = await q('SELECT band_key FROM band_values WHERE analysis_id = ?', [a!.id]);
    expect(bands.map((b) => b.band_key)).toEqual(
      expect.arrayContaining(['overall-velocity', 'order-1x']),
    );
    const [s] = await q('SELECT status FROM snapshots WHERE id = ?', [id]);
    expect(s!.status).toBe('done');
    const [p] = await q('SELECT last_taken_at, last_verdict FROM points WHERE tag = ?', [TAG]);
    expect(p!.last_verdict).toBe('ok');
  });

  it('with two workers draining at once, each snapshot is analysed exactly once', async () => {
    const ids: number[] = [];
    const t0 = Date.parse('2026-11-20T00:00:00Z');
    for (let i = 0; i < 24; i++)
      ids.push(
        await ingest(`w2-${i}`, { takenAt: new Date(t0 + i * 60_000).toISOString(), seed: i }),
      );
    const a = createWorker(srv.ctx, { owner: 'worker-a', batch: 3 });
    const b = createWorker(srv.ctx, { owner: 'worker-b', batch: 3 });
    const [na, nb] = await Promise.all([a.drain(), b.drain()]);
    expect(na + nb).toBe(24);
    expect(na).toBeGreaterThan(0);
    expect(nb).toBeGreaterThan(0);
    const rows = await q(
      `SELECT snapshot_id, COUNT(*) AS n FROM analyses WHERE snapshot_id IN (${ids.join(',')}) GROUP BY snapshot_id`,
    );
    expect(rows.length).toBe(24);
    expect(rows.every((r) => Number(r.n) === 1)).toBe(true);
    const jobs = await q(`SELECT state FROM jobs WHERE snapshot_id IN (${ids.join(',')})`);
    expect(jobs.every((j) => j.state === 'done')).toBe(true);
  });

  it('a job whose worker died is claimed again after its lease and analysed once', async () => {
    const id = await ingest('w-dead');
    // The "dead" worker claims and never finishes.
    const claimed = await claimJobs(srv.ctx.db, 'dead-worker', 1, 10, ['analyze']);
    expect(claimed.map((j) => j.snapshotId)).toContain(id);
    const alive = createWorker(srv.ctx, { owner: 'alive' });
    expect(await alive.drain()).toBe(0); // lease still held
    await new Promise((r) => setTimeout(r, 1200));
    expect(await alive.drain()).toBe(1);
    const rows = await q('SELECT COUNT(*) AS n FROM analyses WHERE snapshot_id = ?', [id]);
    expect(Number(rows[0]!.n)).toBe(1);
    // The dead worker waking up late cannot commit a second result: its lease is gone.
    await expect(
      runAnalysisJob(
        srv.ctx,
        claimed.find((j) => j.snapshotId === id)!,
        'dead-worker',
      ),
    ).rejects.toThrow();
    const after = await q('SELECT COUNT(*) AS n FROM analyses WHERE snapshot_id = ?', [id]);
    expect(Number(after[0]!.n)).toBe(1);
  });

  it('a snapshot the analysis refuses ends failed with its reason, and the queue moves on', async () => {
    // 8-bit ADC declared with samples beyond its range is refused by the analysis.
    const id = await ingest('w-bad', { bits: 16, fullScaleV: 5 });
    await srv.ctx.dbHandle.pool.query('UPDATE snapshots SET samples = ? WHERE id = ?', [
      Buffer.from([1, 2, 3]),
      id,
    ]);
    const worker = createWorker(srv.ctx, { owner: 'w' });
    await worker.drain();
    const [s] = await q('SELECT status, status_reason FROM snapshots WHERE id = ?', [id]);
    expect(['failed', 'queued']).toContain(s!.status);
    const [j] = await q('SELECT state, last_error, attempts FROM jobs WHERE snapshot_id = ?', [id]);
    expect(j!.last_error).toBeTruthy();
  });

  it('retention drops raw samples of old snapshots and keeps their analyses', async () => {
    const id = await ingest('w-old');
    await createWorker(srv.ctx, { owner: 'w' }).drain();
    await srv.ctx.dbHandle.pool.query(
      'UPDATE snapshots SET received_at = NOW(3) - INTERVAL 100 DAY WHERE id = ?',
      [id],
    );
    const n = await expireRawSamples(srv.ctx.db, 90);
    expect(n).toBeGreaterThanOrEqual(1);
    const [s] = await q('SELECT samples IS NULL AS gone FROM snapshots WHERE id = ?', [id]);
    expect(Number(s!.gone)).toBe(1);
    const rows = await q('SELECT COUNT(*) AS n FROM analyses WHERE snapshot_id = ?', [id]);
    expect(Number(rows[0]!.n)).toBe(1);
  });
});
