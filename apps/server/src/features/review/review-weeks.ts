/**
 * The weeks of the review in each site's own time zone: "this week" is the seven local days
 * ending with `weekEnding`, "last week" the seven before, and the forecast reads the local
 * days of the six weeks before the end. The instants come from the one date home
 * (`@turnstone/contracts/dates`); captures are summed into their site's local days as they
 * are written (`band_day_sums`).
 */
import { addDays, dayStart } from '@turnstone/contracts/dates';

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
