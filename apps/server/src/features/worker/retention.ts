import { and, isNotNull, lt, sql } from 'drizzle-orm';
import type { Db } from '@turnstone/db/client';
import { snapshots } from '@turnstone/db/schema';

/**
 * Drops raw waveforms older than `days` (received time); analyses, spectra and trends stay.
 * Only analysed snapshots lose samples, so nothing still queued is cut. 0 keeps all.
 */
export async function expireRawSamples(db: Db, days: number, now = new Date()): Promise<number> {
  if (days <= 0) return 0;
  const cutoff = new Date(now.getTime() - days * 86_400_000);
  const [result] = await db
    .update(snapshots)
    .set({ samples: null, samplesExpiredAt: sql`CURRENT_TIMESTAMP(3)` })
    .where(
      and(
        isNotNull(snapshots.samples),
        lt(snapshots.receivedAt, cutoff),
        sql`${snapshots.status} IN ('done','failed','rejected')`,
      ),
    );
  return result.affectedRows;
}
