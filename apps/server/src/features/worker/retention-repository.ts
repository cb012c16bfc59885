/** The queries of the retention passes (policy and batching: retention.ts). */
import { and, inArray, isNotNull, sql } from 'drizzle-orm';
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

/**
 * Analysed snapshots in (lo, hi] received before `cutoff` that still hold samples, except
 * the captures kept whole (within ±`win` minutes of an alert event or finding, pinned…).
 */
export async function rawSampleCandidates(
  db: Db,
  cutoff: Date,
  win: number,
  lo: number,
  hi: number,
  limit: number,
): Promise<number[]> {
  const rows = await rowsOf(
    db,
    sql`SELECT s.id FROM snapshots s LEFT JOIN analyses a ON a.snapshot_id = s.id
         WHERE s.id > ${lo} AND s.id <= ${hi}
           AND s.samples IS NOT NULL
           AND s.received_at < ${cutoff}
           AND s.status IN ('done','failed','rejected')
           AND NOT ${protectedCapture(win)}
         ORDER BY s.id
         LIMIT ${limit}`,
  );
  return rows.map((r) => Number(r.id));
}

export async function clearRawSamples(db: Db, ids: number[]): Promise<number> {
  const [result] = await db
    .update(snapshots)
    .set({ samples: null, samplesExpiredAt: sql`CURRENT_TIMESTAMP(3)` })
    .where(and(inArray(snapshots.id, ids), isNotNull(snapshots.samples)));
  return result.affectedRows;
}

/**
 * Captures kept whole whatever their age (retention.ts's comment lists them), as a condition
 * on `a` (analyses) and `s` (snapshots): uploads, pins, captures near an alert event or a
 * finding, an alert's peak, where captures turned suspect, the first after a limit change.
 */
function protectedCapture(win: number) {
  return sql`(
    s.source = 'upload'
    OR EXISTS (SELECT 1 FROM capture_pins p WHERE p.analysis_id = a.id)
    -- alert events of the point (raise, escalation, acknowledgement, clearance)
    OR EXISTS (
      SELECT 1 FROM alerts al JOIN alert_events e ON e.alert_id = al.id
       WHERE al.point_id = a.point_id
         AND e.at BETWEEN a.taken_at - INTERVAL ${win} MINUTE
                      AND a.taken_at + INTERVAL ${win} MINUTE)
    OR EXISTS (
      SELECT 1 FROM alerts al WHERE al.point_id = a.point_id AND al.peak_at = a.taken_at)
    OR EXISTS (
      SELECT 1 FROM findings f
       WHERE f.point_id = a.point_id
         AND f.created_at BETWEEN a.taken_at - INTERVAL ${win} MINUTE
                              AND a.taken_at + INTERVAL ${win} MINUTE)
    -- the capture where a point's captures turned suspect (unusable ones thin like any other)
    OR EXISTS (
      SELECT 1 FROM quality_notices qn WHERE qn.analysis_id = a.id AND qn.verdict = 'suspect')
    -- the first capture after a change of the point's limits
    OR EXISTS (
      SELECT 1 FROM audit_log l
       WHERE l.entity = 'point' AND l.entity_id = CAST(a.point_id AS CHAR)
         AND l.action IN ('limits.update', 'limits.baseline') AND l.at <= a.taken_at
         AND NOT EXISTS (
           SELECT 1 FROM analyses c
            WHERE c.point_id = a.point_id AND c.taken_at >= l.at
              AND (c.taken_at < a.taken_at OR (c.taken_at = a.taken_at AND c.id < a.id))))
    OR EXISTS (
      SELECT 1 FROM limit_sets ls
       WHERE ls.point_id = a.point_id AND ls.updated_at <= a.taken_at
         AND NOT EXISTS (
           SELECT 1 FROM analyses c
            WHERE c.point_id = a.point_id AND c.taken_at >= ls.updated_at
              AND (c.taken_at < a.taken_at OR (c.taken_at = a.taken_at AND c.id < a.id))))
  )`;
}

