/**
 * Ingest and worker throughput (issue 4). Prints, from one run on this machine:
 * - ingest of 4,096-sample int16 snapshots posted by a second process over loopback
 *   (snapshots/s, p50/p99 latency), lost and doubled counted in the database afterwards;
 * - the reference: a raw mysql2 batch insert of the same rows (snapshot + job) in the same run;
 * - worker throughput (analysed snapshots/s in one process) for 8,192-sample snapshots.
 * Targets: ingest ≥ 1,000/s with p99 ≤ 250 ms and zero lost or doubled; worker ≥ 200/s.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import mysql from 'mysql2/promise';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { measureWorker, runLoad, startBenchServerWithGateway } from './bench-support.ts';

const COUNT = Number(process.env.BENCH_INGEST_COUNT ?? 6000);
const CONCURRENCY = Number(process.env.BENCH_INGEST_CONCURRENCY ?? 32);
const WORKER_COUNT = Number(process.env.BENCH_WORKER_COUNT ?? 600);
/** The extra row: gateways that buffer post { snapshots: [...] } of BATCH per request. */
const BATCH = Number(process.env.BENCH_INGEST_BATCH ?? 10);
const BATCH_CONCURRENCY = Number(process.env.BENCH_INGEST_BATCH_CONCURRENCY ?? 8);
const bench = await startBenchServerWithGateway('bench');
const { db, srv, key: apiKey } = bench;
const pool = srv.ctx.dbHandle.pool;
try {
  const load = (prefix: string, count: number, samples: number, batch?: number) =>
    runLoad({
      url: srv.url,
      key: apiKey,
      count,
      concurrency: batch ? BATCH_CONCURRENCY : CONCURRENCY,
      prefix,
      samples,
      batch,
    });
  await load('warm', 300, 4096);
  // Load-independent figures: the server process's CPU time (this process: Express,
  // mysql2, zlib, crypto; the load generator is a separate process), MariaDB's, and the
  // statements, commits and redo-log fsyncs MariaDB counted, each per snapshot.
  const status = async () => {
    const [r] = await pool.query(
      "SHOW GLOBAL STATUS WHERE Variable_name IN ('Questions', 'Com_commit', 'Innodb_data_fsyncs')",
    );
    return Object.fromEntries(
      (r as { Variable_name: string; Value: string }[]).map((x) => [
        x.Variable_name,
        Number(x.Value),
      ]),
    );
  };
  // MariaDB's own CPU time, from /proc (Linux), for the share of the two cores it takes.
  const dbCpuMs = () => {
    try {
      const pid = readFileSync(join(db.dir, 'mariadbd.pid'), 'utf8').trim();
      const f = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1]!.split(' ');
      return ((Number(f[11]) + Number(f[12])) * 1000) / 100; // utime + stime, 100 ticks/s
    } catch {
      return NaN;
    }
  };
  /** One measured run: throughput, latency, CPU and queries per snapshot, lost/doubled. */
  const measured = async (prefix: string, batch?: number) => {
    const st0 = await status();
    const db0 = dbCpuMs();
    const cpu0 = process.cpuUsage();
    const run = await load(prefix, COUNT, 4096, batch);
    const cpu = process.cpuUsage(cpu0);
    const dbMs = (dbCpuMs() - db0) / COUNT;
    const st1 = await status();
    const perSnapshot = (k: string) =>
      ((st1[k]! - st0[k]! - (k === 'Questions' ? 1 : 0)) / COUNT).toFixed(2);
    const [rows] = await pool.query(
      `SELECT COUNT(*) AS n, COUNT(DISTINCT uid) AS u FROM snapshots WHERE uid LIKE '${prefix}-%'`,
    );
    const { n, u } = (rows as { n: number; u: number }[])[0]!;
    return {
      ...run,
      lost: COUNT - Number(u),
      doubled: Number(n) - Number(u),
      cpu: `${((cpu.user + cpu.system) / 1000 / COUNT).toFixed(2)} / ${(run.cpuMs / COUNT).toFixed(2)} / ${dbMs.toFixed(2)}`,
      queries: `${perSnapshot('Questions')} / ${perSnapshot('Com_commit')} / ${perSnapshot('Innodb_data_fsyncs')}`,
    };
  };
  const ingest = await measured('ing');
  const batched = await measured('bat', BATCH);

  // Reference: the same rows by raw mysql2 multi-row INSERTs of 100, one transaction each.
  const [sample] = await pool.query("SELECT * FROM snapshots WHERE uid LIKE 'ing-%' LIMIT 1");
  const s = (sample as Record<string, unknown>[])[0]!;
  const conn = await mysql.createConnection(db.url);
  const r0 = performance.now();
  for (let b = 0; b < COUNT / 100; b++) {
    await conn.beginTransaction();
    const values = Array.from({ length: 100 }, (_, i) => [
      `raw-${b}-${i}`,
      s.point_id,
      'gateway',
      s.taken_at,
      s.sample_rate_hz,
      s.sample_count,
      s.encoding,
      s.adc_bits,
      s.full_scale_v,
      s.sensitivity_mv_per_g,
      s.samples,
      s.content_hash,
      'queued',
    ]);
    const [res] = await conn.query(
      'INSERT INTO snapshots (uid, point_id, source, taken_at, sample_rate_hz, sample_count, encoding, adc_bits, full_scale_v, sensitivity_mv_per_g, samples, content_hash, status) VALUES ?',
      [values],
    );
    const first = (res as { insertId: number }).insertId;
    await conn.query('INSERT INTO jobs (kind, snapshot_id, payload, state) VALUES ?', [
      values.map((_, i) => ['bench', first + i, '{}', 'done']),
    ]);
    await conn.commit();
  }
  const rawPerS = COUNT / ((performance.now() - r0) / 1000);
  await conn.end();

  // Worker: analyse 8,192-sample snapshots with one in-process worker.
  await pool.query("UPDATE jobs SET state = 'done' WHERE state = 'queued'");
  await load('wrk', WORKER_COUNT, 8192);
  const worker = createWorker(srv.ctx, { owner: 'bench', batch: 16 });
  const run = await measureWorker(pool, () => worker.drain());

  console.log('\nIngest (4,096-sample int16, second process, loopback, %d in flight)', CONCURRENCY);
  console.log('| measure | value | target |');
  console.log('|---|---|---|');
  console.log(`| ingest snapshots/s | ${ingest.perS.toFixed(0)} | ≥ 1000 |`);
  console.log(
    `| latency p50 / p99 (ms) | ${ingest.p50.toFixed(1)} / ${ingest.p99.toFixed(1)} | p99 ≤ 250 |`,
  );
  console.log(
    `| statuses | ${JSON.stringify(ingest.statuses)} (retries ${ingest.retries}) | all 201 |`,
  );
  console.log(`| lost / doubled | ${ingest.lost} / ${ingest.doubled} | 0 / 0 |`);
  console.log(`| CPU ms per snapshot: server / load generator / MariaDB | ${ingest.cpu} | |`);
  console.log(`| statements / commits / log fsyncs per snapshot | ${ingest.queries} | |`);
  const b = `batched, ${BATCH} per request, ${BATCH_CONCURRENCY} requests in flight`;
  console.log(`| ${b}: snapshots/s | ${batched.perS.toFixed(0)} | |`);
  console.log(
    `| ${b}: request p50 / p99 (ms) | ${batched.p50.toFixed(1)} / ${batched.p99.toFixed(1)} | |`,
  );
  console.log(
    `| ${b}: item statuses, lost / doubled | ${JSON.stringify(batched.statuses)}, ${batched.lost} / ${batched.doubled} | all 201, 0 / 0 |`,
  );
  console.log(`| ${b}: CPU ms per snapshot (server / load / MariaDB) | ${batched.cpu} | |`);
  console.log(`| raw mysql2 batch insert rows/s (reference) | ${rawPerS.toFixed(0)} | |`);
  console.log(`| ingest / raw batch insert | ${(ingest.perS / rawPerS).toFixed(3)} | |`);
  console.log(
    `| worker analysed/s, 8,192 samples, 1 process | ${run.perS.toFixed(0)} (${run.jobs} jobs) | ≥ 200 |`,
  );
  console.log(
    `| worker statements / commits / fsyncs per job | ${run.queriesPerJob.toFixed(1)} / ${run.commitsPerJob.toFixed(2)} / ${run.fsyncsPerJob.toFixed(2)} | |`,
  );
} finally {
  await bench.stop();
}
