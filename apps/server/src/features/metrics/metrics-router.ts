import { timingSafeEqual } from 'node:crypto';
import { Router, type Request } from 'express';
import cookieParser from 'cookie-parser';
import { Gauge, Registry } from 'prom-client';
import type { AppContext } from '../../lib/context.ts';
import { forbidden, unauthenticated } from '../../lib/app-error.ts';
import { registry } from '../../lib/metrics.ts';
import type { Authenticate } from '../../lib/route-table.ts';
import { queueAndOutboxCounts } from './metrics-repository.ts';

const LOOPBACK = /^(127\.\d+\.\d+\.\d+|::1|::ffff:127\.\d+\.\d+\.\d+)$/;

function bearerMatches(req: Request, token: string | undefined): boolean {
  if (!token) return false;
  const m = /^Bearer (.+)$/.exec(req.get('authorization') ?? '');
  if (!m) return false;
  const a = Buffer.from(m[1]!);
  const b = Buffer.from(token);
  return a.length === b.length && timingSafeEqual(a, b);
}

/** The pool's own counts; mysql2 keeps them on the core pool (not public API, read defensively). */
function poolCounts(pool: unknown): { open: number; idle: number; limit: number } | null {
  const core = (pool as { pool?: unknown }).pool ?? pool;
  const c = core as {
    _allConnections?: { length: number };
    _freeConnections?: { length: number };
    config?: { connectionLimit?: number };
  };
  if (!c._allConnections || !c._freeConnections) return null;
  return {
    open: c._allConnections.length,
    idle: c._freeConnections.length,
    limit: c.config?.connectionLimit ?? 0,
  };
}

/** Reads the figures that belong to the database, into a registry made for this scrape. */
async function databaseMetrics(ctx: AppContext): Promise<Registry> {
  const r = new Registry();
  const up = new Gauge({
    name: 'turnstone_database_up',
    help: '1 when the database answered this scrape, else 0.',
    registers: [r],
  });
  const pool = new Gauge({
    name: 'turnstone_database_pool_connections',
    help: 'Connections of this process’s database pools, by pool and state (busy, idle, limit).',
    labelNames: ['pool', 'state'] as const,
    registers: [r],
  });
  for (const [name, p] of [
    ['main', ctx.dbHandle.pool],
    ['ingest', ctx.dbHandle.batchPool],
  ] as const) {
    const c = poolCounts(p);
    if (!c) continue;
    pool.set({ pool: name, state: 'busy' }, c.open - c.idle);
    pool.set({ pool: name, state: 'idle' }, c.idle);
    pool.set({ pool: name, state: 'limit' }, c.limit);
  }
  const replicas = ctx.dbHandle.replicas();
  if (replicas.length > 0) {
    const usable = new Gauge({
      name: 'turnstone_database_replica_usable',
      help: '1 when the read replica is up, replicating and within REPLICA_MAX_LAG_S (it serves dashboard reads), else 0.',
      labelNames: ['replica'] as const,
      registers: [r],
    });
    const lag = new Gauge({
      name: 'turnstone_database_replica_lag_seconds',
      help: 'Seconds_Behind_Master of the read replica at its last probe; absent while unknown.',
      labelNames: ['replica'] as const,
      registers: [r],
    });
    for (const h of replicas) {
      usable.set({ replica: h.name }, h.usable ? 1 : 0);
      if (h.lagSeconds !== null) lag.set({ replica: h.name }, h.lagSeconds);
    }
  }
  try {
    const { jobs: j, mail: m } = await queueAndOutboxCounts(ctx.dbHandle.pool);
    const num = (v: string | number | null | undefined) => Number(v ?? 0);
    const jobsGauge = new Gauge({
      name: 'turnstone_queue_jobs',
      help: 'Analysis jobs by state: due (waiting for a worker now), waiting (a retry later), running, failed (for good).',
      labelNames: ['state'] as const,
      registers: [r],
    });
    for (const s of ['due', 'waiting', 'running', 'failed'] as const)
      jobsGauge.set({ state: s }, num(j[s]));
    new Gauge({
      name: 'turnstone_queue_oldest_due_age_seconds',
      help: 'How long the oldest due job has waited for a worker (the workers’ lag); 0 when none waits.',
      registers: [r],
    }).set(Math.max(0, num(j.oldest_due_s)));
    const mailGauge = new Gauge({
      name: 'turnstone_outbox_messages',
      help: 'Outgoing e-mail not sent, by state: pending (will be tried), failed (gave up), uncertain (a send was cut off and is not repeated).',
      labelNames: ['state'] as const,
      registers: [r],
    });
    for (const s of ['pending', 'failed', 'uncertain'] as const)
      mailGauge.set({ state: s }, num(m[s]));
    new Gauge({
      name: 'turnstone_outbox_oldest_pending_age_seconds',
      help: 'Age of the oldest e-mail still to be sent; 0 when none is pending.',
      registers: [r],
    }).set(Math.max(0, num(m.oldest_pending_s)));
    up.set(1);
  } catch {
    up.set(0);
  }
  return r;
}

/**
 * `GET /metrics`: the Prometheus text exposition. Readable from loopback (a Prometheus or
 * agent on the same host), with `METRICS_TOKEN` as a bearer token, or by a signed-in
 * administrator; anyone else gets 401/403, as the figures describe the plant's traffic.
 */
export function metricsRouter(ctx: AppContext, authenticate: Authenticate): Router {
  const router = Router();
  router.get('/metrics', cookieParser(), async (req, res, next) => {
    try {
      if (!LOOPBACK.test(req.ip ?? '') && !bearerMatches(req, ctx.config.METRICS_TOKEN)) {
        await authenticate(req);
        if (!req.user)
          throw unauthenticated('Sign in as an administrator, or send the metrics token.');
        if (req.user.role !== 'admin') throw forbidden('Only administrators can read the metrics.');
      }
      const merged = Registry.merge([registry, await databaseMetrics(ctx)]);
      res.setHeader('Content-Type', merged.contentType);
      res.setHeader('Cache-Control', 'no-store');
      res.send(await merged.metrics());
    } catch (err) {
      next(err);
    }
  });
  return router;
}
