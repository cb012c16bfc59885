/**
 * Monthly partitions of the captures' tables (snapshots, analyses, band_values by
 * `taken_at`, migration 0018_time-partitioning), on a real MariaDB with captures stored by
 * the real ingest and worker: the partitions exist (information_schema.PARTITIONS), the
 * worker adds months ahead, the retention pass drops a whole month past the capture horizon
 * unless a capture kept whole lives in it, and what the foreign keys did (refusing a capture
 * for a deleted point, cascading a capture's rows) the product now does itself.
 *
 * Month arithmetic is calendar arithmetic in UTC (common practice, no source).
 */
import { describe, expect, it } from 'vitest';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import {
  dropExpiredPartitions,
  ensurePartitionsAhead,
  MONTHS_AHEAD,
  monthStart,
} from '../../apps/server/src/features/worker/partitions.ts';
import { storeSnapshot } from '../../apps/server/src/features/ingest/ingest-service.ts';
import { deletePoints } from '../../apps/server/src/features/setup/setup-repository.ts';
import { testServerForFile } from '../support/api-suite.ts';
import { snapshotBody } from '../support/signals.ts';

const srv = testServerForFile({ signIn: ['admin'], gateway: true });
const TABLES = ['snapshots', 'analyses', 'band_values'];
/** Captures of long ago (before any demo limit change, alert or finding). */
const OLD = ['2024-03-04T10:00:00.000Z', '2024-03-04T10:10:00.000Z', '2024-03-05T09:00:00.000Z'];

async function q(sqlText: string, params: unknown[] = []) {
  const [rows] = await srv.ctx.dbHandle.pool.query(sqlText, params);
  return rows as Record<string, unknown>[];
}

async function partitions(table: string) {
  const rows = await q(
    `SELECT PARTITION_NAME AS name, PARTITION_DESCRIPTION AS bound, PARTITION_METHOD AS method,
            PARTITION_EXPRESSION AS expr
       FROM information_schema.PARTITIONS
      WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME = ? ORDER BY PARTITION_ORDINAL_POSITION`,
    [table],
  );
  return rows.map((r) => ({
    name: String(r.name),
    bound: String(r.bound).replace(/'/g, '').slice(0, 10),
    method: String(r.method),
    expr: String(r.expr),
  }));
}

const monthName = (d: Date) => `p${d.toISOString().slice(0, 7).replace('-', '')}`;

/** Ingests captures of `tag` at `times` and analyses them; returns their snapshot ids. */
async function captures(tag: string, times: string[], uidPrefix: string): Promise<number[]> {
  const ids: number[] = [];
  for (const [i, t] of times.entries()) {
    const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
      body: snapshotBody(tag, `${uidPrefix}-${i}`, {
        takenAt: t,
        // 2 mV on a 0.1 V range: about ten bits used, a capture of good quality (a suspect
        // one would be kept whole as where the point turned suspect).
        tones: [{ hz: 24.7, peakG: 0.02 }],
        fullScaleV: 0.1,
        seed: i,
      }),
      headers: { authorization: `Bearer ${srv.key}` },
    });
    expect(res.status).toBe(201);
    ids.push((await res.json()).snapshotId as number);
  }
  await createWorker(srv.ctx, { owner: 'partitions-test' }).drain();
  return ids;
}

async function rowsOfSnapshots(ids: number[]) {
  const list = ids.join(',');
  const [counts] = await q(
    `SELECT (SELECT COUNT(*) FROM snapshots WHERE id IN (${list})) AS snapshots,
            (SELECT COUNT(*) FROM snapshot_uids WHERE snapshot_id IN (${list})) AS uids,
            (SELECT COUNT(*) FROM jobs WHERE snapshot_id IN (${list})) AS jobs,
            (SELECT COUNT(*) FROM analyses WHERE snapshot_id IN (${list})) AS analyses,
            (SELECT COUNT(*) FROM band_values b JOIN analyses a ON a.id = b.analysis_id
              WHERE a.snapshot_id IN (${list})) AS bandValues`,
  );
  return Object.fromEntries(Object.entries(counts!).map(([k, v]) => [k, Number(v)]));
}

