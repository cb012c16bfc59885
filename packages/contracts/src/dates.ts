/**
 * The one home of dates and weeks, shared by the server (review, CSV, mail) and the web app.
 *
 * One format everywhere people read a date: `2026-11-27` for a day and `2026-11-27 14:05` for
 * a time (ISO 8601's calendar date and 24-hour clock, space-separated as ISO 8601-1:2019 allows
 * by agreement), in the site's time zone, with the zone named beside it where it matters.
 * Files (CSV) carry full ISO 8601 instants (`2026-11-27T14:05:00.000Z`) and calendar dates.
 *
 * A site's days and weeks are its local calendar days (IANA time zone, the tz database as the
 * runtime's Intl carries it): a day starts at local midnight — or at the first instant that
 * exists locally when a clock change skips midnight. Weeks run Monday to Sunday (ISO 8601).
 */

const DAY_MS = 86_400_000;
const formatters = new Map<string, Intl.DateTimeFormat>();

function formatterOf(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-CA', {
      timeZone,
      year: 'numeric',
      month: '2-digit',
      day: '2-digit',
      hour: '2-digit',
      minute: '2-digit',
      second: '2-digit',
      hourCycle: 'h23',
    });
    formatters.set(timeZone, f);
  }
  return f;
}

interface LocalParts {
  year: number;
  month: number;
  day: number;
  hour: number;
  minute: number;
  second: number;
}

/** The wall-clock reading of instant `ms` in `timeZone`. */
export function localParts(ms: number, timeZone: string): LocalParts {
  const out: Record<string, number> = {};
  for (const p of formatterOf(timeZone).formatToParts(ms))
    if (p.type !== 'literal') out[p.type] = Number(p.value);
  return {
    year: out.year!,
    month: out.month!,
    day: out.day!,
    hour: out.hour! % 24,
    minute: out.minute!,
    second: out.second!,
  };
}

const pad = (n: number, w = 2) => String(n).padStart(w, '0');
const dateOf = (p: LocalParts) => `${pad(p.year, 4)}-${pad(p.month)}-${pad(p.day)}`;

/** The calendar date (`YYYY-MM-DD`) of instant `ms` in `timeZone`. */
export function localDate(ms: number, timeZone: string): string {
  return dateOf(localParts(ms, timeZone));
}

/** Minutes the zone's clock is ahead of UTC at instant `ms` (London in summer: 60). */
export function offsetMinutes(ms: number, timeZone: string): number {
  const p = localParts(ms, timeZone);
  const wall = Date.UTC(p.year, p.month - 1, p.day, p.hour, p.minute, p.second);
  return Math.round((wall - Math.floor(ms / 1000) * 1000) / 60_000);
}

/** The date `days` after a `YYYY-MM-DD` date. */
export function addDays(date: string, days: number): string {
  const [y, m, d] = date.split('-').map(Number);
  return new Date(Date.UTC(y!, m! - 1, d! + days)).toISOString().slice(0, 10);
}

/**
 * The first instant (epoch ms, to the minute) of `date` in `timeZone`: local midnight, or the
 * first local time that exists on that day when a clock change skips midnight.
 */
export function dayStart(date: string, timeZone: string): number {
  const [y, m, d] = date.split('-').map(Number);
  const utcMidnight = Date.UTC(y!, m! - 1, d!);
  // Every zone is within UTC−12 … UTC+14: the day starts within a day of UTC midnight.
  let lo = Math.floor((utcMidnight - 15 * 3_600_000) / 60_000);
  let hi = Math.floor((utcMidnight + 15 * 3_600_000) / 60_000);
  while (lo < hi) {
    const mid = Math.floor((lo + hi) / 2);
    if (localDate(mid * 60_000, timeZone) < date) lo = mid + 1;
    else hi = mid;
  }
  return lo * 60_000;
}

/** The ISO 8601 week of a date: `2026-W49` (weeks start on Monday; week 1 holds 4 January). */
export function isoWeekOf(date: string): string {
  const [y, m, d] = date.split('-').map(Number);
  const t = new Date(Date.UTC(y!, m! - 1, d!));
  const weekday = (t.getUTCDay() + 6) % 7; // Monday 0
  t.setUTCDate(t.getUTCDate() - weekday + 3); // the week's Thursday decides its year
  const year = t.getUTCFullYear();
  const week = 1 + Math.floor((t.getTime() - Date.UTC(year, 0, 1)) / (7 * DAY_MS));
  return `${year}-W${pad(week)}`;
}

export const ISO_WEEK_PATTERN = /^(\d{4})-W(\d{2})$/;

