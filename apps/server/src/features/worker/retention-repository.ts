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

/** A DATETIME of a raw query (a UTC string through Drizzle's execute, or a Date). */
function utc(v: unknown): Date {
  return v instanceof Date ? v : new Date(`${String(v).replace(' ', 'T')}Z`);
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
 * the captures a marker keeps whole (within ±`win` minutes of an alert event or finding,
 * pinned…), at most `limit`, ascending, with their analysis (null when it failed or was
 * rejected): the pass leaves out the first captures after limit changes itself.
 */
export async function rawSampleCandidates(
  db: Db,
  cutoff: Date,
  win: number,
  lo: number,
  hi: number,
  limit: number,
): Promise<{ id: number; analysisId: number | null }[]> {
  const rows = await rowsOf(
    db,
    sql`SELECT s.id, a.id AS analysisId
          FROM snapshots s
          LEFT JOIN analyses a ON a.snapshot_id = s.id AND a.taken_at = s.taken_at
         WHERE s.id > ${lo} AND s.id <= ${hi}
           AND s.samples IS NOT NULL
           AND s.received_at < ${cutoff}
           AND s.status IN ('done','failed','rejected')
           AND NOT ${protectedCapture(win)}
         ORDER BY s.id
         LIMIT ${limit}`,
  );
  return rows.map((r) => ({
    id: Number(r.id),
    analysisId: r.analysisId == null ? null : Number(r.analysisId),
  }));
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
 * on `a` (analyses) and `s` (snapshots) that each capture answers from its own markers with
 * index seeks: uploads, pins, captures near an alert event or a finding, an alert's peak,
 * where captures turned suspect. The first capture after a limit change is found from the
 * side of the changes (`limitChanges`, `firstAnalysesFrom`): asked here per capture it was a
 * scan of the point's earlier captures each time.
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
  )`;
}

/**
 * Whether any capture taken in [from, to) (from null: everything before `to`) must stay when
 * its month's partitions are dropped: one not analysed yet, or one kept whole — the list of
 * `protectedCapture` above, asked from the side of the markers (few) rather than of every
 * capture of the month, and erring on the side of keeping: any alert event or finding within
 * ±`win` minutes of the month keeps it, whichever point it names. `firstAfterLimits`: the
 * times of the first captures after limit changes (`firstCapturesAfterLimitChanges`).
 */
export async function keptCaptureIn(
  db: Db,
  from: Date | null,
  to: Date,
  win: number,
  firstAfterLimits: Date[],
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
               WHERE qn.verdict = 'suspect' AND ${within(sql`qn.taken_at`)}) AS suspect`,
  );
  // The first captures after limit changes: found once per pass by the caller.
  if (firstAfterLimits.some((t) => t >= lo && t < to)) return true;
  return Object.values(rows[0] ?? {}).some((v) => Number(v) === 1);
}

/**
 * The captures in (lo, hi] that hold spectra, are older than `wholeCutoff` and are not kept
 * whole by a marker of their own (upload, pin, alert event or finding nearby, alert peak,
 * suspect notice), at most `limit`, ascending; whether each is the first of its bucket or
 * the first after a limit change is worked out by the pass (retention.ts) with
 * `firstAnalysesFrom`. Exported so the storage bench can EXPLAIN it.
 */
export function thinningCandidates(
  { wholeCutoff, win }: Pick<ThinningCutoffs, 'wholeCutoff' | 'win'>,
  lo: number,
  hi: number,
  limit: number,
) {
  return sql`
    SELECT a.id, a.point_id AS pointId, a.taken_at AS takenAt
      FROM analyses a JOIN snapshots s ON s.id = a.snapshot_id AND s.taken_at = a.taken_at
     WHERE a.id > ${lo} AND a.id <= ${hi}
       AND a.taken_at < ${wholeCutoff}
       AND a.spectra_thinned_at IS NULL
       AND (a.spectra IS NOT NULL OR a.accel_spectrum IS NOT NULL
            OR a.velocity_spectrum IS NOT NULL OR a.envelope_spectrum IS NOT NULL
            OR a.order_spectrum IS NOT NULL)
       AND NOT ${protectedCapture(win)}
     ORDER BY a.id
     LIMIT ${limit}`;
}

export interface ThinningCutoffs {
  wholeCutoff: Date;
  dailyCutoff: Date;
  win: number;
}

export interface CaptureRow {
  id: number;
  pointId: number;
  takenAt: Date;
}

