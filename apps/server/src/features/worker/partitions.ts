/**
 * The monthly partitions of the captures' tables (snapshots, analyses, band_values, by
 * `taken_at`; created by migration 0018_time-partitioning):
 * `p_before` (everything older than the first month), one `pYYYYMM` per month, and
 * `p_future` (MAXVALUE), which catches captures beyond the last month so an insert never
 * fails for want of a partition.
 *
 * - `ensurePartitionsAhead` (the worker, at its start and nightly): splits the coming months
 *   off `p_future`, `MONTHS_AHEAD` ahead, while `p_future` is still empty (cheap).
 * - `dropExpiredPartitions` (the retention pass): when the policy sets a capture horizon
 *   (`CAPTURE_RETENTION_MONTHS`, 0 = for ever, the default), drops each month that ended
 *   before it from all three tables at once — unless a capture kept whole lives in it
 *   (retention.ts's list), in which case the month stays and is thinned like any other.
 *   The rows of other tables that pointed at its captures (jobs, uids, quality notices,
 *   pins) are deleted first, in one transaction: partitioned tables take no foreign keys;
 *   the day sums of its days (band_day_sums) go with its band values (`dropMonth`), and so
 *   do the trend's hour summaries of the month (band_value_hours).
 */
import type { Db } from '@turnstone/db/client';
import { isDuplicatePartition } from '@turnstone/db/errors';
import {
  deleteDependentsOfCaptures,
  dropPartition,
  PARTITIONED_TABLES,
  partitionsOf,
  splitFuture,
  type PartitionedTable,
} from './partitions-repository.ts';
import { forgetDroppedDays } from '../analysis/band-day-sums.ts';
import { deleteHoursBetween } from '../analysis/band-hours-repository.ts';
import { firstCapturesAfterLimitChanges, keptCaptureIn } from './retention-repository.ts';

/** When the worker adds partitions ahead (node-cron, server time). */
export const PARTITIONS_CRON = '30 2 * * *';
/** Months ahead of the current one that have their own partition. */
export const MONTHS_AHEAD = 3;

/** The first instant of the UTC month `months` after the one holding `at`. */
export function monthStart(at: Date, months = 0): Date {
  return new Date(Date.UTC(at.getUTCFullYear(), at.getUTCMonth() + months, 1));
}
const day = (d: Date) => d.toISOString().slice(0, 10);
const monthName = (d: Date) => `p${day(d).slice(0, 7).replace('-', '')}`;

/**
 * Gives every month up to `MONTHS_AHEAD` after `now`'s its own partition in each table;
 * returns the partitions added. A table that is not partitioned is left alone.
 */
export async function ensurePartitionsAhead(db: Db, now = new Date()): Promise<string[]> {
  const added: string[] = [];
  const last = monthStart(now, MONTHS_AHEAD + 1);
  for (const table of PARTITIONED_TABLES) {
    const parts = await partitionsOf(db, table);
    if (!parts.some((p) => p.name === 'p_future')) continue;
    const bounds = parts.filter((p) => p.lessThan !== null).map((p) => p.lessThan!);
    // The next month to split off starts at the last bounded partition's end.
    let from = bounds.length ? new Date(`${bounds.at(-1)}T00:00:00Z`) : monthStart(now);
    while (from < last) {
      const to = monthStart(from, 1);
      try {
        await splitFuture(db, table, monthName(from), day(to));
        added.push(`${table}.${monthName(from)}`);
      } catch (err) {
        // Another worker split it first.
        if (!isDuplicatePartition(err)) throw err;
      }
      from = to;
    }
  }
  return added;
}

/**
 * Drops the months that ended before `months` whole months before `now`'s, where nothing
 * kept whole lives (see the file comment); returns the months dropped. 0 keeps all.
 * A month whose drop began in an earlier pass (one of its partitions gone) is finished
 * whatever is asked of it.
 */
export async function dropExpiredPartitions(
  db: Db,
  months: number,
  keepWindowMinutes: number,
  now = new Date(),
): Promise<string[]> {
  if (months <= 0) return [];
  const horizon = monthStart(now, -months);
  const parts = await partitionsOf(db, 'snapshots');
  const present = new Map<PartitionedTable, Set<string>>();
  for (const table of PARTITIONED_TABLES)
    present.set(table, new Set((await partitionsOf(db, table)).map((q) => q.name)));
  const afterLimits = (await firstCapturesAfterLimitChanges(db, horizon)).map((r) => r.takenAt);
  const dropped: string[] = [];
  let from: Date | null = null;
  for (const p of parts) {
    if (p.lessThan === null) break;
    const to = new Date(`${p.lessThan}T00:00:00Z`);
    if (to > horizon) break;
    const begun = PARTITIONED_TABLES.some((t) => !present.get(t)!.has(p.name));
    if (begun || !(await keptCaptureIn(db, from, to, keepWindowMinutes, afterLimits))) {
      await dropMonth(db, p.name, from, to, present);
      dropped.push(p.name);
    }
    from = to;
  }
  return dropped;
}

/**
 * One month's drop, in an order where a pass that stops between two steps leaves nothing a
 * screen trips over, and the next pass finishes it (`snapshots` goes last, so the month is
 * still listed): rows pointing at its captures (one transaction), then its band values and
 * the day sums of its days (summed again from what is left for the days at its edges), then
 * its analyses, then its snapshots — children before parents, so no band value or analysis
 * ever names a capture that is gone. DROP PARTITION is DDL: each commits on its own.
 */
async function dropMonth(
  db: Db,
  name: string,
  from: Date | null,
  to: Date,
  present: Map<PartitionedTable, Set<string>>,
): Promise<void> {
  await deleteDependentsOfCaptures(db, from, to);
  const drop = async (table: PartitionedTable) => {
    if (present.get(table)!.has(name)) await dropPartition(db, table, name);
  };
  // the month's hour summaries (UTC hours lie wholly in a UTC month): before the drop, and
  // again after it for a late capture whose hour was written in between
  await deleteHoursBetween(db, from, to);
  await drop('band_values');
  await deleteHoursBetween(db, from, to);
  await forgetDroppedDays(db, from, to);
  await drop('analyses');
  await drop('snapshots');
}
