/**
 * The nightly compaction (apps/server/src/features/worker/compaction.ts) on a real MariaDB
 * with captures stored by the real ingest and worker: done jobs go after their keep days
 * (failed and queued ones stay), a thinned analysis written before the spectra's detail
 * moved into the spectra BLOB loses that detail from its summary (a whole one keeps it),
 * and the monthly online rebuild of the thinned tables runs once a month and changes no
 * row. Expectations follow from the module's own definitions (common practice, no source).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { decodeSpectraDetail } from '@turnstone/db/spectra-codec';
import {
  DONE_JOBS_KEEP_DAYS,
  runCompaction,
} from '../../apps/server/src/features/worker/compaction.ts';
import { retentionPolicy } from '../../apps/server/src/features/worker/retention.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { analysedCaptures } from '../support/analysed-captures.ts';

let srv: TestServer;
const TAG = 'MFP-P102-MDE-H';
const DAY = 86_400_000;

beforeAll(async () => {
  srv = await startTestServer();
});
afterAll(async () => {
  await srv?.stop();
});

describe('nightly compaction', () => {
  let ids: number[];
  const now = new Date();
  beforeAll(async () => {
    const key = await srv.gatewayKey(1, 'gw-compaction');
    const times = [1, 2, 3].map((h) => new Date(now.getTime() - h * 3_600_000).toISOString());
    ids = [...(await analysedCaptures(srv, key, TAG, times)).values()];
  });

  it('removes done jobs past their keep days, keeps newer, failed and queued ones', async () => {
    const old = new Date(now.getTime() - (DONE_JOBS_KEEP_DAYS + 1) * DAY);
    const recent = new Date(now.getTime() - (DONE_JOBS_KEEP_DAYS - 1) * DAY);
    const add = async (state: string, at: Date) => {
      const r = (await srv.q(
        `INSERT INTO jobs (kind, state, run_after, finished_at, created_at) VALUES ('analyse', ?, ?, ?, ?)`,
        [state, at, state === 'queued' ? null : at, at],
      )) as unknown as { insertId: number };
      return Number(r.insertId);
    };
    const oldDone = await add('done', old);
    const recentDone = await add('done', recent);
    const oldFailed = await add('failed', old);
    const oldQueued = await add('queued', new Date(now.getTime() + 365 * DAY));
    const policy = retentionPolicy(srv.ctx.config);
    const r = await runCompaction(srv.ctx.db, policy, now, { rebuild: false });
    expect(r.doneJobsDeleted).toBe(1);
    const left = await srv.q('SELECT id FROM jobs WHERE id IN (?)', [
      [oldDone, recentDone, oldFailed, oldQueued],
    ]);
    expect(left.map((j) => Number(j.id)).sort((a, b) => a - b)).toEqual(
      [recentDone, oldFailed, oldQueued].sort((a, b) => a - b),
    );
    await srv.q('DELETE FROM jobs WHERE id IN (?)', [[recentDone, oldFailed, oldQueued]]);
  });

  it('trims the detail from the summary of a thinned analysis written before the split, not of a whole one', async () => {
    // Two analyses as rows written before the split: the detail in the summary too.
    for (const id of ids.slice(0, 2)) {
      const [row] = await srv.q('SELECT spectra FROM analyses WHERE id = ?', [id]);
      const detail = decodeSpectraDetail(row!.spectra as Buffer);
      await srv.q('UPDATE analyses SET summary = JSON_MERGE_PATCH(summary, ?) WHERE id = ?', [
        JSON.stringify(detail),
        id,
      ]);
    }
    // The first is thinned (as the retention pass does: spectra cleared, time set).
    await srv.q(
      'UPDATE analyses SET spectra = NULL, spectra_thinned_at = CURRENT_TIMESTAMP(3) WHERE id = ?',
      [ids[0]],
    );
    const summaryOf = async (id: number) => {
      const [row] = await srv.q('SELECT summary FROM analyses WHERE id = ?', [id]);
      const s = row!.summary;
      return (typeof s === 'string' ? JSON.parse(s) : s) as Record<string, unknown>;
    };
    const wholeBefore = await summaryOf(ids[1]!);
    const thinnedBefore = await summaryOf(ids[0]!);
    expect(Object.keys(thinnedBefore)).toContain('peaks');
    const r = await runCompaction(srv.ctx.db, retentionPolicy(srv.ctx.config), now, {
      rebuild: false,
    });
    expect(r.summariesTrimmed).toBe(1);
    const thinned = await summaryOf(ids[0]!);
    for (const k of ['spectra', 'peaks', 'faultFrequencies', 'qualityMetrics'])
      expect({ k, kept: k in thinned }).toEqual({ k, kept: false });
    const { spectra, peaks, faultFrequencies, qualityMetrics, ...rest } = thinnedBefore;
    expect([spectra, peaks, faultFrequencies, qualityMetrics].every((v) => v !== undefined)).toBe(
      true,
    );
    expect(thinned).toEqual(rest);
    expect(await summaryOf(ids[1]!)).toEqual(wholeBefore);
    // The point's capture list still reads the thinned one, marked thinned.
    const cookie = await srv.signIn('admin');
    const [p] = await srv.q('SELECT point_id FROM analyses WHERE id = ?', [ids[0]]);
    const res = await srv.call('GET', `/api/v1/points/${p!.point_id}/analyses?limit=10`, {
      cookie,
    });
    expect(res.status).toBe(200);
    const list = (await res.json()) as { items: { id: number; spectraThinned: boolean }[] };
    expect(list.items.find((a) => a.id === ids[0])?.spectraThinned).toBe(true);
  });

  it('rebuilds the thinned tables online once a month, every row as it was', async () => {
    const rows = async () =>
      srv.q(
        `SELECT a.id, a.velocity_rms_mm_s, a.summary, LENGTH(a.spectra) AS n, s.uid
           FROM analyses a JOIN snapshots s ON s.id = a.snapshot_id ORDER BY a.id`,
      );
    const before = await rows();
    const policy = retentionPolicy(srv.ctx.config);
    const first = await runCompaction(srv.ctx.db, policy, now);
    const second = await runCompaction(srv.ctx.db, policy, now);
    const nextMonth = await runCompaction(
      srv.ctx.db,
      policy,
      new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() + 1, 2)),
    );
    expect([first.rebuilt, second.rebuilt, nextMonth.rebuilt]).toEqual([
      ['analyses', 'snapshots'],
      [],
      ['analyses', 'snapshots'],
    ]);
    expect(await rows()).toEqual(before);
  });
});
