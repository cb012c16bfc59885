import { formatDate } from '@turnstone/contracts/dates';
/**
 * Formatting for the review's tables: signed changes, percentages, days (one date format, contracts/dates.ts). Values and units
 * follow the app's one number rule (`@turnstone/contracts/number-format`).
 */
import { formatNumber } from '@turnstone/contracts/number-format';
import { displayTimeZone } from '../../../lib/format.ts';

const oneDecimal = new Intl.NumberFormat('en-GB', {
  minimumFractionDigits: 1,
  maximumFractionDigits: 1,
});

/** "+0.350", "−1.20": a change by the one number rule with its sign. */
export function formatSigned(value: number): string {
  return `${value > 0 ? '+' : value < 0 ? '−' : ''}${formatNumber(Math.abs(value))}`;
}

/** "+30.4 %"; "new" when last week's mean was zero. */
export function formatPercent(value: number | null): string {
  if (value === null) return 'new';
  return `${value > 0 ? '+' : value < 0 ? '−' : ''}${oneDecimal.format(Math.abs(value))} %`;
}

/**
 * A day as every screen shows it, `2026-11-27` (contracts/dates.ts), in the site's zone for an
 * instant; a YYYY-MM-DD date as it is.
 */
export function formatDay(iso: string, timeZone = 'UTC'): string {
  return formatDate(iso, timeZone);
}

/**
 * Today as YYYY-MM-DD in the screen's zone (lib/format.ts), or the zone given (the session's,
 * before the app shell has set the screen's): the week a person means by "this week".
 */
export function todayIso(now = new Date(), timeZone = displayTimeZone()): string {
  return formatDate(now, timeZone);
}

/** The date `days` after a YYYY-MM-DD date. */
export function addDays(date: string, days: number): string {
  const t = Date.parse(`${date}T00:00:00Z`) + days * 86_400_000;
  return new Date(t).toISOString().slice(0, 10);
}

export const isIsoDate = (s: string | null): s is string =>
  s !== null && /^\d{4}-\d{2}-\d{2}$/.test(s) && !Number.isNaN(Date.parse(`${s}T00:00:00Z`));
