/**
 * The trend's events other than alerts and limit-set changes (the limits feature reads those
 * from the audit record): the captures that came from a file upload (a portable
 * instrument's recording).
 */
import { and, asc, eq, gte, lte } from 'drizzle-orm';
import type { Db } from '@turnstone/db/client';
import { analyses, bandValues, snapshots, users } from '@turnstone/db/schema';

/** At most this many limit changes or uploads per trend answer (newest kept). */
export const TREND_EVENT_CAP = 500;

/**
 * The point's captures in the period that came from a file upload, with their value of
 * `bandKey` (uploads not yet analysed have none and are left out), who uploaded and the file.
 * Starts from the point's snapshots by time (uploads are few beside the gateway's).
 */
export async function uploadsOf(db: Db, pointId: number, bandKey: string, from: Date, to: Date) {
  const rows = await db
    .select({
      at: snapshots.takenAt,
      analysisId: analyses.id,
      value: bandValues.value,
      quality: bandValues.qualityVerdict,
      by: users.name,
      fileName: snapshots.fileName,
    })
    .from(snapshots)
    // The partition column beside each id: every lookup reads one month's partition.
    .innerJoin(
      analyses,
      and(eq(analyses.snapshotId, snapshots.id), eq(analyses.takenAt, snapshots.takenAt)),
    )
    .innerJoin(
      bandValues,
      and(
        eq(bandValues.analysisId, analyses.id),
        eq(bandValues.takenAt, analyses.takenAt),
        eq(bandValues.bandKey, bandKey),
      ),
    )
    .leftJoin(users, eq(users.id, snapshots.uploadedBy))
    .where(
      and(
        eq(snapshots.pointId, pointId),
        eq(snapshots.source, 'upload'),
        gte(snapshots.takenAt, from),
        lte(snapshots.takenAt, to),
      ),
    )
    .orderBy(asc(snapshots.takenAt));
  return rows.slice(-TREND_EVENT_CAP);
}
