/**
 * Dropping a month past the capture horizon (CAPTURE_RETENTION_MONTHS), on a real MariaDB:
 * the day sums of its days go with its band values (the local days at its edges keep the sums
 * of their values left), and a pass that stopped between two of the month's steps (DROP
 * PARTITION is DDL, each commits on its own) leaves screens working and is finished by the
 * next pass. Captures are seeded in SQL in months ahead of today (placeholder spectra: only
 * the rows and their times matter here).
 *
 * Expected day sums are worked out here from the band values left, with the local day from
 * the runtime's ICU time zone data (Intl.DateTimeFormat), not the product's day code.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { dropExpiredPartitions } from '../../apps/server/src/features/worker/partitions.ts';
import { dropPartition } from '../../apps/server/src/features/worker/partitions-repository.ts';
import { rebuildBandDaySums } from '../../apps/server/src/features/analysis/band-day-sums-repository.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';

let srv: TestServer;
let cookie: string;
const ZONE = 'America/New_York';
const TAG = 'MFP-P102-MDE-H';
/** Two of the point's bands (the trend answers only for its own). */
const BANDS = ['overall-velocity', 'bpfo'];
let pointId: number;

const localDay = (ms: number) =>
  new Intl.DateTimeFormat('en-CA', {
    timeZone: ZONE,
    year: 'numeric',
    month: '2-digit',
    day: '2-digit',
  }).format(ms);

/** Captures every `stepH` hours in [from, to), with their band values (every 7th unusable). */
async function seed(from: string, to: string, stepH: number, prefix: string) {
  const pool = srv.ctx.dbHandle.pool;
  let i = 0;
  for (let t = Date.parse(from); t < Date.parse(to); t += stepH * 3_600_000, i++) {
    const at = new Date(t);
    const [s] = (await pool.query(
      `INSERT INTO snapshots (uid, point_id, source, taken_at, received_at, sample_rate_hz,
         sample_count, encoding, adc_bits, full_scale_v, sensitivity_mv_per_g, content_hash,
         status, samples) VALUES (?, ?, 'gateway', ?, ?, 25600, 4096, 'int16', 16, 5, 100, ?,
         'done', ?)`,
      [`${prefix}-${i}`, pointId, at, at, `${prefix}-${i}`.padEnd(64, '0'), Buffer.alloc(16)],
    )) as unknown as [{ insertId: number }];
    const verdict = i % 7 === 3 ? 'unusable' : 'ok';
    const [a] = (await pool.query(
      `INSERT INTO analyses (snapshot_id, point_id, taken_at, accel_rms_g, accel_peak_g,
         velocity_rms_mm_s, displacement_pkpk_um, crest_factor, kurtosis, speed_source,
         quality_verdict, quality_findings, summary, spectra)
       VALUES (?, ?, ?, 0.3, 0.45, 2, 40, 1.5, 3, 'none', ?, '[]', '{}', ?)`,
      [s.insertId, pointId, at, verdict, Buffer.alloc(16)],
    )) as unknown as [{ insertId: number }];
    for (const [k, band] of BANDS.entries())
      await pool.query(
        `INSERT INTO band_values (analysis_id, point_id, band_key, taken_at, value, quality_verdict)
         VALUES (?, ?, ?, ?, ?, ?)`,
        [a.insertId, pointId, band, at, 1 + (i % 5) * 0.25 + k, verdict],
      );
  }
}

/** The point's day sums as stored, and as worked out here from its band values left. */
async function daySums() {
  const stored = await srv.q(
    `SELECT band_key AS band, DATE_FORMAT(day, '%Y-%m-%d') AS day, n, sum_value AS v
       FROM band_day_sums WHERE point_id = ? ORDER BY day, band_key`,
    [pointId],
  );
  const values = await srv.q(
    `SELECT band_key AS band, taken_at AS at, value FROM band_values
      WHERE point_id = ? AND quality_verdict <> 'unusable'`,
    [pointId],
  );
  const want = new Map<string, { band: string; day: string; n: number; v: number }>();
  for (const r of values) {
    const day = localDay((r.at as Date).getTime());
    const key = `${day}|${r.band}`;
    const s = want.get(key) ?? { band: String(r.band), day, n: 0, v: 0 };
    s.n++;
    s.v += Number(r.value);
    want.set(key, s);
  }
  const round = (x: Record<string, unknown>) =>
    `${x.day} ${x.band} n=${Number(x.n)} sum=${Number(x.v).toFixed(6)}`;
  return {
    stored: stored.map(round),
    expected: [...want.values()]
      .sort((a, b) => a.day.localeCompare(b.day) || a.band.localeCompare(b.band))
      .map(round),
  };
}

