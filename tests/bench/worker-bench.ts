/**
 * Queue worker throughput (issue 4) without the ingest load: 8,192-sample snapshots posted
 * first, then drained by one in-process worker. Prints analysed snapshots/s, the database
 * work per job (statements, commits, redo-log fsyncs: load-independent figures), and the
 * reference measured in the same run: `analyzeSnapshot` alone on the same capture.
 * Target: worker ≥ 200/s. BENCH_WORKER_COUNT (600), BENCH_WORKER_BATCH (16);
 * BENCH_CPU_PROFILE=file.cpuprofile writes a CPU profile of the drain alone.
 */
import { writeFileSync } from 'node:fs';
import { Session } from 'node:inspector/promises';
import { analyzeSnapshot, decodeSamples } from '@turnstone/dsp';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { snapshotBody } from '../support/signals.ts';
import { measureWorker, runLoad, startBenchServerWithGateway } from './bench-support.ts';

const COUNT = Number(process.env.BENCH_WORKER_COUNT ?? 600);
const BATCH = Number(process.env.BENCH_WORKER_BATCH ?? 16);
const bench = await startBenchServerWithGateway('bench');
const { srv, key } = bench;
try {
  await srv.ctx.dbHandle.pool.query("UPDATE jobs SET state = 'done' WHERE state = 'queued'");
  await runLoad({ url: srv.url, key, count: COUNT, concurrency: 16, prefix: 'wrk', samples: 8192 });
  const worker = createWorker(srv.ctx, { owner: 'bench', batch: BATCH });
  const profile = process.env.BENCH_CPU_PROFILE;
  const session = profile ? new Session() : null;
  if (session) {
    session.connect();
    await session.post('Profiler.enable');
    await session.post('Profiler.start');
  }
  const run = await measureWorker(srv.ctx.dbHandle.pool, () => worker.drain());
  if (session && profile) {
    const { profile: data } = await session.post('Profiler.stop');
    writeFileSync(profile, JSON.stringify(data));
    session.disconnect();
  }

  // Reference: the analysis alone, same capture shape, same process.
  const body = snapshotBody('MFP-P101-MDE-H', 'ref', { n: 8192, seed: 7 });
  const bytes = Buffer.from(body.samples, 'base64');
  const input = {
    samples: decodeSamples(new Uint8Array(bytes), 'int16'),
    encoding: 'int16' as const,
    sampleRateHz: body.sampleRateHz,
    adc: { bits: body.adc.bits, fullScaleV: body.adc.fullScaleV },
    sensor: { sensitivityMvPerG: body.sensor.sensitivityMvPerG },
    nominalRpm: 1480,
    machine: {},
    fmaxHz: 1000,
    lines: 1600,
    bands: [],
  };
  for (let i = 0; i < 50; i++) analyzeSnapshot(input);
  const a0 = performance.now();
  const REF = 300;
  for (let i = 0; i < REF; i++) analyzeSnapshot(input);
  const refPerS = REF / ((performance.now() - a0) / 1000);

  console.log('\nWorker (8,192-sample int16 snapshots, 1 process, batch %d)', BATCH);
  console.log('| measure | value | target |');
  console.log('|---|---|---|');
  console.log(`| worker analysed/s | ${run.perS.toFixed(0)} (${run.jobs} jobs) | ≥ 200 |`);
  console.log(`| statements per job | ${run.queriesPerJob.toFixed(1)} | |`);
  console.log(`| commits per job | ${run.commitsPerJob.toFixed(2)} | |`);
  console.log(`| InnoDB fsyncs per job | ${run.fsyncsPerJob.toFixed(2)} | |`);
  console.log(`| bytes sent to the database per job | ${run.bytesInPerJob.toFixed(0)} | |`);
  console.log(`| analyzeSnapshot alone/s (reference) | ${refPerS.toFixed(0)} | |`);
  console.log(`| worker / analysis alone | ${(run.perS / refPerS).toFixed(3)} | |`);
} finally {
  await bench.stop();
}
