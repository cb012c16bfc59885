/** Formatting for the review's tables: values with units, signed changes, UTC days. */

const units: Record<string, string> = { um: 'µm', 'mm/s': 'mm/s', g: 'g' };

/** The band unit as people write it (µm, not um). */
export function unitLabel(unit: string): string {
  return units[unit] ?? unit;
}

const fixed = [0, 1, 2, 3].map(
  (digits) =>
    new Intl.NumberFormat('en-GB', {
      minimumFractionDigits: digits,
      maximumFractionDigits: digits,
    }),
);

const small = new Intl.NumberFormat('en-GB', { maximumSignificantDigits: 3 });

/** Three significant figures or so, enough for a band value read off a spectrum. */
export function formatValue(value: number): string {
  const abs = Math.abs(value);
  if (abs > 0 && abs < 0.1) return small.format(value);
  const digits = abs >= 100 ? 0 : abs >= 10 ? 1 : abs >= 1 ? 2 : 3;
  return fixed[digits]!.format(value);
}

export function formatSigned(value: number): string {
  return `${value > 0 ? '+' : value < 0 ? '−' : ''}${formatValue(Math.abs(value))}`;
}

/** "+30.4 %"; "new" when last week's mean was zero. */
export function formatPercent(value: number | null): string {
  if (value === null) return 'new';
  return `${value > 0 ? '+' : value < 0 ? '−' : ''}${fixed[1]!.format(Math.abs(value))} %`;
}

const dayFormat = new Intl.DateTimeFormat('en-GB', {
  day: 'numeric',
  month: 'short',
  year: 'numeric',
  timeZone: 'UTC',
});

/** A day (UTC), e.g. "27 Nov 2026", from an ISO instant or a YYYY-MM-DD date. */
export function formatDay(iso: string): string {
  const t = Date.parse(iso.length === 10 ? `${iso}T00:00:00Z` : iso);
  return Number.isNaN(t) ? iso : dayFormat.format(t);
}

/** Today as YYYY-MM-DD in the browser's own time zone (the week a person means by "this week"). */
export function todayIso(now = new Date()): string {
  const y = now.getFullYear();
  const m = String(now.getMonth() + 1).padStart(2, '0');
  const d = String(now.getDate()).padStart(2, '0');
  return `${y}-${m}-${d}`;
}

/** The date `days` after a YYYY-MM-DD date. */
export function addDays(date: string, days: number): string {
  const t = Date.parse(`${date}T00:00:00Z`) + days * 86_400_000;
  return new Date(t).toISOString().slice(0, 10);
}

export const isIsoDate = (s: string | null): s is string =>
  s !== null && /^\d{4}-\d{2}-\d{2}$/.test(s) && !Number.isNaN(Date.parse(`${s}T00:00:00Z`));
