/**
 * The queue worker: claims analysis jobs in batches, analyses a batch while the previous one
 * is written, and commits each batch in one transaction; failures retry with back-off and
 * end as `failed` with their reason. Many workers (processes or in-process instances) can
 * share one database: claims skip locked rows, completions are fenced by the lease.
 */
import { randomUUID } from 'node:crypto';
import { hostname } from 'node:os';
import cron, { type ScheduledTask } from 'node-cron';
import type { AppContext } from '../../lib/context.ts';
import { isDbUnavailable } from '@turnstone/db/errors';
import {
  PermanentJobError,
  prepareAnalyses,
  runAnalysisJobs,
  storeAnalyses,
  type JobFailure,
  type PreparedAnalysis,
} from '../analysis/analysis-service.ts';
import {
  claimJobs,
  countOpenJobs,
  endRetries,
  failJob,
  LeaseLostError,
  markSnapshotFailed,
  type JobRow,
} from '../queue/queue-repository.ts';
import { RETENTION_CRON, retentionPolicy, runRetention } from './retention.ts';
import { ensurePartitionsAhead, PARTITIONS_CRON } from './partitions.ts';
import { COMPACTION_CRON, runCompaction } from './compaction.ts';
import { recomputeBaselines } from '../limits/baseline-service.ts';
import { countAnalyses, observeAnalyses, recordRetention } from '../../lib/metrics.ts';

export interface WorkerOptions {
  /** Jobs claimed per round; their results are committed in one transaction. @default 16 */
  batch?: number;
  /** Identity written into leases. @default host:pid:random */
  owner?: string;
}

export interface Worker {
  owner: string;
  /**
   * Claims and runs jobs until the queue has none due; returns how many this worker
   * finished (analysed, or recorded as failed).
   */
  drain(maxJobs?: number): Promise<number>;
  /**
   * Starts the cron ticks (queue every second; nightly baselines, months' partitions ahead
   * and retention) and adds the coming months' partitions once at once.
   */
  start(): void;
  stop(): Promise<void>;
}

