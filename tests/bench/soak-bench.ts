/**
 * Soak (issue 8): for SOAK_SECONDS (default 60) several simulated gateways post paced
 * 4,096-sample snapshots from their own processes while the in-process worker analyses and
 * a browser-like client polls the fleet and the alerts. Prints snapshots/s, p50/p99 per
 * route, worker lag (queue depth over time, time to drain after the last post) and lost /
 * doubled counted in the database afterwards.
 */
import { queueDepth } from '../../apps/server/src/features/worker/worker.ts';
import { createGatewayKey, runLoad, signInCookie, startBenchServer } from './bench-support.ts';

const SECONDS = Number(process.env.SOAK_SECONDS ?? 60);
const GATEWAYS = Number(process.env.SOAK_GATEWAYS ?? 4);
const RATE = Number(process.env.SOAK_RATE_PER_GATEWAY ?? 25);
const bench = await startBenchServer('soak', { RUN_WORKER: 'true' });
const { srv } = bench;
const pool = srv.ctx.dbHandle.pool;
const q = (xs: number[], p: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length ? s[Math.min(s.length - 1, Math.floor(p * s.length))]! : NaN;
};
try {
  const cookie = await signInCookie(srv.url, 'engineer@turnstone.local');
  const admin = await signInCookie(srv.url, 'admin@turnstone.local');
  const [pointRows] = await pool.query(
    'SELECT p.tag FROM points p JOIN machines m ON m.id = p.machine_id JOIN areas a ON a.id = m.area_id WHERE a.site_id = 1 ORDER BY p.id LIMIT ?',
    [GATEWAYS],
  );
  const tags = (pointRows as { tag: string }[]).map((r) => r.tag);
  const keys: string[] = [];
  for (let g = 0; g < GATEWAYS; g++)
    keys.push(await createGatewayKey(srv.url, admin, 1, `soak ${g}`));
  const perGateway = Math.round(SECONDS * RATE);
  const loads = keys.map((key, g) =>
    runLoad({
      url: srv.url,
      key,
      count: perGateway,
      concurrency: 4,
      prefix: `soak${g}`,
      samples: 4096,
      ratePerS: RATE,
      pointTag: tags[g % tags.length]!,
    }),
  );
  // The browser-like client: fleet every 2 s and alerts every 1 s, like open dashboards.
  const lat: Record<string, number[]> = { 'GET /api/v1/fleet': [], 'GET /api/v1/alerts': [] };
  const depth: number[] = [];
  let running = true;
  const poll = async (path: string, everyMs: number) => {
    while (running) {
      const t0 = performance.now();
      const r = await fetch(`${srv.url}${path}`, { headers: { cookie } });
      await r.arrayBuffer();
      lat[`GET ${path}`]!.push(performance.now() - t0);
      await new Promise((res) => setTimeout(res, everyMs));
    }
  };
  const sampler = (async () => {
    while (running) {
      depth.push(await queueDepth(srv.ctx));
      await new Promise((res) => setTimeout(res, 1000));
    }
  })();
  const pollers = [poll('/api/v1/fleet', 2000), poll('/api/v1/alerts', 1000)];
  const results = await Promise.all(loads);
  const lastPost = performance.now();
  while ((await queueDepth(srv.ctx)) > 0 && performance.now() - lastPost < 600_000)
    await new Promise((r) => setTimeout(r, 250));
  const drainS = (performance.now() - lastPost) / 1000;
  running = false;
  await Promise.all([...pollers, sampler]);

  const sent = perGateway * GATEWAYS;
  const [rows] = await pool.query(
    "SELECT COUNT(*) AS n, COUNT(DISTINCT uid) AS u FROM snapshots WHERE uid LIKE 'soak%'",
  );
  const { n, u } = (rows as { n: number; u: number }[])[0]!;
  const [an] = await pool.query(
    "SELECT COUNT(*) AS a, COUNT(DISTINCT a.snapshot_id) AS d FROM analyses a JOIN snapshots s ON s.id = a.snapshot_id WHERE s.uid LIKE 'soak%'",
  );
  const { a, d } = (an as { a: number; d: number }[])[0]!;
  const ingestPerS = sent / Math.max(...results.map((r) => r.wallS));
  console.log(
    `\nSoak: ${GATEWAYS} gateways × ${RATE}/s for ${SECONDS} s, worker in process, dashboards polling`,
  );
  console.log('| measure | value |');
  console.log('|---|---|');
  console.log(`| snapshots sent / accepted-stored / distinct | ${sent} / ${n} / ${u} |`);
  console.log(`| lost / doubled (snapshots) | ${sent - Number(u)} / ${Number(n) - Number(u)} |`);
  console.log(`| analyses / doubled | ${a} / ${Number(a) - Number(d)} |`);
  console.log(`| ingest snapshots/s (all gateways) | ${ingestPerS.toFixed(0)} |`);
  console.log(
    `| POST /api/ingest/v1/snapshots p50 / p99 (ms), worst gateway | ${Math.max(...results.map((r) => r.p50)).toFixed(1)} / ${Math.max(...results.map((r) => r.p99)).toFixed(1)} |`,
  );
  for (const [route, xs] of Object.entries(lat))
    console.log(
      `| ${route} p50 / p99 (ms), n=${xs.length} | ${q(xs, 0.5).toFixed(1)} / ${q(xs, 0.99).toFixed(1)} |`,
    );
  console.log(
    `| queue depth during the run: median / max | ${q(depth, 0.5)} / ${Math.max(0, ...depth)} |`,
  );
  console.log(`| worker lag: time to drain after the last post (s) | ${drainS.toFixed(1)} |`);
} finally {
  await bench.stop();
}
