/**
 * The plant-year part of the storage bench (tests/bench/storage-bench.ts runs it after its
 * bytes-per-capture figures): one point's year at the real cadence (a capture every
 * 10 minutes, 52,560 captures, six band values each) seeded in SQL, the last
 * `SPECTRA_SEEDED_DAYS` holding a real spectra BLOB copied from an analysis the worker made,
 * then:
 * - the trend API for one year and for one day (p50/p95, answer bytes), against the raw
 *   mysql2 query of the same band values measured in the same run;
 * - the fleet API (p95) against a raw query of the fleet's points and machines;
 * - the nightly retention pass (its duration) and ingest p50/p99 at a paced rate while it
 *   runs, against the same load with no pass running.
 */
import type { BenchServer } from './bench-support.ts';
import { createGatewayKey, runLoad, signInCookie } from './bench-support.ts';
import { retentionPolicy, runRetention } from '../../apps/server/src/features/worker/retention.ts';
import { loadConfig } from '../../apps/server/src/config.ts';
import { runCompaction } from '../../apps/server/src/features/worker/compaction.ts';
import { rebuildPointHours } from '../../apps/server/src/features/analysis/band-hours-repository.ts';

const CAPTURES = 365 * 144;
const SPECTRA_SEEDED_DAYS = 60;
const TAG = 'MFP-P102-MDE-H';
const BANDS = ['overall-velocity', 'overall-acceleration', 'order-1x', 'order-2x', 'bpfo', 'bpfi'];
const REQUESTS = 60;
const WARMUP = 5;

const pct = (sorted: number[], p: number) =>
  sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)]!;

async function timed(n: number, fn: () => Promise<number>) {
  const times: number[] = [];
  let size = 0;
  for (let i = 0; i < WARMUP + n; i++) {
    const t = performance.now();
    size = await fn();
    if (i >= WARMUP) times.push(performance.now() - t);
  }
  times.sort((a, b) => a - b);
  return { p50: pct(times, 50), p95: pct(times, 95), size };
}