export async function thinningCandidateRows(
  db: Db,
  cut: ThinningCutoffs,
  lo: number,
  hi: number,
  limit: number,
): Promise<CaptureRow[]> {
  const rows = await rowsOf(db, thinningCandidates(cut, lo, hi, limit));
  return rows.map((r) => ({
    id: Number(r.id),
    pointId: Number(r.pointId),
    takenAt: utc(r.takenAt),
  }));
}

/**
 * The limit changes of points before `before`: the audit log's `limits.update` and
 * `limits.baseline` entries, and each limit set's last update.
 */
export async function limitChanges(db: Db, before: Date): Promise<{ pointId: number; at: Date }[]> {
  const rows = await rowsOf(
    db,
    sql`SELECT CAST(l.entity_id AS UNSIGNED) AS pointId, l.at FROM audit_log l
         WHERE l.entity = 'point' AND l.action IN ('limits.update', 'limits.baseline')
           AND l.at < ${before}
        UNION
        SELECT ls.point_id, ls.updated_at FROM limit_sets ls
         WHERE ls.point_id IS NOT NULL AND ls.updated_at < ${before}`,
  );
  return rows.map((r) => ({ pointId: Number(r.pointId), at: utc(r.at) }));
}

/** A point's captures taken in [from, to); `to` null: from `from` on. */
export interface TimeSpan {
  pointId: number;
  from: Date;
  to: Date | null;
}

/**
 * The first analysis (by taken_at, then id) of each span that has one: the span's earliest
 * time by one index seek on (point_id, taken_at) with constant bounds (MIN reads one entry;
 * an ORDER BY taken_at, id over a partitioned table sorts every row of the span, which for
 * an open span after a limit change is the rest of the point's history), then the lowest id
 * at that time. Statements of at most 100 spans.
 */
export async function firstAnalysesFrom(db: Db, spans: TimeSpan[]): Promise<CaptureRow[]> {
  const out: CaptureRow[] = [];
  for (let i = 0; i < spans.length; i += 100) {
    const parts = spans.slice(i, i + 100).map(
      (b) =>
        sql`(SELECT id, point_id AS pointId, taken_at AS takenAt FROM analyses
              WHERE point_id = ${b.pointId}
                AND taken_at = (SELECT MIN(taken_at) FROM analyses
                                 WHERE point_id = ${b.pointId} AND taken_at >= ${b.from}
                                   ${b.to ? sql`AND taken_at < ${b.to}` : sql``})
              ORDER BY id LIMIT 1)`,
    );
    const rows = await rowsOf(db, sql.join(parts, sql` UNION ALL `));
    for (const r of rows)
      out.push({ id: Number(r.id), pointId: Number(r.pointId), takenAt: utc(r.takenAt) });
  }
  return out;
}

/**
 * The first capture of its point after each change of its limits made before `before`: one
 * index seek per change (the changes are few; asked per capture, this was a scan of the
 * point's earlier captures for each).
 */
export async function firstCapturesAfterLimitChanges(db: Db, before: Date): Promise<CaptureRow[]> {
  const changes = await limitChanges(db, before);
  return firstAnalysesFrom(
    db,
    changes.map((c) => ({ pointId: c.pointId, from: c.at, to: null })),
  );
}

/**
 * Thins the analyses `rows`: their spectra, and their captures' raw waveforms (a capture is
 * either whole or thinned: a waveform without its spectra is not kept). The rows' time span
 * bounds `taken_at` so MariaDB touches only their months' partitions; each UPDATE is its own
 * short transaction over at most one batch of rows.
 */
export async function clearSpectra(
  db: Db,
  rows: { id: number; takenAt: Date }[],
  now: Date,
): Promise<number> {
  if (rows.length === 0) return 0;
  const list = sql.join(
    rows.map((r) => sql`${r.id}`),
    sql`, `,
  );
  const times = rows.map((r) => r.takenAt.getTime());
  const span = sql`BETWEEN ${new Date(Math.min(...times))} AND ${new Date(Math.max(...times))}`;
  const thinned = await affected(
    db,
    sql`UPDATE analyses
           SET spectra = NULL, accel_spectrum = NULL, velocity_spectrum = NULL,
               envelope_spectrum = NULL, order_spectrum = NULL, spectra_thinned_at = ${now}
         WHERE id IN (${list}) AND taken_at ${span} AND spectra_thinned_at IS NULL`,
  );
  await affected(
    db,
    sql`UPDATE snapshots s JOIN analyses a ON a.snapshot_id = s.id AND s.taken_at = a.taken_at
           SET s.samples = NULL, s.samples_expired_at = CURRENT_TIMESTAMP(3)
         WHERE a.id IN (${list}) AND a.taken_at ${span} AND s.taken_at ${span}
           AND s.samples IS NOT NULL`,
  );
  return thinned;
}
