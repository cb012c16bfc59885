/**
 * The jobs table as a queue. Claims take rows with SELECT … FOR UPDATE SKIP LOCKED inside a
 * transaction (MariaDB ≥ 10.6, InnoDB), so any number of workers share it without taking
 * the same job; a claim is a lease that expires, so a dead worker's job is claimed again.
 */
import { and, asc, eq, inArray, lte, sql } from 'drizzle-orm';
import type { Db, Tx } from '@turnstone/db/client';
import { isLockConflict } from '@turnstone/db/errors';
import { jobs, snapshots } from '@turnstone/db/schema';

export type JobRow = typeof jobs.$inferSelect;

/**
 * Queue transactions run READ COMMITTED: their scans then lock only the rows they return,
 * not the gaps between index entries, which is what made a claim and another worker's
 * completion deadlock on the jobs indexes.
 */
export const QUEUE_TX = { isolationLevel: 'read committed' } as const;

/**
 * Claims up to `limit` due jobs (queued and due, or running with an expired lease). A claim
 * that loses a deadlock is simply taken again (it wrote nothing).
 */
export async function claimJobs(
  db: Db,
  owner: string,
  leaseS: number,
  limit: number,
  kinds?: string[],
): Promise<JobRow[]> {
  const claimOnce = () =>
    db.transaction(async (tx) => {
      const now = sql`CURRENT_TIMESTAMP(3)`;
      const kindFilter = kinds ? inArray(jobs.kind, kinds) : undefined;
      // Two index range scans (state, run_after) and (state, lease_expires_at): FOR UPDATE
      // locks only the rows it reads, so an unindexed scan would lock the whole queue and
      // starve the other workers.
      const due = await tx
        .select({ id: jobs.id })
        .from(jobs)
        .where(and(eq(jobs.state, 'queued'), lte(jobs.runAfter, now), kindFilter))
        .orderBy(asc(jobs.runAfter))
        .limit(limit)
        .for('update', { skipLocked: true });
      const expired =
        due.length < limit
          ? await tx
              .select({ id: jobs.id })
              .from(jobs)
              .where(and(eq(jobs.state, 'running'), lte(jobs.leaseExpiresAt, now), kindFilter))
              .orderBy(asc(jobs.leaseExpiresAt))
              .limit(limit - due.length)
              .for('update', { skipLocked: true })
          : [];
      const ids = [...due, ...expired].map((r) => r.id);
      if (ids.length === 0) return [];
      await tx
        .update(jobs)
        .set({
          state: 'running',
          leaseOwner: owner,
          leaseExpiresAt: sql`CURRENT_TIMESTAMP(3) + INTERVAL ${Math.round(leaseS * 1000)} * 1000 MICROSECOND`,
          attempts: sql`${jobs.attempts} + 1`,
        })
        .where(inArray(jobs.id, ids));
      return tx.select().from(jobs).where(inArray(jobs.id, ids)).orderBy(asc(jobs.id));
    }, QUEUE_TX);
  for (let attempt = 1; ; attempt++) {
    try {
      return await claimOnce();
    } catch (err) {
      if (attempt >= 3 || !isLockConflict(err)) throw err;
    }
  }
}

/**
 * Marks jobs done inside the transaction that writes their results. Fenced by the lease:
 * true only when this worker still holds every one of them; otherwise the caller must roll
 * the whole batch back, so the results of one snapshot are committed exactly once.
 * The matched rows stay locked to the end of the transaction, so a lease running out
 * meanwhile cannot hand them to another worker.
 */
export async function completeJobsIn(tx: Tx, ids: number[], owner: string): Promise<boolean> {
  if (ids.length === 0) return true;
  const [result] = await tx
    .update(jobs)
    .set({
      state: 'done',
      finishedAt: sql`CURRENT_TIMESTAMP(3)`,
      leaseOwner: null,
      leaseExpiresAt: null,
      lastError: null,
    })
    .where(and(inArray(jobs.id, ids), eq(jobs.leaseOwner, owner), eq(jobs.state, 'running')));
  return result.affectedRows === new Set(ids).size;
}

/** Back-off between attempts: 2, 4, 8 … seconds, at most 10 minutes. */
export const retryDelayS = (attempts: number) => Math.min(600, 2 ** Math.max(1, attempts));

/**
 * Records a failure: queued again after a back-off, or failed for good after max attempts.
 * Fenced by the lease like a completion: `lost` when another worker holds the job now (or
 * finished it), and then nothing is written.
 */
export async function failJob(
  db: Db,
  job: JobRow,
  owner: string,
  message: string,
): Promise<'retry' | 'failed' | 'lost'> {
  const final = job.attempts >= job.maxAttempts;
  const [result] = await db
    .update(jobs)
    .set(
      final
        ? {
            state: 'failed',
            lastError: message.slice(0, 4000),
            leaseOwner: null,
            leaseExpiresAt: null,
            finishedAt: sql`CURRENT_TIMESTAMP(3)`,
          }
        : {
            state: 'queued',
            lastError: message.slice(0, 4000),
            leaseOwner: null,
            leaseExpiresAt: null,
            runAfter: sql`CURRENT_TIMESTAMP(3) + INTERVAL ${retryDelayS(job.attempts)} SECOND`,
          },
    )
    .where(and(eq(jobs.id, job.id), eq(jobs.leaseOwner, owner), eq(jobs.state, 'running')));
  if (result.affectedRows === 0) return 'lost';
  return final ? 'failed' : 'retry';
}

export class LeaseLostError extends Error {
  constructor(jobIds: number[]) {
    super(
      `${jobIds.length === 1 ? 'job' : 'jobs'} ${jobIds.join(', ')}: lease taken over by another worker`,
    );
  }
}

/** A job that can never succeed gets no more attempts (fenced by its lease owner). */
export async function endRetries(db: Db, job: JobRow, owner: string): Promise<void> {
  await db
    .update(jobs)
    .set({ maxAttempts: job.attempts })
    .where(and(eq(jobs.id, job.id), eq(jobs.leaseOwner, owner)));
}

/** The snapshot of a job that failed for good says so, with the reason. */
export async function markSnapshotFailed(db: Db, snapshotId: number, message: string) {
  await db
    .update(snapshots)
    .set({ status: 'failed', statusReason: message.slice(0, 2000) })
    .where(eq(snapshots.id, snapshotId));
}

/** Jobs waiting or running. */
export async function countOpenJobs(db: Db): Promise<number> {
  const [row] = await db
    .select({ n: sql<number>`COUNT(*)` })
    .from(jobs)
    .where(sql`${jobs.state} IN ('queued','running')`);
  return Number(row?.n ?? 0);
}