async function partitionNames(table: string) {
  const rows = await srv.q(
    `SELECT PARTITION_NAME AS name FROM information_schema.PARTITIONS
      WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME = ?`,
    [table],
  );
  return rows.map((r) => String(r.name));
}

beforeAll(async () => {
  srv = await startTestServer();
  cookie = await srv.signIn('admin');
  const [p] = await srv.q('SELECT id, site_id FROM points WHERE tag = ?', [TAG]);
  pointId = Number(p!.id);
  await srv.q('UPDATE sites SET time_zone = ? WHERE id = ?', [ZONE, p!.site_id]);
  const partitions = await partitionNames('snapshots');
  expect(partitions).toContain('p202701');
  expect(partitions).toContain('p202702');
  // Jan 2027 to the first days of March, densest around the month ends (New York is
  // 5 h behind UTC in winter: 2027-02-01 00:00 UTC is still 31 January there).
  await seed('2027-01-10T00:00:00Z', '2027-01-29T00:00:00Z', 24, 'jan');
  await seed('2027-01-29T00:00:00Z', '2027-02-03T00:00:00Z', 2, 'edge1');
  await seed('2027-02-26T00:00:00Z', '2027-03-03T00:00:00Z', 2, 'edge2');
  await srv.ctx.db.transaction((tx) => rebuildBandDaySums(tx, [pointId], ZONE));
  const sums = await daySums();
  expect(sums.stored).toEqual(sums.expected);
  expect(sums.stored.some((s) => s.startsWith('2027-01-15 '))).toBe(true);
});
afterAll(async () => {
  await srv?.stop();
});

describe('dropping a month past the capture horizon', () => {
  it('drops its band values with the day sums of its days; the edge days keep those left', async () => {
    const dropped = await dropExpiredPartitions(
      srv.ctx.db,
      1,
      60,
      new Date('2027-03-01T00:00:00Z'),
    );
    expect(dropped).toContain('p202701');
    for (const table of ['snapshots', 'analyses', 'band_values'])
      expect(await partitionNames(table)).not.toContain('p202701');
    const sums = await daySums();
    expect(sums.stored).toEqual(sums.expected);
    // 31 January (local) keeps the values taken 1 February 00:00–04:59 UTC; the 30th is gone.
    expect(sums.stored.filter((s) => s.startsWith('2027-01-31 '))).toHaveLength(BANDS.length);
    expect(sums.stored.filter((s) => s.startsWith('2027-01-30 '))).toEqual([]);
  });

  it('a pass stopped after the band values went leaves the fleet answering, and the next one finishes the month', async () => {
    // The state a pass leaves when it stops right after dropping February's band values.
    await dropPartition(srv.ctx.db, 'band_values', 'p202702');
    // Since then a person pinned one of February's captures: the month would be kept, were
    // its drop not begun.
    const [feb] = await srv.q(
      "SELECT id FROM analyses WHERE point_id = ? AND taken_at >= '2027-02-01' AND taken_at < '2027-03-01' ORDER BY id LIMIT 1",
      [pointId],
    );
    await srv.q(
      "INSERT INTO capture_pins (analysis_id, pinned_by, pinned_at, note) VALUES (?, 1, NOW(3), 'late pin')",
      [feb!.id],
    );
    // The fleet still answers (the point's band values are gone, its captures not; the
    // point's own pages need real analyses, which this SQL seed does not make).
    for (const path of ['/api/v1/fleet']) {
      const res = await srv.call('GET', path, { cookie });
      expect([path, res.status]).toEqual([path, 200]);
    }

    const dropped = await dropExpiredPartitions(
      srv.ctx.db,
      1,
      60,
      new Date('2027-04-01T00:00:00Z'),
    );
    expect(dropped).toContain('p202702');
    for (const table of ['snapshots', 'analyses', 'band_values'])
      expect(await partitionNames(table)).not.toContain('p202702');
    expect(await srv.q('SELECT * FROM capture_pins WHERE analysis_id = ?', [feb!.id])).toEqual([]);
    const sums = await daySums();
    expect(sums.stored).toEqual(sums.expected);
    // 28 February (local) keeps the values of 1 March 00:00–04:59 UTC.
    expect(sums.stored.filter((s) => s.startsWith('2027-02-28 '))).toHaveLength(BANDS.length);
    const [left] = await srv.q(
      "SELECT COUNT(*) AS n FROM analyses WHERE point_id = ? AND taken_at < '2027-03-01'",
      [pointId],
    );
    expect(Number(left!.n)).toBe(0);
    // Nothing left to finish: a further pass at the same time drops nothing more of ours.
    expect(
      await dropExpiredPartitions(srv.ctx.db, 1, 60, new Date('2027-04-01T00:00:00Z')),
    ).not.toContain('p202702');
  });
});
