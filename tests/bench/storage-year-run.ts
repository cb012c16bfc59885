/**
 * The plant-year part of the storage bench alone (storage-year.ts), for iterating on the trend
 * and fleet reads without the bytes-per-capture run before it:
 * `npx tsx tests/bench/storage-year-run.ts`. A handful of demo-plant captures go through
 * ingest and one worker first (the year's seeded spectra are copied from a real analysis);
 * `BENCH_YEAR_INGEST=0` leaves out the ingest-while-retention part.
 * `npm run bench` runs storage-bench.ts, which includes this part.
 */
import { simulateSnapshot, toIngestItem } from '@turnstone/demo-scenario/simulated-snapshot';
import { demoChannels } from '@turnstone/demo-scenario/plant-channels';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { createGatewayKey, signInCookie, startBenchServer } from './bench-support.ts';
import { plantYearFigures } from './storage-year.ts';

const bench = await startBenchServer('storage-year');
try {
  const { srv } = bench;
  const cookie = await signInCookie(srv.url, 'admin@turnstone.local');
  const [sites] = (await srv.ctx.dbHandle.pool.query(
    "SELECT id FROM sites WHERE code = 'MFP'",
  )) as unknown as [{ id: number }[]];
  const key = await createGatewayKey(srv.url, cookie, Number(sites[0]!.id), 'storage-year');
  // the year's point among them: its first analysis gives it its limit set (bands)
  const channels = demoChannels().filter((c) => c.tag.startsWith('MFP-P10'));
  const t0 = Date.parse('2026-01-05T00:00:00Z');
  const snapshots = channels.map((ch) => toIngestItem(simulateSnapshot(ch, new Date(t0), 0)));
  const res = await fetch(`${srv.url}/api/ingest/v1/snapshots`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', authorization: `Bearer ${key}` },
    body: JSON.stringify({ snapshots }),
  });
  if (res.status >= 300) throw new Error(`ingest answered ${res.status}: ${await res.text()}`);
  await createWorker(srv.ctx, { owner: 'storage-year', batch: 16 }).drain();
  await plantYearFigures(bench, { ingest: process.env.BENCH_YEAR_INGEST !== '0' });
} finally {
  await bench.stop();
}
