/**
 * The weeks of the review in each site's own time zone: "this week" is the seven local days
 * ending with `weekEnding`, "last week" the seven before, and the forecast reads the local
 * days of the six weeks before the end. The instants come from the one date home
 * (`@turnstone/contracts/dates`); the database groups captures into local days with each
 * site's UTC offsets over the window (`localDaySql`).
 */
import { sql, type SQL } from 'drizzle-orm';
import { addDays, dayStart, offsetSegments } from '@turnstone/contracts/dates';

export interface SiteWeek {
  siteId: number;
  siteCode: string;
  timeZone: string;
  /** Local dates, YYYY-MM-DD (inclusive). */
  thisFirstDay: string;
  lastFirstDay: string;
  lookbackFirstDay: string;
  weekEnding: string;
  /** Instants (epoch ms); `thisTo` is exclusive. */
  lookbackFrom: number;
  lastFrom: number;
  thisFrom: number;
  thisTo: number;
}

export function siteWeek(
  site: { id: number; code: string; timeZone: string },
  weekEnding: string,
  lookbackDays: number,
): SiteWeek {
  const tz = site.timeZone;
  const thisFirstDay = addDays(weekEnding, -6);
  const lastFirstDay = addDays(weekEnding, -13);
  const lookbackFirstDay = addDays(weekEnding, 1 - lookbackDays);
  return {
    siteId: site.id,
    siteCode: site.code,
    timeZone: tz,
    thisFirstDay,
    lastFirstDay,
    lookbackFirstDay,
    weekEnding,
    lookbackFrom: dayStart(lookbackFirstDay, tz),
    lastFrom: dayStart(lastFirstDay, tz),
    thisFrom: dayStart(thisFirstDay, tz),
    thisTo: dayStart(addDays(weekEnding, 1), tz),
  };
}

/** Which week a site's local day falls in. */
export function weekOfDay(w: SiteWeek, day: string): 'this' | 'last' | null {
  if (day >= w.thisFirstDay && day <= w.weekEnding) return 'this';
  if (day >= w.lastFirstDay && day < w.thisFirstDay) return 'last';
  return null;
}

/**
 * SQL for the local calendar day (`YYYY-MM-DD`) of `takenAt` at the site `siteId`: the UTC
 * time shifted by the site's offset in force at that instant (a CASE over the clock changes
 * within [from, to), so no time zone tables are needed in the database).
 */
export function localDaySql(weeks: SiteWeek[], siteId: SQL, takenAt: SQL): SQL {
  const from = Math.min(...weeks.map((w) => w.lookbackFrom));
  const to = Math.max(...weeks.map((w) => w.thisTo));
  const offsetOf = (w: SiteWeek): SQL => {
    const segs = offsetSegments(w.timeZone, from, to);
    if (segs.length === 1) return sql`${segs[0]!.offset}`;
    const cases = segs
      .slice(0, -1)
      .map((s) => sql`WHEN ${takenAt} < ${new Date(s.until)} THEN ${s.offset}`);
    return sql`CASE ${sql.join(cases, sql` `)} ELSE ${segs.at(-1)!.offset} END`;
  };
  const bySite = weeks.map((w) => sql`WHEN ${w.siteId} THEN ${offsetOf(w)}`);
  return sql`DATE_FORMAT(DATE_ADD(${takenAt}, INTERVAL (CASE ${siteId} ${sql.join(bySite, sql` `)} ELSE 0 END) MINUTE), '%Y-%m-%d')`;
}
