/**
 * The queue worker: claims analysis jobs and runs them; failures retry with back-off and
 * end as `failed` with their reason. Many workers (processes or in-process instances) can
 * share one database: claims skip locked rows, completions are fenced by the lease.
 */
import { randomUUID } from 'node:crypto';
import { hostname } from 'node:os';
import { eq, sql } from 'drizzle-orm';
import cron, { type ScheduledTask } from 'node-cron';
import { jobs, snapshots } from '@turnstone/db/schema';
import type { AppContext } from '../../lib/context.ts';
import { isDbUnavailable } from '../../lib/error-middleware.ts';
import {
  PermanentJobError,
  runAnalysisJobs,
  type JobFailure,
} from '../analysis/analysis-service.ts';
import { claimJobs, failJob, LeaseLostError, type JobRow } from './queue-repository.ts';
import { expireRawSamples } from './retention.ts';
import { recomputeBaselines } from '../limits/baseline-service.ts';

export interface WorkerOptions {
  /** Jobs claimed per round; their results are committed in one transaction. @default 16 */
  batch?: number;
  /** Identity written into leases. @default host:pid:random */
  owner?: string;
}

export interface Worker {
  owner: string;
  /** Claims and runs jobs until the queue has none due; returns how many ran. */
  drain(maxJobs?: number): Promise<number>;
  /** Starts the cron ticks (queue every second, nightly baselines and retention). */
  start(): void;
  stop(): Promise<void>;
}

export function createWorker(ctx: AppContext, options: WorkerOptions = {}): Worker {
  const owner = options.owner ?? `${hostname()}:${process.pid}:${randomUUID().slice(0, 8)}`;
  const batch = options.batch ?? 16;
  const tasks: ScheduledTask[] = [];
  let running: Promise<number> | null = null;

  /** Records a job's failure: retried after a back-off, or failed for good with its reason. */
  async function recordFailure(job: JobRow, err: unknown): Promise<void> {
    if (err instanceof LeaseLostError) {
      ctx.log.warn('job lease lost; another worker finishes it', { jobId: job.id });
      return;
    }
    if (isDbUnavailable(err)) throw err;
    const message = err instanceof Error ? err.message : String(err);
    const permanent = err instanceof PermanentJobError;
    if (permanent)
      await ctx.db.update(jobs).set({ maxAttempts: job.attempts }).where(eq(jobs.id, job.id));
    const outcome = await failJob(
      ctx.db,
      permanent ? { ...job, maxAttempts: job.attempts } : job,
      owner,
      message,
    );
    ctx.log.warn('analysis job failed', {
      jobId: job.id,
      snapshotId: job.snapshotId,
      outcome,
      message,
    });
    if (outcome === 'failed' && job.snapshotId) {
      await ctx.db
        .update(snapshots)
        .set({ status: 'failed', statusReason: message.slice(0, 2000) })
        .where(eq(snapshots.id, job.snapshotId));
    }
  }

  /**
   * Runs a claimed batch, its results committed together. When the batch cannot be
   * written (one job's rows refused, a lease lost, a deadlock), nothing of it was stored:
   * each job then runs alone, so only the one at fault fails.
   */
  async function runBatch(claimed: JobRow[]): Promise<void> {
    const failures: JobFailure[] = [];
    const analyze: JobRow[] = [];
    for (const job of claimed)
      if (job.kind === 'analyze') analyze.push(job);
      else failures.push({ job, error: new PermanentJobError(`unknown job kind "${job.kind}"`) });
    try {
      if (analyze.length) failures.push(...(await runAnalysisJobs(ctx, analyze, owner)).failures);
    } catch (err) {
      if (isDbUnavailable(err)) throw err;
      if (analyze.length === 1) failures.push({ job: analyze[0]!, error: err });
      else
        for (const job of analyze) {
          try {
            failures.push(...(await runAnalysisJobs(ctx, [job], owner)).failures);
          } catch (error) {
            if (isDbUnavailable(error)) throw error;
            failures.push({ job, error });
          }
        }
    }
    for (const f of failures) await recordFailure(f.job, f.error);
  }

  async function drainInner(maxJobs: number): Promise<number> {
    let done = 0;
    while (done < maxJobs) {
      const claimed = await claimJobs(
        ctx.db,
        owner,
        ctx.config.JOB_LEASE_S,
        Math.min(batch, maxJobs - done),
        ['analyze'],
      );
      if (claimed.length === 0) break;
      await runBatch(claimed);
      done += claimed.length;
    }
    return done;
  }

  const drain = (maxJobs = Number.POSITIVE_INFINITY) => {
    // One drain at a time per worker instance: cron ticks never overlap.
    running ??= drainInner(maxJobs).finally(() => {
      running = null;
    });
    return running;
  };

  const guarded = (name: string, fn: () => Promise<unknown>) => async () => {
    try {
      await fn();
    } catch (err) {
      if (isDbUnavailable(err)) ctx.log.warn(`${name}: database unavailable, will retry`);
      else ctx.log.error(`${name} failed`, { err });
    }
  };

  // node-cron warns on every skipped overlapping tick; a long drain is expected, not news.
  const cronLogger = {
    info: () => {},
    warn: () => {},
    debug: () => {},
    error: (m: string | Error) => ctx.log.error('scheduler', { err: m }),
  };

  return {
    owner,
    drain,
    start() {
      tasks.push(
        cron.schedule(
          '* * * * * *',
          guarded('queue', () => drain()),
          { noOverlap: true, name: 'queue', logger: cronLogger },
        ),
      );
      tasks.push(
        cron.schedule(
          '15 2 * * *',
          guarded('baselines', () => recomputeBaselines(ctx)),
          { noOverlap: true, name: 'baselines', logger: cronLogger },
        ),
      );
      tasks.push(
        cron.schedule(
          '45 2 * * *',
          guarded('retention', () => expireRawSamples(ctx.db, ctx.config.RETENTION_DAYS)),
          { noOverlap: true, name: 'retention', logger: cronLogger },
        ),
      );
    },
    async stop() {
      for (const t of tasks.splice(0)) await t.stop();
      await running?.catch(() => {});
    },
  };
}

/** Jobs waiting or running, for health and benchmarks. */
export async function queueDepth(ctx: AppContext): Promise<number> {
  const [row] = await ctx.db
    .select({ n: sql<number>`COUNT(*)` })
    .from(jobs)
    .where(sql`${jobs.state} IN ('queued','running')`);
  return Number(row?.n ?? 0);
}
