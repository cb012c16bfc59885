import { and, eq, getTableColumns } from 'drizzle-orm';
import type { Db, DbHandle } from '@turnstone/db/client';
import { gateways, points, snapshotUids, snapshots } from '@turnstone/db/schema';

export async function gatewayByPrefix(db: Db, prefix: string) {
  const [g] = await db.select().from(gateways).where(eq(gateways.keyPrefix, prefix)).limit(1);
  return g;
}

export async function touchGateway(db: Db, id: number): Promise<void> {
  await db.update(gateways).set({ lastSeenAt: new Date() }).where(eq(gateways.id, id));
}

/** The site's point with this tag (tags are unique per site), or undefined. */
export async function pointOfSite(db: Db, siteId: number, tag: string) {
  const [p] = await db
    .select({ id: points.id })
    .from(points)
    .where(and(eq(points.siteId, siteId), eq(points.tag, tag)))
    .limit(1);
  return p;
}

/**
 * The snapshot a sender (a gateway, or null for uploads) stored under `uid`: uids are unique
 * per sender in `snapshot_uids` (the partitioned `snapshots` cannot hold that unique key).
 */
export async function snapshotByUid(db: Db, gatewayId: number | null, uid: string) {
  const [s] = await db
    .select({ id: snapshots.id, contentHash: snapshots.contentHash, takenAt: snapshots.takenAt })
    .from(snapshotUids)
    .innerJoin(snapshots, eq(snapshots.id, snapshotUids.snapshotId))
    .where(and(eq(snapshotUids.senderId, gatewayId ?? 0), eq(snapshotUids.uid, uid)))
    .limit(1);
  return s;
}

export type NewSnapshot = typeof snapshots.$inferInsert;

const snapshotColumns = getTableColumns(snapshots);
/** The columns ingest and uploads write; the others keep their defaults. */
const INSERT_KEYS = [
  'uid',
  'pointId',
  'gatewayId',
  'source',
  'takenAt',
  'sampleRateHz',
  'sampleCount',
  'encoding',
  'adcBits',
  'fullScaleV',
  'sensitivityMvPerG',
  'speedRpm',
  'tach',
  'samples',
  'samplesCodec',
  'contentHash',
  'status',
  'uploadedBy',
  'fileName',
] as const satisfies readonly (keyof typeof snapshotColumns)[];
export type SnapshotRow = { [K in (typeof INSERT_KEYS)[number]]: NewSnapshot[K] };

/**
 * One transaction in one round trip (the batch pool runs several statements per query):
 * the snapshot, its uid (unique per sender: a repeat fails here with a duplicate key), then
 * its job. Column names come from the Drizzle schema and values go through mysql2's
 * placeholders.
 *
 * The snapshot is inserted from its point's row read LOCK IN SHARE MODE, as the foreign key
 * to `points` did before `snapshots` was partitioned: a point being deleted (setup locks it
 * FOR UPDATE, then counts its captures) cannot gain a capture meanwhile, and a point already
 * deleted inserts nothing (then neither uid nor job is written, and the caller is told).
 */
const INSERT_WITH_JOB = [
  'START TRANSACTION',
  `INSERT INTO snapshots (${INSERT_KEYS.map((k) => `\`${snapshotColumns[k].name}\``).join(', ')})
     SELECT ${INSERT_KEYS.map(() => '?').join(', ')} FROM points WHERE id = ? LOCK IN SHARE MODE`,
  'SET @snapshot_id = IF(ROW_COUNT() = 1, LAST_INSERT_ID(), NULL)',
  `INSERT INTO snapshot_uids (sender_id, uid, snapshot_id)
     SELECT ?, ?, @snapshot_id FROM DUAL WHERE @snapshot_id IS NOT NULL`,
  `INSERT INTO jobs (kind, snapshot_id, payload, run_after)
     SELECT 'analyze', @snapshot_id, '{}', CURRENT_TIMESTAMP(3) FROM DUAL
      WHERE @snapshot_id IS NOT NULL`,
  'SELECT @snapshot_id AS snapshotId',
  'COMMIT',
].join(';\n');

/**
 * The snapshot and its analysis job, in one transaction: both or neither; null when the
 * point no longer exists (nothing written). A failing
 * statement stops the batch with the transaction still open, so it is rolled back on the
 * same connection before the connection goes back to the pool (destroyed if that fails).
 */
export function insertSnapshotWithJob(
  handle: DbHandle,
  row: SnapshotRow,
  /**
   * A frozen server never answers: past this the driver closes the connection (the server
   * then rolls back whatever did not commit) and the caller gets PROTOCOL_SEQUENCE_TIMEOUT.
   */
  timeoutMs?: number,
): Promise<number | null> {
  const values: unknown[] = INSERT_KEYS.map((k) => {
    const v = row[k];
    // As Drizzle does: null stays NULL, anything else is mapped by its column type.
    return v === null || v === undefined ? null : snapshotColumns[k].mapToDriverValue(v);
  });
  values.push(row.pointId, row.gatewayId ?? 0, row.uid);
  return new Promise((resolve, reject) => {
    handle.batchPool.getConnection((connErr, conn) => {
      if (connErr) return reject(connErr);
      conn.query({ sql: INSERT_WITH_JOB, values, timeout: timeoutMs }, (err, results) => {
        if (!err) {
          conn.release();
          const [selected] = (results as unknown[])[5] as { snapshotId: number | string | null }[];
          return resolve(selected?.snapshotId == null ? null : Number(selected.snapshotId));
        }
        // A timed-out query has closed its connection already (fatal): nothing to roll back.
        if ((err as { fatal?: boolean }).fatal) {
          conn.destroy();
          return reject(err);
        }
        conn.query('ROLLBACK', (rollbackErr) => {
          if (rollbackErr) conn.destroy();
          else conn.release();
          reject(err);
        });
      });
    });
  });
}