export async function plantYearFigures(
  bench: BenchServer,
  opts: { ingest?: boolean } = {},
): Promise<void> {
  const { srv } = bench;
  const pool = srv.ctx.dbHandle.pool;
  const q = async <T>(text: string, params: unknown[] = []) =>
    (await pool.query(text, params))[0] as T;
  const [point] = await q<{ id: number }[]>('SELECT id FROM points WHERE tag = ?', [TAG]);
  const pointId = Number(point!.id);
  const now = Date.now();
  const start = Math.floor(now / 600_000) * 600 - CAPTURES * 600;

  const t0 = performance.now();
  await q(
    `INSERT INTO snapshots (uid, point_id, source, taken_at, sample_rate_hz, sample_count, encoding,
       adc_bits, full_scale_v, sensitivity_mv_per_g, content_hash, status, samples_expired_at)
     SELECT CONCAT('year-', seq), ?, 'gateway', FROM_UNIXTIME(? + seq * 600), 10240, 4096,
       'int16', 16, 5, 100, SHA2(seq, 256), 'done', NOW(3)
     FROM seq_1_to_${CAPTURES}`,
    [pointId, start],
  );
  await q(
    `INSERT INTO analyses (snapshot_id, point_id, taken_at, accel_rms_g, accel_peak_g,
       velocity_rms_mm_s, displacement_pkpk_um, crest_factor, kurtosis, speed_rpm, speed_source,
       iso_zone, quality_verdict, bits_used, quality_findings, summary, spectra,
       spectra_thinned_at)
     SELECT s.id, s.point_id, s.taken_at, 0.3, 0.45, 2 + 0.5 * SIN(s.id / 144), 40, 1.5, 1.5,
       1480, 'rpm', 'A', 'ok', 11, '[]', '{}',
       IF(s.taken_at >= NOW() - INTERVAL ${SPECTRA_SEEDED_DAYS} DAY, r.spectra, NULL),
       IF(s.taken_at >= NOW() - INTERVAL ${SPECTRA_SEEDED_DAYS} DAY, NULL, NOW(3))
     FROM snapshots s
     JOIN (SELECT spectra FROM analyses WHERE spectra IS NOT NULL ORDER BY id DESC LIMIT 1) r
     WHERE s.uid LIKE 'year-%' AND s.point_id = ?`,
    [pointId],
  );
  for (const band of BANDS)
    await q(
      `INSERT INTO band_values (analysis_id, point_id, band_key, taken_at, value, quality_verdict)
       SELECT a.id, a.point_id, ?, a.taken_at, a.velocity_rms_mm_s, 'ok'
       FROM analyses a JOIN snapshots s ON s.id = a.snapshot_id
       WHERE s.uid LIKE 'year-%' AND s.point_id = ?`,
      [band, pointId],
    );
  const seededS = (performance.now() - t0) / 1000;
  // Written around the worker, so the hour summaries the trend reads are built as a database
  // upgraded from before them is: the product's own recomputation of the point.
  const tHours = performance.now();
  await srv.ctx.db.transaction((tx) => rebuildPointHours(tx, pointId));
  const hoursS = (performance.now() - tHours) / 1000;
  await q('ANALYZE TABLE snapshots, analyses, band_values, band_value_hours');
  const [hourSize] = await q<{ n: number; bytes: number }[]>(
    `SELECT (SELECT COUNT(*) FROM band_value_hours WHERE point_id = ?) AS n,
            (SELECT DATA_LENGTH + INDEX_LENGTH FROM information_schema.TABLES
              WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME = 'band_value_hours') AS bytes`,
    [pointId],
  );
  console.log(
    `\nOne point's year at the real cadence seeded in ${seededS.toFixed(0)} s: ` +
      `${CAPTURES} captures, ${CAPTURES * BANDS.length} band values, spectra on the last ${SPECTRA_SEEDED_DAYS} days; ` +
      `its hour summaries built in ${hoursS.toFixed(1)} s: ${hourSize!.n} rows, ` +
      `${(Number(hourSize!.bytes) / CAPTURES) | 0} B per capture (data + index)`,
  );

  const engineer = await signInCookie(srv.url, 'engineer@turnstone.local');
  const admin = await signInCookie(srv.url, 'admin@turnstone.local');
  const get = async (path: string, cookie: string) => {
    const r = await fetch(`${srv.url}${path}`, {
      headers: { cookie, 'accept-encoding': 'gzip' },
    });
    const text = await r.text();
    if (r.status !== 200) throw new Error(`${path} answered ${r.status}: ${text.slice(0, 200)}`);
    return Buffer.byteLength(text);
  };
  const raw = (from: Date, to: Date) => async () =>
    (
      await q<unknown[]>(
        `SELECT taken_at, value FROM band_values
          WHERE point_id = ? AND band_key = 'overall-velocity' AND taken_at >= ? AND taken_at < ?
          ORDER BY taken_at`,
        [pointId, from, to],
      )
    ).length;
  const to = new Date(now + 60_000);
  const yearFrom = new Date(start * 1000);
  const dayFrom = new Date(now - 86_400_000);
  const trend = (from: Date) =>
    `/api/v1/points/${pointId}/trend?band=overall-velocity&from=${from.toISOString()}&to=${to.toISOString()}`;
  const rows: [string, { p50: number; p95: number; size: number }, string][] = [];
  const yearApi = await timed(REQUESTS, () => get(trend(yearFrom), engineer));
  const yearRaw = await timed(REQUESTS, raw(yearFrom, to));
  rows.push(['trend, one year (API)', yearApi, `${(yearApi.size / 1024).toFixed(1)} KiB JSON`]);
  rows.push(['trend, one year (raw query, reference)', yearRaw, `${yearRaw.size} rows`]);
  const dayApi = await timed(REQUESTS, () => get(trend(dayFrom), engineer));
  const dayRaw = await timed(REQUESTS, raw(dayFrom, to));
  rows.push(['trend, one day (API)', dayApi, `${(dayApi.size / 1024).toFixed(1)} KiB JSON`]);
  rows.push(['trend, one day (raw query, reference)', dayRaw, `${dayRaw.size} rows`]);
  const fleetApi = await timed(REQUESTS, () => get('/api/v1/fleet', admin));
  const fleetRaw = await timed(
    REQUESTS,
    async () =>
      (
        await q<unknown[]>(
          `SELECT p.id, p.tag, p.last_taken_at, p.last_verdict, m.name, m.id AS machine
           FROM points p JOIN machines m ON m.id = p.machine_id`,
        )
      ).length,
  );
  rows.push(['fleet (API, admin)', fleetApi, `${(fleetApi.size / 1024).toFixed(1)} KiB JSON`]);
  rows.push([
    'fleet (raw query of points + machines, reference)',
    fleetRaw,
    `${fleetRaw.size} rows`,
  ]);
  console.log(
    `| read (${REQUESTS} sequential after ${WARMUP} warm-up) | p50 ms | p95 ms | answer |`,
  );
  console.log('|---|---|---|---|');
  for (const [name, r, size] of rows)
    console.log(`| ${name} | ${r.p50.toFixed(1)} | ${r.p95.toFixed(1)} | ${size} |`);
  console.log(
    `ratios API / raw query, p95: one year ${(yearApi.p95 / yearRaw.p95).toFixed(2)}, one day ${(dayApi.p95 / dayRaw.p95).toFixed(2)}, fleet ${(fleetApi.p95 / fleetRaw.p95).toFixed(2)}; ` +
      `targets: one-year p95 ≤ 100 ms with ≤ 60 KB (${yearApi.p95.toFixed(0)} ms, ${(yearApi.size / 1000).toFixed(1)} kB), fleet p95 ≤ 100 ms (${fleetApi.p95.toFixed(0)} ms)`,
  );

  if (opts.ingest === false) return;
  // ---- ingest at a paced rate, without and with the nightly retention pass running
  const [site] = await q<{ id: number }[]>("SELECT id FROM sites WHERE code = 'MFP'");
  const key = await createGatewayKey(srv.url, admin, Number(site!.id), 'storage-year');
  const load = (prefix: string) =>
    runLoad({
      url: srv.url,
      key,
      count: 300,
      concurrency: 4,
      prefix,
      samples: 4096,
      ratePerS: 50,
      pointTag: 'MFP-P101-MDE-H',
    });
  const quiet = await load('year-quiet');
  // The pass at its defaults (batches of 500, 200 ms pauses), 100 days on: the seeded
  // spectra are all in the daily tier.
  const policy = retentionPolicy(loadConfig({}));
  const passAt = new Date(now + 100 * 86_400_000);
  let passS = 0;
  const t1 = performance.now();
  const [busy, pass] = await Promise.all([
    load('year-busy'),
    runRetention(srv.ctx.db, policy, passAt).then((r) => {
      passS = (performance.now() - t1) / 1000;
      return r;
    }),
  ]);
  const [left] = await q<{ n: number }[]>(
    'SELECT COUNT(*) AS n FROM analyses WHERE point_id = ? AND spectra IS NOT NULL',
    [pointId],
  );
  const n = Number(left!.n);
  console.log(
    `\nRetention pass (defaults, at +100 days): ${passS.toFixed(1)} s; thinned ${pass.thinned.rows} analyses in ${pass.thinned.batches} batches, ` +
      `raw waveforms dropped ${pass.expired.rows}; the point keeps ${n} spectra`,
  );
  console.log('| ingest, 4 clients paced at 50/s, 300 posts | wall s | p50 ms | p99 ms |');
  console.log('|---|---|---|---|');
  console.log(
    `| no retention running (reference) | ${quiet.wallS.toFixed(1)} | ${quiet.p50.toFixed(1)} | ${quiet.p99.toFixed(1)} |`,
  );
  console.log(
    `| retention pass running | ${busy.wallS.toFixed(1)} | ${busy.p50.toFixed(1)} | ${busy.p99.toFixed(1)} |`,
  );
  // The compaction's monthly online rebuild of the thinned tables (compaction.ts) under the
  // same load.
  let rebuildS = 0;
  const t2 = performance.now();
  const [rebuilding] = await Promise.all([
    load('year-rebuild'),
    runCompaction(srv.ctx.db, policy, passAt, { rebuild: true }).then(() => {
      rebuildS = (performance.now() - t2) / 1000;
    }),
  ]);
  console.log(
    `| compaction's online rebuild running | ${rebuilding.wallS.toFixed(1)} | ${rebuilding.p50.toFixed(1)} | ${rebuilding.p99.toFixed(1)} |`,
  );
  console.log(
    `ingest p99 with / without the pass: ${(busy.p99 / quiet.p99).toFixed(2)} (target 0.80–1.20); ` +
      `the pass ran ${passS.toFixed(1)} s of the load's ${busy.wallS.toFixed(1)} s; ` +
      `with the rebuild: ${(rebuilding.p99 / quiet.p99).toFixed(2)}, the rebuild ran ${rebuildS.toFixed(1)} s`,
  );
}
