const relative = new Intl.RelativeTimeFormat('en-GB', { style: 'short', numeric: 'always' });
const integer = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 0 });
import { formatDate as dateAt, formatDateTime as formatAt } from '@turnstone/contracts/dates';

/**
 * The zone of every time on screens not tied to one site: the signed-in user's (`Me.timeZone`:
 * their sites' zone when all share one, otherwise UTC), set by the app shell from the session
 * before any page renders, and named in the page footer. UTC until then (sign-in page).
 */
let displayZone = 'UTC';

export function setDisplayTimeZone(timeZone: string): void {
  displayZone = timeZone;
}

export function displayTimeZone(): string {
  return displayZone;
}

const steps: [Intl.RelativeTimeFormatUnit, number][] = [
  ['second', 60],
  ['minute', 60],
  ['hour', 24],
  ['day', 30],
  ['month', 12],
  ['year', Number.POSITIVE_INFINITY],
];

/**
 * How long ago `iso` was, relative to `now` ("12 min ago", "3 hr ago"). Timestamps up to two
 * minutes ahead (clock skew between gateway and server) read as "0 sec ago".
 */
export function formatAge(iso: string, now: number): string {
  const then = Date.parse(iso);
  if (Number.isNaN(then)) return '—';
  let seconds = (now - then) / 1000;
  if (seconds < 0 && seconds > -120) seconds = 0;
  const sign = seconds < 0 ? 1 : -1;
  let value = Math.abs(seconds);
  for (const [unit, size] of steps) {
    if (value < size) return relative.format(sign * Math.floor(value), unit);
    value /= size;
  }
  return '—';
}

/** One format on every screen, CSV and mail: `2026-11-27 14:05` (contracts/dates.ts). */
export function formatDateTime(at: string | number, timeZone = displayZone): string {
  return formatAt(at, timeZone);
}

/** A day in the same format: `2026-11-27`. */
export function formatDate(at: string | number, timeZone = displayZone): string {
  return dateAt(at, timeZone);
}

/** The same format without the year (`11-30 14:02`), for crowded chart axes. */
export function formatShortDateTime(at: string | number, timeZone = displayZone): string {
  const full = formatAt(at, timeZone);
  return /^\d{4}-/.test(full) ? full.slice(5) : full;
}

export function formatInteger(value: number): string {
  return integer.format(value);
}

/** The band label's one home is shared with the server (API, CSV exports). */
export { formatBandHz } from '@turnstone/contracts/band-label';
