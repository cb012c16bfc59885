import { readStoredSummary, type StoredSummary } from './stored-summary.ts';
import { and, asc, desc, eq, gte, inArray, isNull, lte, ne, or, sql } from 'drizzle-orm';
import type { BandState } from '@turnstone/condition';
import type { Db, Tx } from '@turnstone/db/client';
import { legacySpectrumColumn, type SpectrumKind } from '@turnstone/db/spectra-codec';
import {
  alertEvents,
  alerts,
  analyses,
  areas,
  bandValues,
  bearings,
  findings,
  gears,
  machines,
  points,
  pointStates,
  qualityNotices,
  sites,
  snapshots,
  users,
} from '@turnstone/db/schema';

/** Columns of an analysis the lists show (no spectra). */
const summaryColumns = {
  id: analyses.id,
  snapshotId: analyses.snapshotId,
  pointId: analyses.pointId,
  takenAt: analyses.takenAt,
  accelRmsG: analyses.accelRmsG,
  accelPeakG: analyses.accelPeakG,
  velocityRmsMmS: analyses.velocityRmsMmS,
  displacementPkPkUm: analyses.displacementPkPkUm,
  crestFactor: analyses.crestFactor,
  kurtosis: analyses.kurtosis,
  /** The stored analysis summary: its isoBandHz and accelBandHz label the overall values. */
  summary: analyses.summary,
  speedRpm: analyses.speedRpm,
  speedSource: analyses.speedSource,
  isoZone: analyses.isoZone,
  qualityVerdict: analyses.qualityVerdict,
  bitsUsed: analyses.bitsUsed,
  diagnosis: analyses.diagnosis,
  shaftVectors: analyses.shaftVectors,
  spectraThinnedAt: analyses.spectraThinnedAt,
  /** Why a capture is suspect or unusable (small: a few findings). */
  qualityFindings: analyses.qualityFindings,
};
export type AnalysisSummaryRow = Awaited<ReturnType<typeof listAnalyses>>[number];

export async function machineWithPlace(db: Db, machineId: number) {
  const [row] = await db
    .select({ machine: machines, area: areas, site: sites })
    .from(machines)
    .innerJoin(areas, eq(areas.id, machines.areaId))
    .innerJoin(sites, eq(sites.id, areas.siteId))
    .where(eq(machines.id, machineId));
  return row;
}

export async function machineComponents(db: Db, machineId: number) {
  const [b, g] = await Promise.all([
    db.select().from(bearings).where(eq(bearings.machineId, machineId)).orderBy(asc(bearings.id)),
    db.select().from(gears).where(eq(gears.machineId, machineId)).orderBy(asc(gears.id)),
  ]);
  return { bearings: b, gears: g };
}

export async function machinePoints(db: Db, machineId: number) {
  return db.select().from(points).where(eq(points.machineId, machineId)).orderBy(asc(points.tag));
}

/** The newest analysis of each point (by takenAt). */
export async function latestAnalyses(
  db: Db,
  pointIds: number[],
): Promise<Map<number, AnalysisSummaryRow>> {
  if (pointIds.length === 0) return new Map();
  const rows = await db
    .select(summaryColumns)
    .from(analyses)
    .where(
      and(
        inArray(analyses.pointId, pointIds),
        sql`${analyses.takenAt} = (SELECT MAX(a2.taken_at) FROM analyses a2 WHERE a2.point_id = ${analyses.pointId})`,
      ),
    );
  const out = new Map<number, AnalysisSummaryRow>();
  for (const r of rows) if (!out.has(r.pointId)) out.set(r.pointId, r);
  return out;
}

export async function listAnalyses(
  db: Db,
  pointId: number,
  from: Date | undefined,
  to: Date | undefined,
  limit: number,
) {
  return db
    .select(summaryColumns)
    .from(analyses)
    .where(
      and(
        eq(analyses.pointId, pointId),
        from ? gte(analyses.takenAt, from) : undefined,
        to ? lte(analyses.takenAt, to) : undefined,
      ),
    )
    .orderBy(desc(analyses.takenAt), desc(analyses.id))
    .limit(limit);
}

