/**
 * The worker's batch commits and job leases on a real MariaDB: a batch with a capture it cannot
 * analyse or write, leases taken over mid-batch, two workers at once, and limits saved while a
 * batch was being analysed. Single captures and retention: worker.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { claimJobs, failJob } from '../../apps/server/src/features/queue/queue-repository.ts';
import {
  prepareAnalyses,
  runAnalysisJobs,
  storeAnalyses,
} from '../../apps/server/src/features/analysis/analysis-service.ts';
import { testServerForFile } from '../support/api-suite.ts';
import { snapshotBody } from '../support/signals.ts';
import { postSnapshot, quietQueue } from '../support/alert-captures.ts';

const srv = testServerForFile({ env: { JOB_LEASE_S: '1' }, gateway: true });
const TAG = 'MFP-P102-MDE-H';

const ingest = (uid: string, o: Parameters<typeof snapshotBody>[2] = {}, tag = TAG) =>
  postSnapshot(srv, srv.key, snapshotBody(tag, uid, o));

describe('worker batches', () => {
  it('in a batch where one snapshot cannot be analysed, the others are stored once and it alone is retried', async () => {
    await quietQueue(srv);
    const t0 = Date.parse('2026-11-21T00:00:00Z');
    const ids: number[] = [];
    for (let i = 0; i < 5; i++)
      ids.push(
        await ingest(`wb-${i}`, { takenAt: new Date(t0 + i * 60_000).toISOString(), seed: i }),
      );
    const bad = ids[2]!;
    // Not deflate data: inflating it throws, a fault that may pass, so the job is retried.
    await srv.ctx.dbHandle.pool.query('UPDATE snapshots SET samples = ? WHERE id = ?', [
      Buffer.from([1, 2, 3]),
      bad,
    ]);
    const worker = createWorker(srv.ctx, { owner: 'wb', batch: 8 });
    expect(await worker.drain()).toBe(5);
    const counts = await srv.q(
      `SELECT s.id, COUNT(a.id) AS n FROM snapshots s LEFT JOIN analyses a ON a.snapshot_id = s.id
        WHERE s.id IN (${ids.join(',')}) GROUP BY s.id`,
    );
    for (const r of counts) expect(Number(r.n)).toBe(Number(r.id) === bad ? 0 : 1);
    const jobs = await srv.q(
      `SELECT snapshot_id, state, attempts, last_error, run_after > NOW(3) AS later
         FROM jobs WHERE snapshot_id IN (${ids.join(',')})`,
    );
    for (const j of jobs) {
      if (Number(j.snapshot_id) === bad) {
        expect(j.state).toBe('queued');
        expect(Number(j.attempts)).toBe(1);
        expect(j.last_error).toBeTruthy();
        expect(Number(j.later)).toBe(1); // backed off
      } else {
        expect(j.state).toBe('done');
        expect(j.last_error).toBeNull();
      }
    }
  });

  it('a batch that cannot be written is run job by job: only the job at fault fails', async () => {
    await quietQueue(srv);
    const t0 = Date.parse('2026-11-22T00:00:00Z');
    const ids: number[] = [];
    for (let i = 0; i < 4; i++)
      ids.push(
        await ingest(`wc-${i}`, { takenAt: new Date(t0 + i * 60_000).toISOString(), seed: i }),
      );
    const taken = ids[1]!;
    // An analysis already stored for one snapshot: the batch's multi-row insert hits the
    // unique index, so the whole batch rolls back.
    await srv.ctx.dbHandle.pool.query(
      `INSERT INTO analyses (snapshot_id, point_id, taken_at, accel_rms_g, accel_peak_g,
         velocity_rms_mm_s, displacement_pkpk_um, crest_factor, kurtosis, speed_source,
         quality_verdict, quality_findings, summary)
       SELECT id, point_id, taken_at, 0, 0, 0, 0, 0, 0, 'none', 'ok', '[]', '{}'
         FROM snapshots WHERE id = ?`,
      [taken],
    );
    const worker = createWorker(srv.ctx, { owner: 'wc', batch: 8 });
    expect(await worker.drain()).toBe(4);
    const counts = await srv.q(
      `SELECT snapshot_id, COUNT(*) AS n, MAX(velocity_rms_mm_s) AS v FROM analyses
        WHERE snapshot_id IN (${ids.join(',')}) GROUP BY snapshot_id`,
    );
    expect(counts.length).toBe(4);
    for (const r of counts) {
      expect(Number(r.n)).toBe(1);
      if (Number(r.snapshot_id) === taken)
        expect(Number(r.v)).toBe(0); // the planted row
      else expect(Number(r.v)).toBeGreaterThan(0);
    }
    const jobs = await srv.q(
      `SELECT snapshot_id, state, last_error FROM jobs WHERE snapshot_id IN (${ids.join(',')})`,
    );
    for (const j of jobs) {
      if (Number(j.snapshot_id) === taken) {
        expect(j.state).toBe('queued');
        expect(String(j.last_error)).toMatch(/analyses/);
      } else expect(j.state).toBe('done');
    }
  });

  it('a batch with one job whose lease was taken over writes nothing', async () => {
    await quietQueue(srv);
    const t0 = Date.parse('2026-11-23T00:00:00Z');
    const ids: number[] = [];
    for (let i = 0; i < 3; i++)
      ids.push(
        await ingest(`wl-${i}`, { takenAt: new Date(t0 + i * 60_000).toISOString(), seed: i }),
      );
    const claimed = await claimJobs(srv.ctx.db, 'slow', 60, 10, ['analyze']);
    expect(claimed.map((j) => j.snapshotId)).toEqual(ids);
    await srv.ctx.dbHandle.pool.query(
      "UPDATE jobs SET lease_owner = 'thief' WHERE snapshot_id = ?",
      [ids[1]],
    );
    await expect(runAnalysisJobs(srv.ctx, claimed, 'slow')).rejects.toThrow(/lease/);
    const rows = await srv.q(
      `SELECT COUNT(*) AS n FROM analyses WHERE snapshot_id IN (${ids.join(',')})`,
    );
    expect(Number(rows[0]!.n)).toBe(0);
    const states = await srv.q(
      `SELECT state, lease_owner FROM jobs WHERE snapshot_id IN (${ids.join(',')}) ORDER BY snapshot_id`,
    );
    expect(states.map((s) => [s.state, s.lease_owner])).toEqual([
      ['running', 'slow'],
      ['running', 'thief'],
      ['running', 'slow'],
    ]);
  });

  it('a failure reported by a worker that lost the lease changes nothing', async () => {
    await quietQueue(srv);
    const id = await ingest('wf-lost', { takenAt: new Date(Date.now() - 5_400_000).toISOString() });
    const [job] = await claimJobs(srv.ctx.db, 'first', 60, 1, ['analyze']);
    expect(job!.snapshotId).toBe(id);
    await srv.ctx.dbHandle.pool.query("UPDATE jobs SET lease_owner = 'second' WHERE id = ?", [
      job!.id,
    ]);
    // The last attempt, so a recorded failure would be final; but the job is not first's.
    expect(await failJob(srv.ctx.db, { ...job!, maxAttempts: job!.attempts }, 'first', 'x')).toBe(
      'lost',
    );
    const [row] = await srv.q('SELECT state, lease_owner, last_error FROM jobs WHERE id = ?', [
      job!.id,
    ]);
    expect(row).toEqual({ state: 'running', lease_owner: 'second', last_error: null });
    // Its owner's report is recorded.
    expect(await failJob(srv.ctx.db, job!, 'second', 'refused')).toBe('retry');
    const [after] = await srv.q('SELECT state, lease_owner, last_error FROM jobs WHERE id = ?', [
      job!.id,
    ]);
    expect(after).toEqual({ state: 'queued', lease_owner: null, last_error: 'refused' });
  });

  it('two workers with batch commits over several points analyse each snapshot once and judge up to the latest', async () => {
    await quietQueue(srv);
    // Points no other test here writes to; captures newer than anything seeded.
    const tags = ['MFP-P102-MDE-V', 'MFP-P102-MNDE-H', 'MFP-P101-MDE-V'];
    const t0 = Date.now() - 3_600_000;
    const ids: number[] = [];
    for (let i = 0; i < 48; i++)
      ids.push(
        await ingest(
          `wm-${i}`,
          { takenAt: new Date(t0 + i * 60_000).toISOString(), seed: i },
          tags[i % 3],
        ),
      );
    const a = createWorker(srv.ctx, { owner: 'wm-a', batch: 8 });
    const b = createWorker(srv.ctx, { owner: 'wm-b', batch: 8 });
    const [na, nb] = await Promise.all([a.drain(), b.drain()]);
    expect(na + nb).toBe(48);
    const rows = await srv.q(
      `SELECT snapshot_id, COUNT(*) AS n FROM analyses WHERE snapshot_id IN (${ids.join(',')}) GROUP BY snapshot_id`,
    );
    expect(rows.length).toBe(48);
    expect(rows.every((r) => Number(r.n) === 1)).toBe(true);
    const bands = await srv.q(
      `SELECT COUNT(DISTINCT analysis_id) AS n FROM band_values
        WHERE analysis_id IN (SELECT id FROM analyses WHERE snapshot_id IN (${ids.join(',')}))`,
    );
    expect(Number(bands[0]!.n)).toBe(48);
    // The analyses carry their capture's time exactly (written through the binary protocol).
    const shifted = await srv.q(
      `SELECT COUNT(*) AS n FROM analyses a JOIN snapshots s ON s.id = a.snapshot_id
        WHERE s.id IN (${ids.join(',')}) AND a.taken_at <> s.taken_at`,
    );
    expect(Number(shifted[0]!.n)).toBe(0);
    const jobs = await srv.q(`SELECT state FROM jobs WHERE snapshot_id IN (${ids.join(',')})`);
    expect(jobs.every((j) => j.state === 'done')).toBe(true);
    // Each point's state was judged up to its latest capture, and the point shows it.
    const pts = await srv.q(
      `SELECT p.tag, ps.evaluated_taken_at AS judged, p.last_taken_at AS last,
              (SELECT MAX(taken_at) FROM snapshots s
                WHERE s.point_id = p.id AND s.id IN (${ids.join(',')})) AS latest
         FROM points p JOIN point_states ps ON ps.point_id = p.id
        WHERE p.tag IN (${tags.map(() => '?').join(',')})`,
      tags,
    );
    expect(pts.length).toBe(3);
    for (const p of pts) {
      expect(new Date(p.judged as Date).getTime()).toBe(new Date(p.latest as Date).getTime());
      expect(new Date(p.last as Date).getTime()).toBe(new Date(p.latest as Date).getTime());
    }
  });

  it('limits saved while a batch was being analysed are the ones its captures are judged by', async () => {
    await quietQueue(srv);
    const tag = 'MFP-P101-MNDE-H';
    const t0 = Date.now() - 1_800_000;
    const ids: number[] = [];
    for (let i = 0; i < 3; i++)
      ids.push(
        await ingest(
          `wv-${i}`,
          {
            takenAt: new Date(t0 + i * 60_000).toISOString(),
            seed: i,
            tones: [{ hz: 24.7, peakG: 0.2 }],
          },
          tag,
        ),
      );
    // The worker computes the batch against the point's limit set as it is now…
    const claimed = await claimJobs(srv.ctx.db, 'wv', 60, 10, ['analyze']);
    expect(claimed.map((j) => j.snapshotId)).toEqual(ids);
    const { prepared } = await prepareAnalyses(srv.ctx, claimed);
    const before = prepared[0]!.limitSet;
    // …an engineer saves a new version with one more band before the batch is written…
    const engineer = await srv.signIn('engineer');
    const pointId = prepared[0]!.snap.pointId;
    const current = await (
      await srv.call('GET', `/api/v1/points/${pointId}/limits`, { cookie: engineer })
    ).json();
    const copy = {
      ...current.bands.find((b: { key: string }) => b.key === 'order-1x'),
      key: 'order-1x-second',
      name: 'Second 1× band',
    };
    const saved = await srv.call('PUT', `/api/v1/points/${pointId}/limits`, {
      cookie: engineer,
      body: { bands: [...current.bands, copy], reason: 'Second 1× band for the worker test' },
    });
    expect(saved.status).toBe(200);
    const version = (await saved.json()).version as number;
    expect(version).toBe(before.version + 1);
    // …so the batch is written with the saved version: its bands, and judged by it.
    const out = await storeAnalyses(srv.ctx, prepared, 'wv');
    expect(out.length).toBe(3);
    const keys = await srv.q(
      `SELECT a.snapshot_id, GROUP_CONCAT(b.band_key ORDER BY b.band_key) AS k FROM analyses a
         JOIN band_values b ON b.analysis_id = a.id
        WHERE a.snapshot_id IN (${ids.join(',')}) GROUP BY a.snapshot_id`,
    );
    expect(keys.length).toBe(3);
    for (const r of keys) expect(String(r.k).split(',')).toContain('order-1x-second');
    // The 1× band and its copy measure the same thing: the same value (common practice, no source).
    const pairs = await srv.q(
      `SELECT b.band_key, b.value FROM band_values b JOIN analyses a ON a.id = b.analysis_id
        WHERE a.snapshot_id = ? AND b.band_key IN ('order-1x', 'order-1x-second')`,
      [ids[0]],
    );
    expect(pairs.length).toBe(2);
    expect(Number(pairs[0]!.value)).toBeCloseTo(Number(pairs[1]!.value), 9);
    const [state] = await srv.q('SELECT limit_set_version FROM point_states WHERE point_id = ?', [
      pointId,
    ]);
    expect(Number(state!.limit_set_version)).toBe(version);
  });
});