/** What rowsOfSnapshots finds once the captures are gone with everything of theirs. */
const NOTHING_LEFT = { snapshots: 0, uids: 0, jobs: 0, analyses: 0, bandValues: 0 };

describe('monthly partitions of snapshots, analyses and band_values', () => {
  it('exist after the migrations: p_before, each month to three ahead, p_future; no foreign keys', async () => {
    const now = new Date();
    const months = Array.from({ length: MONTHS_AHEAD + 1 }, (_, i) => monthStart(now, i));
    for (const table of TABLES) {
      const parts = await partitions(table);
      expect(parts.map((p) => p.method)).toEqual(parts.map(() => 'RANGE COLUMNS'));
      expect(parts[0]!.expr).toBe('`taken_at`');
      expect(parts.map((p) => p.name)).toEqual(['p_before', ...months.map(monthName), 'p_future']);
      // Each month's partition ends where the next month begins.
      expect(parts.map((p) => p.bound)).toEqual([
        ...months.map((m) => m.toISOString().slice(0, 10)),
        monthStart(now, MONTHS_AHEAD + 1)
          .toISOString()
          .slice(0, 10),
        'MAXVALUE',
      ]);
    }
    const fks = await q(
      `SELECT TABLE_NAME AS t, REFERENCED_TABLE_NAME AS r FROM information_schema.REFERENTIAL_CONSTRAINTS
        WHERE CONSTRAINT_SCHEMA = DATABASE() AND (TABLE_NAME IN (?) OR REFERENCED_TABLE_NAME IN (?))`,
      [TABLES, TABLES],
    );
    expect(fks).toEqual([]);
  });

  it('the worker splits the coming months off p_future, once', async () => {
    const later = monthStart(new Date(), 5);
    const added = await ensurePartitionsAhead(srv.ctx.db, later);
    // Months 4 to 8 ahead of today's, in each table.
    const expected = [4, 5, 6, 7, 8].map((i) => monthName(monthStart(new Date(), i)));
    for (const table of TABLES)
      expect(added.filter((a) => a.startsWith(`${table}.`))).toEqual(
        expected.map((n) => `${table}.${n}`),
      );
    expect(await ensurePartitionsAhead(srv.ctx.db, later)).toEqual([]);
    const names = (await partitions('analyses')).map((p) => p.name);
    expect(names.slice(-2)).toEqual([expected.at(-1), 'p_future']);
  });

  it('a capture lands in the partition of the month it was taken in', async () => {
    const [id] = await captures('MFP-P102-MDE-H', [new Date().toISOString()], 'now');
    const name = monthName(new Date());
    const [row] = await q(`SELECT id FROM snapshots PARTITION (${name}) WHERE id = ?`, [id]);
    expect(Number(row!.id)).toBe(id);
    const [a] = await q(
      `SELECT COUNT(*) AS n FROM analyses PARTITION (${name}) WHERE snapshot_id = ?`,
      [id],
    );
    expect(Number(a!.n)).toBe(1);
  });

  it('retention drops each month past the horizon with all its rows, unless a pinned capture lives in it', async () => {
    const ids = await captures('MFP-P102-MDE-V', OLD, 'old');
    expect(await rowsOfSnapshots(ids)).toMatchObject({
      snapshots: 3,
      uids: 3,
      jobs: 3,
      analyses: 3,
    });
    // p_before holds them (this database was migrated empty, this month); a horizon of one
    // month, two months from now, reaches p_before and this month's partition.
    const now = monthStart(new Date(), 2);
    const thisMonth = monthName(new Date());
    const [pinned] = await q('SELECT id FROM analyses WHERE snapshot_id = ?', [ids[1]]);
    const pin = await srv.call('PUT', `/api/v1/analyses/${pinned!.id}/pin`, {
      cookie: srv.cookies.admin,
      body: { note: 'first bearing signs' },
    });
    expect(pin.status).toBeLessThan(300);
    // This month's capture (the test before) is kept by nothing: its month goes.
    expect(await dropExpiredPartitions(srv.ctx.db, 1, 60, now)).toEqual([thisMonth]);
    expect((await rowsOfSnapshots(ids)).snapshots).toBe(3);
    const [left] = await q('SELECT COUNT(*) AS n FROM snapshots');
    expect(Number(left!.n)).toBe(3);
    // The trend's hour summaries go with their month, and only with it.
    const hours = async () =>
      (await q('SELECT hour_at FROM band_value_hours GROUP BY hour_at ORDER BY hour_at')).map((r) =>
        (r.hour_at as Date).toISOString(),
      );
    expect(await hours()).toEqual(['2024-03-04T10:00:00.000Z', '2024-03-05T09:00:00.000Z']);

    const unpin = await srv.call('DELETE', `/api/v1/analyses/${pinned!.id}/pin`, {
      cookie: srv.cookies.admin,
    });
    expect(unpin.status).toBeLessThan(300);
    expect(await dropExpiredPartitions(srv.ctx.db, 1, 60, now)).toEqual(['p_before']);
    expect(await hours()).toEqual([]);
    expect(await rowsOfSnapshots(ids)).toEqual(NOTHING_LEFT);
    for (const table of TABLES) {
      const names = (await partitions(table)).map((p) => p.name);
      expect(names).not.toContain('p_before');
      expect(names).not.toContain(thisMonth);
    }
    // The uid is free again: the gateway may send it anew (it is a new capture then).
    expect(await captures('MFP-P102-MDE-V', [OLD[0]!], 'old')).toHaveLength(1);
  });
});

