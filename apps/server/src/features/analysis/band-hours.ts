/**
 * Fills `band_value_hours` for a database that held band values before the table existed
 * (band-hours-repository.ts keeps it from then on). Run at start, before the server listens
 * and before its worker runs, like the day sums: a point at a time, each in one transaction
 * that first takes the point's condition-state lock, so a worker of another process writing
 * the same point waits and its own refresh comes after. A point is filled whole or not at
 * all, so a start that stops halfway fills the rest next time.
 *
 * At start rather than in the migration: the summary statement has one home (the
 * repository's), a large plant's year is filled in bounded per-point transactions instead of
 * one statement over every band value, and it is the band_day_sums precedent.
 */
import type { Db } from '@turnstone/db/client';
import { lockPointState, pointsWithoutHours, rebuildPointHours } from './band-hours-repository.ts';

export async function fillMissingBandHours(db: Db, log: (m: string) => void): Promise<void> {
  const ids = await pointsWithoutHours(db);
  if (ids.length === 0) return;
  const t0 = Date.now();
  for (const pointId of ids)
    await db.transaction(async (tx) => {
      await lockPointState(tx, pointId);
      await rebuildPointHours(tx, pointId);
    });
  log(`Summed the band values of ${ids.length} points by hour in ${Date.now() - t0} ms.`);
}
