// The planner's weekly review (GET /api/v1/review) on the demo plant as `npm start` seeds it
// (DEMO_HISTORY_WEEKS=3: a capture per point every 4 hours through the real pipeline), timed
// against a reference measured in the same run on the same database with raw mysql2: grouping
// the review's six weeks of band values into local days in one statement, which is what the
// review did per request before the day sums (band_day_sums) were kept on write.
// Run: npx tsx tests/bench/review-bench.ts   (or npm run bench for every bench file)
// Prints p50/p95 over 50 sequential requests after 10 warm-up ones; no pass/fail on time.
import { offsetSegments } from '@turnstone/contracts/dates';
import { siteWeek } from '../../apps/server/src/features/review/review-weeks.ts';
import { FORECAST_LOOKBACK_DAYS } from '../../apps/server/src/features/review/review-service.ts';
import { signInCookie, startBenchServer } from './bench-support.ts';

const REQUESTS = 50;
const WARMUP = 10;

async function timed(fn: () => Promise<unknown>): Promise<{ p50: number; p95: number }> {
  const times: number[] = [];
  for (let i = 0; i < WARMUP + REQUESTS; i++) {
    const t = performance.now();
    await fn();
    if (i >= WARMUP) times.push(performance.now() - t);
  }
  times.sort((a, b) => a - b);
  const pct = (p: number) =>
    times[Math.min(times.length - 1, Math.ceil((p / 100) * times.length) - 1)]!;
  return { p50: pct(50), p95: pct(95) };
}

async function main() {
  const t0 = performance.now();
  const bench = await startBenchServer('review', { DEMO_HISTORY_WEEKS: '3' });
  try {
    const { url } = bench.srv;
    const pool = bench.srv.ctx.dbHandle.pool;
    const [[counts]] = (await pool.query(
      `SELECT (SELECT COUNT(*) FROM analyses) AS captures, (SELECT COUNT(*) FROM band_values) AS bv,
              (SELECT COUNT(*) FROM band_day_sums) AS sums`,
    )) as unknown as [{ captures: number; bv: number; sums: number }[]];
    console.log(
      `demo plant seeded in ${((performance.now() - t0) / 1000).toFixed(0)} s: ${counts!.captures} captures, ` +
        `${counts!.bv} band values, ${counts!.sums} day sums`,
    );
    const cookie = await signInCookie(url, 'planner@turnstone.local');

    // The reference: the review's daily means grouped from band_values per request (the
    // local day by each site's UTC offsets over the window), on the covering index.
    const [siteRows] = (await pool.query(
      'SELECT id, code, time_zone AS timeZone FROM sites ORDER BY code',
    )) as unknown as [{ id: number; code: string; timeZone: string }[]];
    const weekEnding = new Date().toISOString().slice(0, 10);
    const weeks = siteRows.map((s) => siteWeek(s, weekEnding, FORECAST_LOOKBACK_DAYS));
    const from = Math.min(...weeks.map((w) => w.lookbackFrom));
    const to = Math.max(...weeks.map((w) => w.thisTo));
    const params: unknown[] = [];
    const offsetOf = (tz: string) => {
      const segs = offsetSegments(tz, from, to);
      if (segs.length === 1) return String(segs[0]!.offset);
      const cases = segs.slice(0, -1).map((s) => {
        params.push(new Date(s.until));
        return `WHEN bv.taken_at < ? THEN ${s.offset}`;
      });
      return `CASE ${cases.join(' ')} ELSE ${segs.at(-1)!.offset} END`;
    };
    const day = `DATE_FORMAT(DATE_ADD(bv.taken_at, INTERVAL (CASE a.site_id ${weeks
      .map((w) => `WHEN ${w.siteId} THEN ${offsetOf(w.timeZone)}`)
      .join(' ')} ELSE 0 END) MINUTE), '%Y-%m-%d')`;
    const grouped = `SELECT bv.point_id, bv.band_key, ${day} AS day,
        CAST(AVG(TIMESTAMPDIFF(MICROSECOND, '1970-01-01 00:00:00', bv.taken_at) / 1000) AS DOUBLE) AS t,
        AVG(bv.value) AS v, COUNT(*) AS n
      FROM band_values bv JOIN points p ON p.id = bv.point_id JOIN machines m ON m.id = p.machine_id
      JOIN areas a ON a.id = m.area_id
      WHERE a.site_id IN (${weeks.map((w) => w.siteId).join(', ')})
        AND bv.taken_at >= ? AND bv.taken_at < ? AND bv.quality_verdict <> 'unusable'
      GROUP BY bv.point_id, bv.band_key, day ORDER BY NULL`;
    params.push(new Date(from), new Date(to));
    let groupRows = 0;
    const reference = await timed(async () => {
      const [rows] = (await pool.query(grouped, params)) as unknown as [unknown[]];
      groupRows = rows.length;
    });

    let bytes = 0;
    const review = await timed(async () => {
      const r = await fetch(`${url}/api/v1/review`, { headers: { cookie } });
      const text = await r.text();
      if (r.status !== 200) throw new Error(`review answered ${r.status}: ${text.slice(0, 200)}`);
      bytes = text.length;
    });
    console.log(
      `reference (raw mysql2, ${groupRows} daily means grouped from band values): ` +
        `p50 ${reference.p50.toFixed(1)} ms, p95 ${reference.p95.toFixed(1)} ms`,
    );
    console.log(
      `GET /api/v1/review (planner, both sites): p50 ${review.p50.toFixed(1)} ms, ` +
        `p95 ${review.p95.toFixed(1)} ms, ${(bytes / 1024).toFixed(0)} KiB JSON; ` +
        `p50 ratio to the reference ${(review.p50 / reference.p50).toFixed(2)} (target: review ≤ 50 ms)`,
    );
  } finally {
    await bench.stop();
  }
}

main().catch((err) => {
  console.error(err);
  process.exitCode = 1;
});