/** The newest analysis of a point that has diagnosis hints stored (null when none has). */
export async function latestDiagnosis(db: Db, pointId: number) {
  const [row] = await db
    .select({ id: analyses.id, takenAt: analyses.takenAt, diagnosis: analyses.diagnosis })
    .from(analyses)
    .where(eq(analyses.pointId, pointId))
    .orderBy(desc(analyses.takenAt), desc(analyses.id))
    .limit(1);
  return row?.diagnosis ? row : null;
}

/** The last `limit` values of one band, newest first (served by band_values_trend_idx). */
export async function recentBandValues(db: Db, pointId: number, bandKey: string, limit: number) {
  return db
    .select({ takenAt: bandValues.takenAt, value: bandValues.value })
    .from(bandValues)
    .where(and(eq(bandValues.pointId, pointId), eq(bandValues.bandKey, bandKey)))
    .orderBy(desc(bandValues.takenAt))
    .limit(limit);
}

/**
 * The remembered evaluation state of each band of a point (its baseline), by band key; a band
 * before its first value is absent. What `levelsInForce` needs to decide the levels the
 * worker uses.
 */
export async function bandStatesOf(db: Db | Tx, pointId: number) {
  const [row] = await db
    .select({ state: pointStates.state })
    .from(pointStates)
    .where(eq(pointStates.pointId, pointId))
    .limit(1);
  const tracks = (row?.state ?? {}) as Record<string, { band?: BandState } | undefined>;
  const out = new Map<string, BandState>();
  for (const [key, track] of Object.entries(tracks)) if (track?.band) out.set(key, track.band);
  return out;
}

/** The overall-value bands (isoBandHz, accelBandHz) recorded in analyses' summaries. */
export async function analysisBandsOf(
  db: Db,
  ids: readonly number[],
): Promise<Map<number, Pick<StoredSummary, 'isoBandHz' | 'accelBandHz'>>> {
  const out = new Map<number, Pick<StoredSummary, 'isoBandHz' | 'accelBandHz'>>();
  const unique = [...new Set(ids)];
  for (let i = 0; i < unique.length; i += 1000) {
    const rows = await db
      .select({ id: analyses.id, summary: analyses.summary })
      .from(analyses)
      .where(inArray(analyses.id, unique.slice(i, i + 1000)));
    for (const r of rows) {
      const summary = readStoredSummary(r.summary);
      out.set(r.id, { isoBandHz: summary.isoBandHz, accelBandHz: summary.accelBandHz });
    }
  }
  return out;
}

export async function alertEventsOf(
  db: Db,
  pointId: number,
  bandKey: string,
  from: Date,
  to: Date,
) {
  return db
    .select({
      at: alertEvents.at,
      kind: alertEvents.kind,
      level: alertEvents.level,
      alertId: alertEvents.alertId,
      by: users.name,
      note: alertEvents.note,
    })
    .from(alertEvents)
    .innerJoin(alerts, eq(alerts.id, alertEvents.alertId))
    .leftJoin(users, eq(users.id, alertEvents.userId))
    .where(
      and(
        eq(alerts.pointId, pointId),
        eq(alerts.bandKey, bandKey),
        gte(alertEvents.at, from),
        lte(alertEvents.at, to),
      ),
    )
    .orderBy(asc(alertEvents.at));
}

export async function findingsOf(db: Db, pointId: number, bandKey: string, from: Date, to: Date) {
  return db
    .select({
      createdAt: findings.createdAt,
      title: findings.title,
      workOrderRef: findings.workOrderRef,
      state: findings.state,
    })
    .from(findings)
    .where(
      and(
        eq(findings.pointId, pointId),
        or(isNull(findings.bandKey), eq(findings.bandKey, bandKey)),
        gte(findings.createdAt, from),
        lte(findings.createdAt, to),
      ),
    )
    .orderBy(asc(findings.createdAt));
}

/** Highest open alert level per point of the list. */
export async function openAlertLevels(db: Db, pointIds: number[]) {
  if (pointIds.length === 0) return new Map<number, 'alert' | 'danger'>();
  const rows = await db
    .select({ pointId: alerts.pointId, level: alerts.level })
    .from(alerts)
    .where(
      and(inArray(alerts.pointId, pointIds), inArray(alerts.state, ['raised', 'acknowledged'])),
    );
  const out = new Map<number, 'alert' | 'danger'>();
  for (const r of rows) if (out.get(r.pointId) !== 'danger') out.set(r.pointId, r.level);
  return out;
}

