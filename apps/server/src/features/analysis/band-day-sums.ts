/**
 * The day sums a batch of band values adds (band-day-sums-repository.ts): usable values
 * only, keyed by point, band and the local day of the point's site.
 */
import { localDate } from '@turnstone/contracts/dates';
import type { Db, Tx } from '@turnstone/db/client';
import {
  pointsOfMachine,
  pointsOfSite,
  rebuildBandDaySums,
  resumDaysOfDroppedSpan,
  sitesWithoutDaySums,
  sitesWithZones,
  type BandDaySum,
} from './band-day-sums-repository.ts';

export interface DayValue {
  pointId: number;
  timeZone: string;
  bandKey: string;
  takenAt: Date;
  value: number;
  qualityVerdict: 'ok' | 'suspect' | 'unusable';
}

const known = new Map<string, boolean>();
/**
 * The zone to sum a site's days in: its own, or UTC for a name this runtime does not know
 * (sites are validated when saved, but a capture must never fail over a stored name).
 */
export function dayZone(timeZone: string): string {
  let ok = known.get(timeZone);
  if (ok === undefined) {
    try {
      localDate(0, timeZone);
      ok = true;
    } catch {
      ok = false;
    }
    known.set(timeZone, ok);
  }
  return ok ? timeZone : 'UTC';
}

export function daySumsOf(values: DayValue[]): BandDaySum[] {
  const out = new Map<string, BandDaySum>();
  const dayOf = new Map<string, string>();
  for (const v of values) {
    if (v.qualityVerdict === 'unusable') continue;
    const ms = v.takenAt.getTime();
    const at = `${v.timeZone}|${ms}`;
    let day = dayOf.get(at);
    if (day === undefined) dayOf.set(at, (day = localDate(ms, dayZone(v.timeZone))));
    const key = `${v.pointId}|${v.bandKey}|${day}`;
    const sum = out.get(key);
    if (sum) {
      sum.n++;
      sum.sumValue += v.value;
      sum.sumTakenMs += ms;
    } else
      out.set(key, {
        pointId: v.pointId,
        bandKey: v.bandKey,
        day,
        n: 1,
        sumValue: v.value,
        sumTakenMs: ms,
      });
  }
  return [...out.values()];
}

/**
 * Fills the day sums of every site whose band values have none (a database upgraded from
 * before `band_day_sums`); run at start, before the worker adds to them.
 */
export async function fillMissingBandDaySums(db: Db, log: (m: string) => void): Promise<void> {
  for (const s of await sitesWithoutDaySums(db)) {
    const t0 = Date.now();
    await db.transaction(async (tx) =>
      rebuildBandDaySums(tx, await pointsOfSite(tx, s.siteId), dayZone(s.timeZone)),
    );
    log(`Summed the band values of site ${s.siteId} by local day in ${Date.now() - t0} ms.`);
  }
}

/** After a site's time zone changed, in the same transaction: its points' days, again. */
export async function resumSiteDays(tx: Tx, siteId: number, timeZone: string): Promise<void> {
  await rebuildBandDaySums(tx, await pointsOfSite(tx, siteId), dayZone(timeZone));
}

/** After a machine moved to a site of zone `timeZone`, in the same transaction. */
export async function resumMachineDays(tx: Tx, machineId: number, timeZone: string): Promise<void> {
  await rebuildBandDaySums(tx, await pointsOfMachine(tx, machineId), dayZone(timeZone));
}

/**
 * After the retention pass dropped the band values taken in [from, to) (a month past the
 * capture horizon; from null: everything before `to`): each site's local days that met the
 * span lose their sums, and the days at its edges keep those of their values left.
 */
export async function forgetDroppedDays(db: Db, from: Date | null, to: Date): Promise<void> {
  for (const s of await sitesWithZones(db)) {
    const zone = dayZone(s.timeZone);
    await resumDaysOfDroppedSpan(db, await pointsOfSite(db, s.siteId), zone, {
      from,
      to,
      first: from ? localDate(from.getTime(), zone) : null,
      last: localDate(to.getTime() - 1, zone),
    });
  }
}
