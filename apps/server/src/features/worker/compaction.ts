/**
 * Nightly compaction, after the retention pass (retention.ts thins; this gives the bytes
 * back). Bytes on disk per capture are what InnoDB holds, and it holds on to what thinning
 * frees:
 * - done jobs: the queue keeps a row per capture for ever unless removed; removed
 *   `DONE_JOBS_KEEP_DAYS` after they ran, in bounded batches;
 * - summaries of analyses written before their detail moved into the spectra BLOB and
 *   thinned since: the detail is trimmed (what migration 0021 did for the rows thinned
 *   before it), in bounded batches;
 * - the pages thinning emptied: InnoDB keeps them reserved to their partition (data_length
 *   does not drop; measured in tests/bench/storage-bench.ts), and a month's partition takes
 *   no new rows once the month is past, so they would never be used again. Once a month the
 *   thinned tables (analyses, snapshots) are rebuilt online — `ALTER TABLE … FORCE,
 *   ALGORITHM=INPLACE, LOCK=NONE`, not `REBUILD PARTITION`, which in MariaDB locks the
 *   whole table (every partition) for writes while it copies (measured: ingest waited the
 *   rebuild's whole duration). The rebuild needs free disk for a copy of the table while
 *   it runs.
 */
import { setTimeout as sleep } from 'node:timers/promises';
import type { Db } from '@turnstone/db/client';
import { readSetting, putSetting } from '../../lib/settings-repository.ts';
import {
  deleteDoneJobs,
  rebuildOnline,
  THINNED_TABLES,
  trimThinnedSummaries,
} from './compaction-repository.ts';
import type { RetentionPolicy } from './retention.ts';

/** When the worker runs compaction (node-cron, server time): after retention (02:45). */
export const COMPACTION_CRON = '30 4 * * *';
/** Days a done job is kept (for someone looking into the queue by hand). */
export const DONE_JOBS_KEEP_DAYS = 7;
/** Seconds the rebuild's final metadata lock may wait before it gives up until next time. */
export const REBUILD_LOCK_WAIT_S = 5;
const LAST_RUN = 'compaction.lastRun';
const REBUILT_MONTH = 'compaction.rebuiltMonth';
const DAY = 86_400_000;

export interface CompactionResult {
  doneJobsDeleted: number;
  summariesTrimmed: number;
  /** The tables rebuilt this run (empty: not due this month, or spectra are not thinned). */
  rebuilt: string[];
}

async function inBatches(
  step: () => Promise<number>,
  batchSize: number,
  pauseMs: number,
): Promise<number> {
  let total = 0;
  for (;;) {
    const n = await step();
    total += n;
    if (n < batchSize) return total;
    if (pauseMs > 0) await sleep(pauseMs);
  }
}

export async function runCompaction(
  db: Db,
  policy: RetentionPolicy,
  now = new Date(),
  options: { rebuild?: boolean } = {},
): Promise<CompactionResult> {
  const { batchSize, batchPauseMs } = policy;
  const doneJobsDeleted = await inBatches(
    () => deleteDoneJobs(db, new Date(now.getTime() - DONE_JOBS_KEEP_DAYS * DAY), batchSize),
    batchSize,
    batchPauseMs,
  );
  // Settings hold objects (a bare JSON string does not read back as itself).
  const last = (await readSetting(db, LAST_RUN)) as { at?: string } | undefined;
  // A day's overlap with the last run; 30 days back the first time.
  const since = new Date(last?.at ? Date.parse(last.at) - DAY : now.getTime() - 30 * DAY);
  const summariesTrimmed = await inBatches(
    () => trimThinnedSummaries(db, since, batchSize),
    batchSize,
    batchPauseMs,
  );
  const rebuilt: string[] = [];
  const month = now.toISOString().slice(0, 7);
  const rebuiltIn = (await readSetting(db, REBUILT_MONTH)) as { month?: string } | undefined;
  const due = options.rebuild ?? rebuiltIn?.month !== month;
  if (due && policy.spectraWholeDays > 0) {
    for (const table of THINNED_TABLES) {
      await rebuildOnline(db, table, REBUILD_LOCK_WAIT_S);
      rebuilt.push(table);
    }
    await putSetting(db, REBUILT_MONTH, { month });
  }
  await putSetting(db, LAST_RUN, { at: now.toISOString() });
  return { doneJobsDeleted, summariesTrimmed, rebuilt };
}
