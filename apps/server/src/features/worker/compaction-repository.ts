/** The queries of the nightly compaction (what and when: compaction.ts). */
import { sql } from 'drizzle-orm';
import type { Db } from '@turnstone/db/client';

async function affected(db: Db, query: ReturnType<typeof sql>): Promise<number> {
  const [result] = (await db.execute(query)) as unknown as [{ affectedRows: number }];
  return result.affectedRows;
}

/**
 * Deletes at most `limit` jobs done before `cutoff` (oldest first, a range of jobs_claim_idx:
 * state, run_after). Nothing reads a done job: the queue, its metrics and health count the
 * queued, running and failed ones; a failed job stays for its reason.
 */
export async function deleteDoneJobs(db: Db, cutoff: Date, limit: number): Promise<number> {
  return affected(
    db,
    sql`DELETE FROM jobs WHERE state = 'done' AND run_after < ${cutoff}
          AND finished_at < ${cutoff} ORDER BY run_after LIMIT ${limit}`,
  );
}

/** The parts of a summary written before the split that belong to the spectra (stored-summary.ts). */
const DETAIL_PATHS = sql.raw(`'$.qualityMetrics', '$.spectra', '$.peaks', '$.faultFrequencies'`);

/**
 * Removes from at most `limit` analyses thinned since `since` the spectra's detail that rows
 * written before it moved into the spectra BLOB still hold in their summary (a range of
 * analyses_thinned_idx). Migration 0021 did this for the rows thinned before it.
 */
export async function trimThinnedSummaries(db: Db, since: Date, limit: number): Promise<number> {
  return affected(
    db,
    sql`UPDATE analyses SET summary = JSON_REMOVE(summary, ${DETAIL_PATHS})
         WHERE spectra_thinned_at >= ${since}
           AND JSON_CONTAINS_PATH(summary, 'one', ${DETAIL_PATHS})
         LIMIT ${limit}`,
  );
}

/** The tables whose rows thinning shrinks (band_values are never thinned). */
export const THINNED_TABLES = ['analyses', 'snapshots'] as const;

/**
 * Rebuilds `table` online (`ALTER TABLE … FORCE, ALGORITHM=INPLACE, LOCK=NONE`): InnoDB
 * keeps the pages that thinning emptied reserved to their partition, which takes no new
 * rows once its month is past, so only a rebuild gives the bytes back. Ingest goes on
 * meanwhile; MariaDB refuses rather than lock if it cannot do it online. The metadata lock
 * it needs at the end waits at most `lockWaitS` seconds (then the statement fails and the
 * next run tries again), so writers queued behind it wait no longer than that.
 */
export async function rebuildOnline(
  db: Db,
  table: (typeof THINNED_TABLES)[number],
  lockWaitS: number,
): Promise<void> {
  if (!THINNED_TABLES.includes(table)) throw new Error(`not a thinned table: ${table}`);
  await db.execute(
    sql.raw(
      `SET STATEMENT lock_wait_timeout = ${Math.max(1, Math.floor(lockWaitS))} FOR ` +
        `ALTER TABLE \`${table}\` FORCE, ALGORITHM=INPLACE, LOCK=NONE`,
    ),
  );
}
