/**
 * Pieces the benches share: a private MariaDB with the real server on it, a session cookie,
 * a gateway key, the load generator process.
 */
import { spawn } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { startLocalMariadb, type LocalMariadb } from '@turnstone/db/local-server';
import type { RunningServer } from '../../apps/server/src/server.ts';
import { startQuietServer } from '../support/test-server.ts';

export interface BenchServer {
  db: LocalMariadb;
  srv: RunningServer;
  /** Stops the server and MariaDB and removes their folder. */
  stop(): Promise<void>;
}

/**
 * A throw-away MariaDB and the real server on port 0 (no web build, demo plant without
 * history, no ingest rate limit); `env` adds to or overrides those settings.
 */
export async function startBenchServer(
  name: string,
  env: Record<string, string> = {},
): Promise<BenchServer> {
  const dir = mkdtempSync(join(tmpdir(), `turnstone-${name}-`));
  const db = await startLocalMariadb({ dataDir: dir, database: 'bench' });
  const srv = await startQuietServer(db.url, dir, {
    LOG_LEVEL: 'error',
    INGEST_MAX_PER_MIN: '10000000',
    ...env,
  });
  return {
    db,
    srv,
    async stop() {
      await srv.stop();
      await db.stop();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** A bench server (as startBenchServer) with a gateway of site 1 the administrator made: its key. */
export async function startBenchServerWithGateway(
  name: string,
  env: Record<string, string> = {},
): Promise<BenchServer & { key: string }> {
  const bench = await startBenchServer(name, env);
  const admin = await signInCookie(bench.srv.url, 'admin@turnstone.local');
  return { ...bench, key: await createGatewayKey(bench.srv.url, admin, 1, name) };
}

export async function signInCookie(
  url: string,
  email: string,
  password = 'turnstone-demo',
): Promise<string> {
  const res = await fetch(`${url}/api/v1/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password }),
  });
  return (res.headers.get('set-cookie') ?? '').split(';')[0]!;
}

export async function createGatewayKey(
  url: string,
  adminCookie: string,
  siteId: number,
  name: string,
): Promise<string> {
  const res = await fetch(`${url}/api/v1/gateways`, {
    method: 'POST',
    headers: { cookie: adminCookie, 'content-type': 'application/json' },
    body: JSON.stringify({ siteId, name }),
  });
  return ((await res.json()) as { apiKey: string }).apiKey;
}

export interface LoadResult {
  wallS: number;
  perS: number;
  p50: number;
  p99: number;
  statuses: Record<string, number>;
  retries: number;
  /** CPU time (user + system) the load generator itself spent while posting. */
  cpuMs: number;
}

export interface LoadOptions {
  url: string;
  key: string;
  count: number;
  concurrency: number;
  prefix: string;
  samples: number;
  /** Paced requests per second; 0 = flat out. */
  ratePerS?: number;
  pointTag?: string;
  /** Snapshots per request ({ snapshots: [...] }); 1 = one snapshot object per request. */
  batch?: number;
}

/**
 * Runs tests/bench/ingest-load.ts as a second process. Asynchronous on purpose: the
 * benches run the server in their own process, which a spawnSync would freeze.
 */
export function runLoad(o: LoadOptions): Promise<LoadResult> {
  const tsx = join(process.cwd(), 'node_modules', 'tsx', 'dist', 'cli.mjs');
  const args = [
    tsx,
    'tests/bench/ingest-load.ts',
    o.url,
    o.key,
    String(o.count),
    String(o.concurrency),
    o.prefix,
    String(o.samples),
  ];
  if (o.ratePerS !== undefined || o.pointTag !== undefined || o.batch !== undefined)
    args.push(String(o.ratePerS ?? 0));
  if (o.pointTag !== undefined || o.batch !== undefined) args.push(o.pointTag ?? 'MFP-P101-MDE-H');
  if (o.batch !== undefined) args.push(String(o.batch));
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, args);
    let out = '';
    let err = '';
    child.stdout.on('data', (d) => (out += d));
    child.stderr.on('data', (d) => (err += d));
    child.on('exit', (code) => {
      if (code !== 0)
        return reject(new Error(`load generator ${o.prefix} exited ${code}: ${err.slice(-500)}`));
      resolve(JSON.parse(out.trim().split('\n').pop()!) as LoadResult);
    });
  });
}

export interface WorkerRun {
  jobs: number;
  perS: number;
  /** Statements the server received per job (SHOW GLOBAL STATUS 'Questions'). */
  queriesPerJob: number;
  /** Explicit COMMITs per job ('Com_commit'). */
  commitsPerJob: number;
  /** InnoDB fsyncs per job ('Innodb_data_fsyncs'): what durable commits cost. */
  fsyncsPerJob: number;
  /** Bytes the server received per job ('Bytes_received'). */
  bytesInPerJob: number;
}

/**
 * Drains the queue with one in-process worker and counts, besides the rate, what the
 * database did per job: figures that do not depend on the machine's load.
 */
export async function measureWorker(
  pool: {
    query(sql: string): Promise<unknown>;
  },
  drain: () => Promise<number>,
): Promise<WorkerRun> {
  const status = async () => {
    const [rows] = (await pool.query(
      "SHOW GLOBAL STATUS WHERE Variable_name IN ('Questions','Com_commit','Innodb_data_fsyncs','Bytes_received')",
    )) as [{ Variable_name: string; Value: string }[]];
    return Object.fromEntries(rows.map((r) => [r.Variable_name, Number(r.Value)]));
  };
  const s0 = await status();
  const t0 = performance.now();
  const jobs = await drain();
  const wallS = (performance.now() - t0) / 1000;
  const s1 = await status();
  // The two SHOW STATUS statements themselves count as questions: one of them is inside.
  const per = (k: string, own = 0) => (s1[k]! - s0[k]! - own) / Math.max(1, jobs);
  return {
    jobs,
    perS: jobs / wallS,
    queriesPerJob: per('Questions', 1),
    commitsPerJob: per('Com_commit'),
    fsyncsPerJob: per('Innodb_data_fsyncs'),
    bytesInPerJob: per('Bytes_received'),
  };
}

/** Times of GET /api/health, one every 50 ms, while `done` is pending (ms each). */
export async function probeWhile(url: string, done: Promise<unknown>): Promise<number[]> {
  const times: number[] = [];
  let finished = false;
  void done.then(() => (finished = true));
  while (!finished) {
    const t0 = performance.now();
    await fetch(`${url}/api/health`)
      .then((r) => r.arrayBuffer())
      .catch(() => undefined);
    times.push(performance.now() - t0);
    await new Promise((r) => setTimeout(r, 50));
  }
  return times;
}
