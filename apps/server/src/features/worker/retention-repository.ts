/** The queries of the retention passes (policy and batching: retention.ts). */
import { and, inArray, isNotNull, lt, sql } from 'drizzle-orm';
import type { Db } from '@turnstone/db/client';
import { snapshots } from '@turnstone/db/schema';

type Row = Record<string, unknown>;
async function rowsOf(db: Db, query: ReturnType<typeof sql>): Promise<Row[]> {
  const [rows] = (await db.execute(query)) as unknown as [Row[]];
  return rows;
}
async function affected(db: Db, query: ReturnType<typeof sql>): Promise<number> {
  const [result] = (await db.execute(query)) as unknown as [{ affectedRows: number }];
  return result.affectedRows;
}

export async function maxSnapshotId(db: Db): Promise<number> {
  const [top] = await rowsOf(db, sql`SELECT COALESCE(MAX(id), 0) AS maxId FROM snapshots`);
  return Number(top?.maxId ?? 0);
}

export async function maxAnalysisId(db: Db): Promise<number> {
  const [top] = await rowsOf(db, sql`SELECT COALESCE(MAX(id), 0) AS maxId FROM analyses`);
  return Number(top?.maxId ?? 0);
}

/** Analysed snapshots in (lo, hi] received before `cutoff` that still hold samples. */
export async function rawSampleCandidates(
  db: Db,
  cutoff: Date,
  lo: number,
  hi: number,
  limit: number,
): Promise<number[]> {
  const rows = await db
    .select({ id: snapshots.id })
    .from(snapshots)
    .where(
      and(
        sql`${snapshots.id} > ${lo} AND ${snapshots.id} <= ${hi}`,
        isNotNull(snapshots.samples),
        lt(snapshots.receivedAt, cutoff),
        sql`${snapshots.status} IN ('done','failed','rejected')`,
      ),
    )
    .orderBy(snapshots.id)
    .limit(limit);
  return rows.map((r) => r.id);
}

export async function clearRawSamples(db: Db, ids: number[]): Promise<number> {
  const [result] = await db
    .update(snapshots)
    .set({ samples: null, samplesExpiredAt: sql`CURRENT_TIMESTAMP(3)` })
    .where(and(inArray(snapshots.id, ids), isNotNull(snapshots.samples)));
  return result.affectedRows;
}

/**
 * The ids in (lo, hi] whose spectra the pass clears, at most `limit`, ascending (exported so
 * the storage bench can EXPLAIN it).
 */
export function thinningCandidates(
  { wholeCutoff, dailyCutoff, win }: ThinningCutoffs,
  lo: number,
  hi: number,
  limit: number,
) {
  return sql`
        SELECT a.id FROM analyses a JOIN snapshots s ON s.id = a.snapshot_id
     WHERE a.id > ${lo} AND a.id <= ${hi}
       AND a.taken_at < ${wholeCutoff}
       AND a.spectra_thinned_at IS NULL
       AND (a.spectra IS NOT NULL OR a.accel_spectrum IS NOT NULL
            OR a.velocity_spectrum IS NOT NULL OR a.envelope_spectrum IS NOT NULL
            OR a.order_spectrum IS NOT NULL)
       AND s.source <> 'upload'
       -- not the first capture of its point in its bucket (hour, or day before dailyCutoff)
       AND EXISTS (
         SELECT 1 FROM analyses b
          WHERE b.point_id = a.point_id
            AND b.taken_at >= IF(a.taken_at < ${dailyCutoff},
                                 TIMESTAMP(DATE(a.taken_at)),
                                 TIMESTAMP(DATE(a.taken_at), MAKETIME(HOUR(a.taken_at), 0, 0)))
            AND (b.taken_at < a.taken_at OR (b.taken_at = a.taken_at AND b.id < a.id)))
       -- alert events of the point (raise, escalation, acknowledgement, clearance)
       AND NOT EXISTS (
         SELECT 1 FROM alerts al JOIN alert_events e ON e.alert_id = al.id
          WHERE al.point_id = a.point_id
            AND e.at BETWEEN a.taken_at - INTERVAL ${win} MINUTE
                         AND a.taken_at + INTERVAL ${win} MINUTE)
       AND NOT EXISTS (
         SELECT 1 FROM alerts al WHERE al.point_id = a.point_id AND al.peak_at = a.taken_at)
       AND NOT EXISTS (
         SELECT 1 FROM findings f
          WHERE f.point_id = a.point_id
            AND f.created_at BETWEEN a.taken_at - INTERVAL ${win} MINUTE
                                 AND a.taken_at + INTERVAL ${win} MINUTE)
       -- the capture where a point's captures turned suspect (unusable ones thin like any other)
       AND NOT EXISTS (
         SELECT 1 FROM quality_notices qn WHERE qn.analysis_id = a.id AND qn.verdict = 'suspect')
       -- the first capture after a change of the point's limits
       AND NOT EXISTS (
         SELECT 1 FROM audit_log l
          WHERE l.entity = 'point' AND l.entity_id = CAST(a.point_id AS CHAR)
            AND l.action IN ('limits.update', 'limits.baseline') AND l.at <= a.taken_at
            AND NOT EXISTS (
              SELECT 1 FROM analyses c
               WHERE c.point_id = a.point_id AND c.taken_at >= l.at
                 AND (c.taken_at < a.taken_at OR (c.taken_at = a.taken_at AND c.id < a.id))))
       AND NOT EXISTS (
         SELECT 1 FROM limit_sets ls
          WHERE ls.point_id = a.point_id AND ls.updated_at <= a.taken_at
            AND NOT EXISTS (
              SELECT 1 FROM analyses c
               WHERE c.point_id = a.point_id AND c.taken_at >= ls.updated_at
                 AND (c.taken_at < a.taken_at OR (c.taken_at = a.taken_at AND c.id < a.id))))
     ORDER BY a.id
     LIMIT ${limit}`;
}

export interface ThinningCutoffs {
  wholeCutoff: Date;
  dailyCutoff: Date;
  win: number;
}

export async function thinningCandidateIds(
  db: Db,
  cut: ThinningCutoffs,
  lo: number,
  hi: number,
  limit: number,
): Promise<number[]> {
  const rows = await rowsOf(db, thinningCandidates(cut, lo, hi, limit));
  return rows.map((r) => Number(r.id));
}

export function clearSpectra(db: Db, ids: number[], now: Date): Promise<number> {
  return affected(
    db,
    sql`UPDATE analyses
           SET spectra = NULL, accel_spectrum = NULL, velocity_spectrum = NULL,
               envelope_spectrum = NULL, order_spectrum = NULL, spectra_thinned_at = ${now}
         WHERE id IN (${sql.join(
           ids.map((id) => sql`${id}`),
           sql`, `,
         )}) AND spectra_thinned_at IS NULL`,
  );
}
