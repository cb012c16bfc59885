const relative = new Intl.RelativeTimeFormat('en-GB', { style: 'short', numeric: 'always' });
const integer = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 0 });
import { formatDateTime as formatAt } from '@turnstone/contracts/dates';

/** The browser's own time zone: times on screens not tied to one site are read in it. */
const localZone = Intl.DateTimeFormat().resolvedOptions().timeZone;

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
export function formatDateTime(iso: string, timeZone = localZone): string {
  return formatAt(iso, timeZone);
}

const shortDateTime = new Intl.DateTimeFormat('en-GB', {
  day: 'numeric',
  month: 'short',
  hour: '2-digit',
  minute: '2-digit',
});

/** Day, month and time without the year ("30 Nov, 14:02"), for crowded chart axes. */
export function formatShortDateTime(iso: string): string {
  const then = Date.parse(iso);
  return Number.isNaN(then) ? iso : shortDateTime.format(then);
}

export function formatInteger(value: number): string {
  return integer.format(value);
}

/** The band label's one home is shared with the server (API, CSV exports). */
export { formatBandHz } from '@turnstone/contracts/band-label';