/** Monday and Sunday (`YYYY-MM-DD`) of an ISO week `2026-W49`; null when there is no such week. */
export function isoWeekDays(week: string): { monday: string; sunday: string } | null {
  const m = ISO_WEEK_PATTERN.exec(week);
  if (!m) return null;
  const year = Number(m[1]);
  const n = Number(m[2]);
  const jan4 = new Date(Date.UTC(year, 0, 4));
  const monday1 = Date.UTC(year, 0, 4 - ((jan4.getUTCDay() + 6) % 7));
  const monday = new Date(monday1 + (n - 1) * 7 * DAY_MS).toISOString().slice(0, 10);
  if (n < 1 || isoWeekOf(monday) !== week) return null;
  return { monday, sunday: addDays(monday, 6) };
}

const toMs = (at: string | number | Date) =>
  typeof at === 'number' ? at : typeof at === 'string' ? Date.parse(at) : at.getTime();

/**
 * A day as people read it everywhere: `2026-11-27`. A `YYYY-MM-DD` date is shown as it is; an
 * instant as its date in `timeZone` (UTC unless said).
 */
export function formatDate(at: string | number | Date, timeZone = 'UTC'): string {
  if (typeof at === 'string' && /^\d{4}-\d{2}-\d{2}$/.test(at)) return at;
  const ms = toMs(at);
  return Number.isNaN(ms) ? String(at) : localDate(ms, timeZone);
}

/** A time as people read it everywhere: `2026-11-27 14:05` in `timeZone` (UTC unless said). */
export function formatDateTime(at: string | number | Date, timeZone = 'UTC'): string {
  const ms = toMs(at);
  if (Number.isNaN(ms)) return String(at);
  const p = localParts(ms, timeZone);
  return `${dateOf(p)} ${pad(p.hour)}:${pad(p.minute)}`;
}

/**
 * The instant (epoch ms) a wall-clock reading `YYYY-MM-DDTHH:mm[:ss]` names in `timeZone`, as
 * Python's zoneinfo reads it with fold=0: a reading that occurs twice (clocks back) is the
 * first; one that a clock change skips uses the offset before the change. Null if unreadable.
 */
export function wallTimeInstant(wall: string, timeZone: string): number | null {
  const m = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2}))?$/.exec(wall);
  if (!m) return null;
  const [y, mo, d, h, mi, se] = m.slice(1).map((v) => Number(v ?? 0));
  const asUtc = Date.UTC(y!, mo! - 1, d!, h!, mi!, se!);
  if (Number.isNaN(asUtc) || new Date(asUtc).getUTCDate() !== d) return null;
  const before = offsetMinutes(asUtc - 86_400_000, timeZone);
  const after = offsetMinutes(asUtc + 86_400_000, timeZone);
  const fits = (o: number) => offsetMinutes(asUtc - o * 60_000, timeZone) === o;
  if (fits(before)) return asUtc - before * 60_000;
  if (fits(after)) return asUtc - after * 60_000;
  return asUtc - before * 60_000;
}

/** `2026-11-27 14:05 Europe/London`: the time with its zone, for mail and print. */
export function formatDateTimeZone(at: string | number | Date, timeZone = 'UTC'): string {
  return `${formatDateTime(at, timeZone)} ${timeZone}`;
}

/**
 * The zone's UTC offsets over [fromMs, toMs): segments `{ until, offset }` in time order, the
 * last with `until` = toMs. Clock changes are found to the minute (daily steps, then halving);
 * zones change their clocks at most twice a year, never twice within a day.
 */
export function offsetSegments(
  timeZone: string,
  fromMs: number,
  toMs: number,
): { until: number; offset: number }[] {
  const out: { until: number; offset: number }[] = [];
  let at = fromMs;
  let offset = offsetMinutes(at, timeZone);
  while (at < toMs) {
    const next = Math.min(at + DAY_MS, toMs);
    const nextOffset = offsetMinutes(next, timeZone);
    if (nextOffset !== offset) {
      // In whole minutes: offset(lo) = offset, offset(hi) ≠ offset.
      let lo = Math.floor(at / 60_000);
      let hi = Math.ceil(next / 60_000);
      while (hi - lo > 1) {
        const mid = Math.floor((lo + hi) / 2);
        if (offsetMinutes(mid * 60_000, timeZone) === offset) lo = mid;
        else hi = mid;
      }
      const change = hi * 60_000;
      out.push({ until: change, offset });
      offset = offsetMinutes(change, timeZone);
    }
    at = next;
  }
  out.push({ until: toMs, offset });
  return out;
}