describe('what the foreign keys did, the product does', () => {
  it('a capture for a point deleted meanwhile stores nothing', async () => {
    const [p] = await q('SELECT MAX(id) + 1000 AS id FROM points');
    const gone = Number(p!.id);
    const before = await q(
      'SELECT (SELECT COUNT(*) FROM snapshots) AS s, (SELECT COUNT(*) FROM jobs) AS j, (SELECT COUNT(*) FROM snapshot_uids) AS u',
    );
    const body = snapshotBody('GONE', 'gone-1');
    const r = await storeSnapshot(srv.ctx, {
      uid: 'gone-1',
      pointId: gone,
      gatewayId: null,
      source: 'upload',
      takenAt: new Date(body.takenAt),
      sampleRateHz: body.sampleRateHz,
      encoding: 'int16',
      bytes: Buffer.from(body.samples, 'base64'),
      adcBits: 16,
      fullScaleV: 5,
      sensitivityMvPerG: 100,
      speedRpm: null,
      tach: null,
    });
    expect(r).toEqual({ status: 'point_gone', snapshotId: null });
    expect(
      await q(
        'SELECT (SELECT COUNT(*) FROM snapshots) AS s, (SELECT COUNT(*) FROM jobs) AS j, (SELECT COUNT(*) FROM snapshot_uids) AS u',
      ),
    ).toEqual(before);
  });

  it("deleting points deletes their captures' rows in the same transaction", async () => {
    const tag = 'MFP-P102-MNDE-H';
    const ids = await captures(tag, [new Date().toISOString()], 'del');
    const [pt] = await q('SELECT id FROM points WHERE tag = ?', [tag]);
    const [a] = await q('SELECT id FROM analyses WHERE snapshot_id = ?', [ids[0]]);
    await q('INSERT INTO capture_pins (analysis_id, pinned_by, pinned_at) VALUES (?, 1, NOW())', [
      a!.id,
    ]);
    expect((await rowsOfSnapshots(ids)).bandValues).toBeGreaterThan(0);
    // A transaction that fails after the deletion leaves everything in place…
    await expect(
      srv.ctx.db.transaction(async (tx) => {
        await deletePoints(tx, [Number(pt!.id)]);
        throw new Error('rolled back');
      }),
    ).rejects.toThrow('rolled back');
    expect((await rowsOfSnapshots(ids)).snapshots).toBe(1);
    // …one that commits leaves nothing of the point behind.
    await srv.ctx.db.transaction((tx) => deletePoints(tx, [Number(pt!.id)]));
    expect(await rowsOfSnapshots(ids)).toEqual(NOTHING_LEFT);
    expect(await q('SELECT * FROM capture_pins WHERE analysis_id = ?', [a!.id])).toEqual([]);
    expect(await q('SELECT id FROM points WHERE id = ?', [pt!.id])).toEqual([]);
  });
});