export function createWorker(ctx: AppContext, options: WorkerOptions = {}): Worker {
  const owner = options.owner ?? `${hostname()}:${process.pid}:${randomUUID().slice(0, 8)}`;
  const batch = options.batch ?? 16;
  const tasks: ScheduledTask[] = [];
  let running: Promise<number> | null = null;

  /**
   * Records a job's failure: retried after a back-off, or failed for good with its reason.
   * False when the job is no longer this worker's (its lease was lost).
   */
  async function recordFailure(job: JobRow, err: unknown): Promise<boolean> {
    if (err instanceof LeaseLostError) {
      ctx.log.warn('job lease lost; another worker finishes it', { jobId: job.id });
      return false;
    }
    if (isDbUnavailable(err)) throw err;
    const message = err instanceof Error ? err.message : String(err);
    const permanent = err instanceof PermanentJobError;
    if (permanent) await endRetries(ctx.db, job, owner);
    const outcome = await failJob(
      ctx.db,
      permanent ? { ...job, maxAttempts: job.attempts } : job,
      owner,
      message,
    );
    if (outcome === 'lost') {
      ctx.log.warn('job lease lost; another worker finishes it', { jobId: job.id });
      return false;
    }
    countAnalyses(outcome === 'failed' ? 'failed' : 'retried', 1);
    ctx.log.warn('analysis job failed', {
      jobId: job.id,
      snapshotId: job.snapshotId,
      outcome,
      message,
    });
    if (outcome === 'failed' && job.snapshotId) {
      await markSnapshotFailed(ctx.db, job.snapshotId, message);
    }
    return true;
  }

  /** A claimed batch, computed and waiting to be written. */
  interface ComputedBatch {
    prepared: PreparedAnalysis[];
    failures: JobFailure[];
    /** Jobs to run one by one (the batch read failed for a reason of its own). */
    alone: JobRow[];
  }

  /** Reads and analyses a claimed batch; nothing is written. */
  async function computeBatch(claimed: JobRow[]): Promise<ComputedBatch> {
    const failures: JobFailure[] = [];
    const analyze: JobRow[] = [];
    for (const job of claimed)
      if (job.kind === 'analyze') analyze.push(job);
      else failures.push({ job, error: new PermanentJobError(`unknown job kind "${job.kind}"`) });
    try {
      const t0 = performance.now();
      const r = await prepareAnalyses(ctx, analyze);
      observeAnalyses(r.prepared.length, (performance.now() - t0) / 1000);
      return { prepared: r.prepared, failures: [...failures, ...r.failures], alone: [] };
    } catch (err) {
      if (isDbUnavailable(err)) throw err;
      return { prepared: [], failures, alone: analyze };
    }
  }

  /**
   * Commits a computed batch in one transaction. When it cannot be written (one job's rows
   * refused, a lease lost, a deadlock), nothing of it was stored: each job then runs
   * alone, so only the one at fault fails. Returns how many jobs this worker finished
   * (stored, or recorded as failed); jobs whose lease it lost are the new owner's.
   */
  async function writeBatch(b: ComputedBatch): Promise<number> {
    let finished = 0;
    const failures = [...b.failures];
    const alone = [...b.alone];
    try {
      const stored = (await storeAnalyses(ctx, b.prepared, owner)).length;
      countAnalyses('stored', stored);
      finished += stored;
    } catch (err) {
      if (isDbUnavailable(err)) throw err;
      if (b.prepared.length === 1) failures.push({ job: b.prepared[0]!.job, error: err });
      else alone.push(...b.prepared.map((p) => p.job));
    }
    for (const job of alone) {
      try {
        const r = await runAnalysisJobs(ctx, [job], owner);
        countAnalyses('stored', r.outcomes.length);
        finished += r.outcomes.length;
        failures.push(...r.failures);
      } catch (error) {
        if (isDbUnavailable(error)) throw error;
        failures.push({ job, error });
      }
    }
    for (const f of failures) if (await recordFailure(f.job, f.error)) finished++;
    return finished;
  }

  /**
   * Claims and computes the next batch while the previous one is being written (the
   * database's work and the analyses overlap); writes stay one at a time and in order.
   */
  async function drainInner(maxJobs: number): Promise<number> {
    let claimedCount = 0;
    let done = 0;
    let writing: Promise<void> = Promise.resolve();
    try {
      while (claimedCount < maxJobs) {
        const claimed = await claimJobs(
          ctx.db,
          owner,
          ctx.config.JOB_LEASE_S,
          Math.min(batch, maxJobs - claimedCount),
          ['analyze'],
        );
        if (claimed.length === 0) break;
        const computed = await computeBatch(claimed);
        await writing;
        writing = writeBatch(computed).then((n) => {
          done += n;
        });
        // Handled here so a failure while the next batch is computed is not "unhandled";
        // the next `await writing` still throws it.
        writing.catch(() => {});
        claimedCount += claimed.length;
      }
    } finally {
      await writing;
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
      const partitionsAhead = guarded('partitions', async () => {
        const added = await ensurePartitionsAhead(ctx.db);
        if (added.length > 0) ctx.log.info('partitions added', { added });
      });
      void partitionsAhead();
      tasks.push(
        cron.schedule(PARTITIONS_CRON, partitionsAhead, {
          noOverlap: true,
          name: 'partitions',
          logger: cronLogger,
        }),
      );
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
          RETENTION_CRON,
          guarded('retention', async () => {
            const t0 = performance.now();
            const { thinned, expired } = await runRetention(ctx.db, retentionPolicy(ctx.config));
            recordRetention(
              expired.rows,
              (performance.now() - t0) / 1000,
              new Date(),
              thinned.rows,
            );
          }),
          { noOverlap: true, name: 'retention', logger: cronLogger },
        ),
      );
      tasks.push(
        cron.schedule(
          COMPACTION_CRON,
          guarded('compaction', async () => {
            const r = await runCompaction(ctx.db, retentionPolicy(ctx.config));
            ctx.log.info('compaction', { ...r });
          }),
          { noOverlap: true, name: 'compaction', logger: cronLogger },
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
  return countOpenJobs(ctx.db);
}
