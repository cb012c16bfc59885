import { describe, expect, it } from 'vitest';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { claimJobs } from '../../apps/server/src/features/queue/queue-repository.ts';
import { runAnalysisJob } from '../../apps/server/src/features/analysis/analysis-service.ts';
import { expireRawSamples } from '../../apps/server/src/features/worker/retention.ts';
import { readWav } from '@turnstone/dsp';
import { testServerForFile } from '../support/api-suite.ts';
import { snapshotBody } from '../support/signals.ts';
import { postSnapshot, quietQueue } from '../support/alert-captures.ts';

const srv = testServerForFile({ env: { JOB_LEASE_S: '1' }, gateway: true });
const TAG = 'MFP-P102-MDE-H';

const ingest = (uid: string, o: Parameters<typeof snapshotBody>[2] = {}, tag = TAG) =>
  postSnapshot(srv, srv.key, snapshotBody(tag, uid, o));

describe('worker', () => {
  it('turns a queued snapshot into one analysis with band values and marks it done', async () => {
    // 0.5 g peak at 24.7 Hz (1× of a 1480 r/min pump): 0.3536 g RMS (sine: RMS = peak/√2,
    // definition of RMS); velocity 0.5·9806.65/(2π·24.7)/√2 = 22.33 mm/s RMS (v = a/2πf).
    const id = await ingest('w-1', { tones: [{ hz: 24.7, peakG: 0.5 }], noiseG: 0.001 });
    const worker = createWorker(srv.ctx, { owner: 'test-worker' });
    expect(await worker.drain()).toBe(1);
    const [a] = await srv.q('SELECT * FROM analyses WHERE snapshot_id = ?', [id]);
    expect(a).toBeDefined();
    expect(Number(a!.accel_rms_g)).toBeCloseTo(0.3536, 2);
    expect(Number(a!.velocity_rms_mm_s)).toBeGreaterThan(21.5);
    expect(Number(a!.velocity_rms_mm_s)).toBeLessThan(23.2);
    expect(a!.quality_verdict).toBe('ok');
    const bands = await srv.q('SELECT band_key FROM band_values WHERE analysis_id = ?', [a!.id]);
    expect(bands.map((b) => b.band_key)).toEqual(
      expect.arrayContaining(['overall-velocity', 'order-1x']),
    );
    const [s] = await srv.q('SELECT status FROM snapshots WHERE id = ?', [id]);
    expect(s!.status).toBe('done');
    const [p] = await srv.q('SELECT last_taken_at, last_verdict FROM points WHERE tag = ?', [TAG]);
    expect(p!.last_verdict).toBe('ok');
  });

  it('analyses a large capture stored as raw deflate, and its WAV reads back to the posted counts', async () => {
    await quietQueue(srv);
    // 131,072 samples (256 kB) are stored deflated; 0.5 g peak at 24.7 Hz reads 0.3536 g RMS
    // (sine: RMS = peak/√2, definition of RMS), as the gateway-sized capture above.
    const opts = {
      n: 131_072,
      tones: [{ hz: 24.7, peakG: 0.5 }],
      noiseG: 0.001,
      takenAt: new Date(Date.now() - 7_200_000).toISOString(),
    };
    const id = await ingest('w-large', opts);
    const [codec] = await srv.q('SELECT samples_codec FROM snapshots WHERE id = ?', [id]);
    expect(codec!.samples_codec).toBe('deflate-raw');
    expect(await createWorker(srv.ctx, { owner: 'w-large' }).drain()).toBe(1);
    const [a] = await srv.q('SELECT id, accel_rms_g FROM analyses WHERE snapshot_id = ?', [id]);
    expect(Number(a!.accel_rms_g)).toBeCloseTo(0.3536, 2);
    const wav = await srv.call('GET', `/api/v1/analyses/${a!.id}/waveform.wav`, {
      cookie: await srv.signIn('engineer'),
    });
    expect(wav.status).toBe(200);
    const rec = readWav(new Uint8Array(await wav.arrayBuffer()));
    expect(Buffer.from(new Int16Array(Array.from(rec.samples)).buffer)).toEqual(
      Buffer.from(snapshotBody(TAG, 'w-large', opts).samples, 'base64'),
    );
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
    const rows = await srv.q(
      `SELECT snapshot_id, COUNT(*) AS n FROM analyses WHERE snapshot_id IN (${ids.join(',')}) GROUP BY snapshot_id`,
    );
    expect(rows.length).toBe(24);
    expect(rows.every((r) => Number(r.n) === 1)).toBe(true);
    const jobs = await srv.q(`SELECT state FROM jobs WHERE snapshot_id IN (${ids.join(',')})`);
    expect(jobs.every((j) => j.state === 'done')).toBe(true);
  });

  it('a job whose worker died is claimed again after its lease and analysed once', async () => {
    const id = await ingest('w-dead');
    // The "dead" worker claims and never finishes.
    const claimed = await claimJobs(srv.ctx.db, 'dead-worker', 600, 10, ['analyze']);
    expect(claimed.map((j) => j.snapshotId)).toContain(id);
    const alive = createWorker(srv.ctx, { owner: 'alive' });
    expect(await alive.drain()).toBe(0); // lease still held
    // Ten minutes pass: the lease runs out (set in SQL rather than waited for).
    await srv.q(
      'UPDATE jobs SET lease_expires_at = CURRENT_TIMESTAMP(3) - INTERVAL 1 SECOND WHERE snapshot_id = ?',
      [id],
    );
    expect(await alive.drain()).toBe(1);
    const rows = await srv.q('SELECT COUNT(*) AS n FROM analyses WHERE snapshot_id = ?', [id]);
    expect(Number(rows[0]!.n)).toBe(1);
    // The dead worker waking up late cannot commit a second result: its lease is gone.
    await expect(
      runAnalysisJob(
        srv.ctx,
        claimed.find((j) => j.snapshotId === id)!,
        'dead-worker',
      ),
    ).rejects.toThrow();
    const after = await srv.q('SELECT COUNT(*) AS n FROM analyses WHERE snapshot_id = ?', [id]);
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
    const [s] = await srv.q('SELECT status, status_reason FROM snapshots WHERE id = ?', [id]);
    // After one attempt the job waits for its retry (back-off), with the reason recorded.
    expect(s!.status).toBe('queued');
    const [j] = await srv.q('SELECT state, last_error, attempts FROM jobs WHERE snapshot_id = ?', [
      id,
    ]);
    expect(j!.state).toBe('queued');
    expect(Number(j!.attempts)).toBe(1);
    expect(String(j!.last_error)).toMatch(/\w/);
  });

  it('retention drops raw samples of old snapshots and keeps their analyses', async () => {
    const id = await ingest('w-old');
    await createWorker(srv.ctx, { owner: 'w' }).drain();
    await srv.ctx.dbHandle.pool.query(
      'UPDATE snapshots SET received_at = NOW(3) - INTERVAL 100 DAY WHERE id = ?',
      [id],
    );
    // Taken 100 days back too: a capture taken just after a limit change or near an alert
    // event is kept whole by retention (tests/api/retention.test.ts).
    await srv.ctx.dbHandle.pool.query(
      'UPDATE analyses SET taken_at = NOW(3) - INTERVAL 100 DAY WHERE snapshot_id = ?',
      [id],
    );
    const n = await expireRawSamples(srv.ctx.db, 90);
    expect(n).toBeGreaterThanOrEqual(1);
    const [s] = await srv.q('SELECT samples IS NULL AS gone FROM snapshots WHERE id = ?', [id]);
    expect(Number(s!.gone)).toBe(1);
    const rows = await srv.q('SELECT COUNT(*) AS n FROM analyses WHERE snapshot_id = ?', [id]);
    expect(Number(rows[0]!.n)).toBe(1);
  });
});
