/**
 * The queries of the monthly partitions of the captures' tables (what to do with them:
 * partitions.ts; the layout comes from migration 0018_time-partitioning).
 */
import { sql } from 'drizzle-orm';
import type { Db } from '@turnstone/db/client';

/** The tables partitioned by month on `taken_at`, children first (the order to drop in). */
export const PARTITIONED_TABLES = ['band_values', 'analyses', 'snapshots'] as const;
export type PartitionedTable = (typeof PARTITIONED_TABLES)[number];

export interface PartitionRow {
  name: string;
  /** The partition's upper bound, exclusive ('YYYY-MM-DD'); null for MAXVALUE. */
  lessThan: string | null;
}

/** A month partition's name (`pYYYYMM`), `p_before` or `p_future`: nothing else is spliced. */
const NAME = /^p(\d{6}|_before|_future)$/;
const DAY = /^\d{4}-\d{2}-\d{2}$/;
function checked(name: string): string {
  if (!NAME.test(name)) throw new Error(`not a partition name of ours: ${name}`);
  return name;
}

/** The table's partitions in order; empty when the table is not partitioned. */
export async function partitionsOf(db: Db, table: PartitionedTable): Promise<PartitionRow[]> {
  const [rows] = (await db.execute(
    sql`SELECT PARTITION_NAME AS name, PARTITION_DESCRIPTION AS bound
          FROM information_schema.PARTITIONS
         WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME = ${table}
           AND PARTITION_NAME IS NOT NULL
         ORDER BY PARTITION_ORDINAL_POSITION`,
  )) as unknown as [{ name: string; bound: string }[]];
  return rows.map((r) => ({
    name: r.name,
    lessThan: r.bound === 'MAXVALUE' ? null : r.bound.replace(/'/g, '').slice(0, 10),
  }));
}

/** Splits the month [from, lessThan) off the front of `p_future` as `name`. */
export async function splitFuture(
  db: Db,
  table: PartitionedTable,
  name: string,
  lessThan: string,
): Promise<void> {
  if (!DAY.test(lessThan)) throw new Error(`not a day: ${lessThan}`);
  await db.execute(
    sql.raw(
      `ALTER TABLE \`${table}\` REORGANIZE PARTITION \`p_future\` INTO (` +
        `PARTITION \`${checked(name)}\` VALUES LESS THAN ('${lessThan}'), ` +
        'PARTITION `p_future` VALUES LESS THAN (MAXVALUE))',
    ),
  );
}

export async function dropPartition(db: Db, table: PartitionedTable, name: string): Promise<void> {
  await db.execute(sql.raw(`ALTER TABLE \`${table}\` DROP PARTITION \`${checked(name)}\``));
}

/**
 * Deletes the rows that point at the captures taken in [from, to) from other tables (jobs,
 * uids, quality notices, pins), in one transaction, before their partitions are dropped:
 * the foreign keys that cascaded these deletions cannot exist on partitioned tables.
 */
export async function deleteDependentsOfCaptures(db: Db, from: Date | null, to: Date) {
  const taken = from ? sql`taken_at >= ${from} AND taken_at < ${to}` : sql`taken_at < ${to}`;
  const ofSnapshots = sql`SELECT id FROM snapshots WHERE ${taken}`;
  const ofAnalyses = sql`SELECT id FROM analyses WHERE ${taken}`;
  await db.transaction(async (tx) => {
    await tx.execute(sql`DELETE FROM jobs WHERE snapshot_id IN (${ofSnapshots})`);
    await tx.execute(sql`DELETE FROM snapshot_uids WHERE snapshot_id IN (${ofSnapshots})`);
    await tx.execute(sql`DELETE FROM quality_notices WHERE snapshot_id IN (${ofSnapshots})`);
    await tx.execute(sql`DELETE FROM quality_notices WHERE analysis_id IN (${ofAnalyses})`);
    await tx.execute(sql`DELETE FROM capture_pins WHERE analysis_id IN (${ofAnalyses})`);
  });
}
