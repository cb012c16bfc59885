// Latency of the two screen APIs the issue sets a budget for (p95 ≤ 200 ms), on large data
// seeded directly in SQL: a year of hourly band values for one point, and a fleet of 2,000
// extra machines (2 points each). Runs the real server in-process against a private MariaDB.
// Run: npx tsx tests/bench/api-bench.ts   (or npm run bench for every bench file)
// Prints p50/p95/max over 100 sequential requests after 10 warm-up ones; no pass/fail on time.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { startLocalMariadb } from '@turnstone/db/local-server';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { snapshotBody } from '../support/signals.ts';

const HOURS = 365 * 24;
const MACHINES = 2000;
const REQUESTS = 100;
const WARMUP = 10;
const TAG = 'MFP-P102-MDE-H';
/** Band keys seeded per analysis besides overall-velocity, so the index has to pick one band. */
const OTHER_BANDS = ['overall-acceleration', 'order-1x', 'order-2x', 'bpfo', 'bpfi'];

async function main() {
  const dir = mkdtempSync(join(tmpdir(), 'turnstone-api-bench-'));
  const db = await startLocalMariadb({ dataDir: dir, database: 'bench' });
  process.env.TEST_DATABASE_URL = db.url;
  let srv: TestServer | undefined;
  try {
    srv = await startTestServer();
    const pool = srv.ctx.dbHandle.pool;
    const q = async (sql: string, params: unknown[] = []) => {
      const [rows] = await pool.query(sql, params);
      return rows as Record<string, unknown>[];
    };

    // One real capture through ingest + worker gives the point its limit set.
    const admin = await srv.signIn('admin');
    const [site] = await q("SELECT id FROM sites WHERE code = 'MFP'");
    const key = (
      await (
        await srv.call('POST', '/api/v1/gateways', {
          cookie: admin,
          body: { siteId: Number(site!.id), name: 'bench' },
        })
      ).json()
    ).apiKey as string;
    const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
      body: snapshotBody(TAG, 'bench-0', {
        takenAt: new Date(Date.now() - 3600_000).toISOString(),
      }),
      headers: { authorization: `Bearer ${key}` },
    });
    if (res.status !== 201) throw new Error(`ingest answered ${res.status}`);
    await createWorker(srv.ctx).drain();
    const [point] = await q('SELECT id FROM points WHERE tag = ?', [TAG]);
    const pointId = Number(point!.id);

    // A year of hourly captures ending an hour ago: snapshots (no samples), analyses, band values.
    const t0 = performance.now();
    const start = Date.now() - (HOURS + 1) * 3600_000;
    await q(
      `INSERT INTO snapshots (uid, point_id, source, taken_at, sample_rate_hz, sample_count, encoding,
         adc_bits, full_scale_v, sensitivity_mv_per_g, content_hash, status, samples_expired_at)
       SELECT CONCAT('bench-h-', seq), ?, 'gateway', FROM_UNIXTIME(? + seq * 3600), 10240, 4096, 'int16',
         16, 5, 100, SHA2(seq, 256), 'done', NOW(3)
       FROM seq_1_to_${HOURS}`,
      [pointId, Math.floor(start / 1000)],
    );
    await q(
      `INSERT INTO analyses (snapshot_id, point_id, taken_at, accel_rms_g, accel_peak_g, velocity_rms_mm_s,
         displacement_pkpk_um, crest_factor, kurtosis, speed_rpm, speed_source, iso_zone, quality_verdict,
         bits_used, quality_findings, summary)
       SELECT s.id, s.point_id, s.taken_at, 0.3, 0.45, 2 + 0.5 * SIN(s.id / 24), 40, 1.5, 1.5, 1480, 'rpm', 'A',
         'ok', 11, '[]', '{}'
       FROM snapshots s WHERE s.uid LIKE 'bench-h-%'`,
    );
    for (const band of ['overall-velocity', ...OTHER_BANDS]) {
      await q(
        `INSERT INTO band_values (analysis_id, point_id, band_key, taken_at, value, quality_verdict)
         SELECT a.id, a.point_id, ?, a.taken_at, a.velocity_rms_mm_s, 'ok'
         FROM analyses a JOIN snapshots s ON s.id = a.snapshot_id WHERE s.uid LIKE 'bench-h-%'`,
        [band],
      );
    }
    // 2,000 more machines with two points each, in one area of the same site.
    const [area] = await q('SELECT id FROM areas WHERE site_id = ? ORDER BY id LIMIT 1', [
      site!.id,
    ]);
    await q(
      `INSERT INTO machines (area_id, name, type, nominal_rpm)
       SELECT ?, CONCAT('Bench machine ', LPAD(seq, 4, '0')), 'pump', 1480 FROM seq_1_to_${MACHINES}`,
      [area!.id],
    );
    await q(
      `INSERT INTO points (machine_id, site_id, tag, name, location, direction, last_taken_at, last_verdict)
       SELECT m.id, ?, CONCAT('BENCH-', m.id, '-', d.dir), CONCAT('Point ', d.dir), 'DE', d.dir,
         NOW(3) - INTERVAL 2 HOUR, 'ok'
       FROM machines m JOIN (SELECT 'H' AS dir UNION ALL SELECT 'V') d
       WHERE m.name LIKE 'Bench machine %'`,
      [site!.id],
    );
    await q('ANALYZE TABLE band_values, analyses, points, machines');
    const [counts] = await q(
      `SELECT (SELECT COUNT(*) FROM band_values) AS bv, (SELECT COUNT(*) FROM machines) AS m,
              (SELECT COUNT(*) FROM points) AS p`,
    );
    console.log(
      `seeded in ${((performance.now() - t0) / 1000).toFixed(1)} s: ${counts!.bv} band values, ` +
        `${counts!.m} machines, ${counts!.p} points`,
    );

    const engineer = await srv.signIn('engineer');
    const from = new Date(start - 3600_000).toISOString();
    const to = new Date().toISOString();
    const cases: [string, string, string][] = [
      [
        'GET /points/:id/trend (1 year hourly)',
        `/api/v1/points/${pointId}/trend?band=overall-velocity&from=${from}&to=${to}`,
        engineer,
      ],
      ['GET /fleet (2,000+ machines, admin)', '/api/v1/fleet', admin],
    ];
    for (const [name, path, cookie] of cases) {
      const times: number[] = [];
      let bytes = 0;
      let items = 0;
      for (let i = 0; i < WARMUP + REQUESTS; i++) {
        const t = performance.now();
        const r = await srv.call('GET', path, { cookie, headers: { 'accept-encoding': 'gzip' } });
        const text = await r.text();
        const ms = performance.now() - t;
        if (r.status !== 200)
          throw new Error(`${name} answered ${r.status}: ${text.slice(0, 200)}`);
        if (i >= WARMUP) times.push(ms);
        bytes = text.length;
        if (i === 0 && path.includes('/trend'))
          items = (JSON.parse(text) as { items: unknown[] }).items.length;
      }
      times.sort((a, b) => a - b);
      const pct = (p: number) =>
        times[Math.min(times.length - 1, Math.ceil((p / 100) * times.length) - 1)]!;
      console.log(
        `${name}: p50 ${pct(50).toFixed(1)} ms, p95 ${pct(95).toFixed(1)} ms, max ${times[times.length - 1]!.toFixed(1)} ms` +
          ` over ${REQUESTS} requests; ${(bytes / 1024).toFixed(0)} KiB JSON` +
          (items ? `, ${items} values` : ''),
      );
    }
  } finally {
    await srv?.stop();
    await db.stop();
    rmSync(dir, { recursive: true, force: true });
  }
}

main().catch((err) => {
  console.error(err);
  process.exitCode = 1;
});