/**
 * Whether any capture taken in [from, to) (from null: everything before `to`) must stay when
 * its month's partitions are dropped: one not analysed yet, or one kept whole — the list of
 * `protectedCapture` above, asked from the side of the markers (few) rather than of every
 * capture of the month, and erring on the side of keeping: any alert event or finding within
 * ±`win` minutes of the month keeps it, whichever point it names.
 */
export async function keptCaptureIn(
  db: Db,
  from: Date | null,
  to: Date,
  win: number,
): Promise<boolean> {
  const lo = from ?? new Date(0);
  const within = (col: ReturnType<typeof sql>) => sql`${col} >= ${lo} AND ${col} < ${to}`;
  const near = (col: ReturnType<typeof sql>) =>
    sql`${col} >= ${lo} - INTERVAL ${win} MINUTE AND ${col} < ${to} + INTERVAL ${win} MINUTE`;
  const rows = await rowsOf(
    db,
    sql`SELECT
      EXISTS (SELECT 1 FROM snapshots s WHERE ${within(sql`s.taken_at`)}
                 AND (s.source = 'upload' OR s.status = 'queued')) AS uploadsOrQueued,
      EXISTS (SELECT 1 FROM capture_pins p JOIN analyses a ON a.id = p.analysis_id
               WHERE ${within(sql`a.taken_at`)}) AS pinned,
      EXISTS (SELECT 1 FROM alert_events e WHERE ${near(sql`e.at`)}) AS alertEvents,
      EXISTS (SELECT 1 FROM alerts al WHERE ${within(sql`al.peak_at`)}) AS alertPeaks,
      EXISTS (SELECT 1 FROM findings f WHERE ${near(sql`f.created_at`)}) AS findings,
      EXISTS (SELECT 1 FROM quality_notices qn
               WHERE qn.verdict = 'suspect' AND ${within(sql`qn.taken_at`)}) AS suspect,
      EXISTS (
        SELECT 1 FROM (
          SELECT (SELECT MIN(c.taken_at) FROM analyses c
                   WHERE c.point_id = x.point_id AND c.taken_at >= x.at) AS first_after
            FROM (SELECT CAST(l.entity_id AS UNSIGNED) AS point_id, l.at FROM audit_log l
                   WHERE l.entity = 'point' AND l.action IN ('limits.update', 'limits.baseline')
                     AND l.at < ${to}
                  UNION ALL
                  SELECT ls.point_id, ls.updated_at FROM limit_sets ls
                   WHERE ls.updated_at < ${to}) x) f
         WHERE ${within(sql`f.first_after`)}) AS firstAfterLimits`,
  );
  return Object.values(rows[0] ?? {}).some((v) => Number(v) === 1);
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
       -- not the first capture of its point in its bucket (hour, or day before dailyCutoff)
       AND EXISTS (
         SELECT 1 FROM analyses b
          WHERE b.point_id = a.point_id
            AND b.taken_at >= IF(a.taken_at < ${dailyCutoff},
                                 TIMESTAMP(DATE(a.taken_at)),
                                 TIMESTAMP(DATE(a.taken_at), MAKETIME(HOUR(a.taken_at), 0, 0)))
            AND (b.taken_at < a.taken_at OR (b.taken_at = a.taken_at AND b.id < a.id)))
       AND NOT ${protectedCapture(win)}
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

/**
 * Thins the analyses `ids`: their spectra, and their captures' raw waveforms (a capture is
 * either whole or thinned: a waveform without its spectra is not kept).
 */
export async function clearSpectra(db: Db, ids: number[], now: Date): Promise<number> {
  const list = sql.join(
    ids.map((id) => sql`${id}`),
    sql`, `,
  );
  const thinned = await affected(
    db,
    sql`UPDATE analyses
           SET spectra = NULL, accel_spectrum = NULL, velocity_spectrum = NULL,
               envelope_spectrum = NULL, order_spectrum = NULL, spectra_thinned_at = ${now}
         WHERE id IN (${list}) AND spectra_thinned_at IS NULL`,
  );
  await affected(
    db,
    sql`UPDATE snapshots s JOIN analyses a ON a.snapshot_id = s.id
           SET s.samples = NULL, s.samples_expired_at = CURRENT_TIMESTAMP(3)
         WHERE a.id IN (${list}) AND s.samples IS NOT NULL`,
  );
  return thinned;
}