export async function openQualityPoints(db: Db, pointIds: number[], since: Date) {
  if (pointIds.length === 0) return new Set<number>();
  const rows = await db
    .selectDistinct({ pointId: qualityNotices.pointId })
    .from(qualityNotices)
    .where(
      and(
        inArray(qualityNotices.pointId, pointIds),
        isNull(qualityNotices.reviewedAt),
        gte(qualityNotices.takenAt, since),
      ),
    );
  return new Set(rows.map((r) => r.pointId));
}

export async function analysisRow(db: Db, analysisId: number) {
  const [row] = await db.select().from(analyses).where(eq(analyses.id, analysisId));
  return row;
}

/**
 * The stored spectra of the last `limit` analyses of a point, newest first: the compact
 * BLOB, and for rows written before it the old float32 column of `kind` as `legacy`
 * (read either with `readSpectrum`).
 */
export async function recentSpectra(db: Db, pointId: number, kind: SpectrumKind, limit: number) {
  const legacy = legacySpectrumColumn[kind];
  return db
    .select({
      id: analyses.id,
      takenAt: analyses.takenAt,
      speedRpm: analyses.speedRpm,
      summary: analyses.summary,
      spectra: analyses.spectra,
      legacy: analyses[legacy],
    })
    .from(analyses)
    .where(and(eq(analyses.pointId, pointId), isNull(analyses.spectraThinnedAt)))
    .orderBy(desc(analyses.takenAt), desc(analyses.id))
    .limit(limit);
}

/**
 * The capture of a point nearest in time to `takenAt` that still has its spectra (retention
 * thinning left it whole), other than `exceptId`; null when there is none.
 */
export async function nearestWholeAnalysis(
  db: Db,
  pointId: number,
  takenAt: Date,
  exceptId: number,
): Promise<{ id: number; takenAt: Date } | null> {
  const base = and(
    eq(analyses.pointId, pointId),
    isNull(analyses.spectraThinnedAt),
    ne(analyses.id, exceptId),
  );
  const cols = { id: analyses.id, takenAt: analyses.takenAt };
  const [before] = await db
    .select(cols)
    .from(analyses)
    .where(and(base, lte(analyses.takenAt, takenAt)))
    .orderBy(desc(analyses.takenAt), desc(analyses.id))
    .limit(1);
  const [after] = await db
    .select(cols)
    .from(analyses)
    .where(and(base, gte(analyses.takenAt, takenAt)))
    .orderBy(asc(analyses.takenAt), asc(analyses.id))
    .limit(1);
  if (!before || !after) return before ?? after ?? null;
  const t = takenAt.getTime();
  return t - before.takenAt.getTime() <= after.takenAt.getTime() - t ? before : after;
}

export async function snapshotRow(db: Db, snapshotId: number) {
  const [row] = await db.select().from(snapshots).where(eq(snapshots.id, snapshotId));
  return row;
}

/** A snapshot's status, for the upload screen's poll. */
export async function snapshotStatusRow(db: Db, snapshotId: number) {
  const [row] = await db
    .select({
      id: snapshots.id,
      pointId: snapshots.pointId,
      source: snapshots.source,
      status: snapshots.status,
      statusReason: snapshots.statusReason,
      takenAt: snapshots.takenAt,
      receivedAt: snapshots.receivedAt,
      sampleRateHz: snapshots.sampleRateHz,
      sampleCount: snapshots.sampleCount,
      fileName: snapshots.fileName,
    })
    .from(snapshots)
    .where(eq(snapshots.id, snapshotId));
  return row;
}

/** The analysis of a snapshot (summary columns and quality findings), if it has one. */
export async function analysisOfSnapshot(db: Db, snapshotId: number) {
  const [row] = await db
    .select(summaryColumns)
    .from(analyses)
    .where(eq(analyses.snapshotId, snapshotId));
  return row;
}
