import { displayUnitText, toDisplay, type UnitSystem } from './units.ts';

/**
 * Numbers as Turnstone prints them, on every screen, chart, CSV-adjacent text and e-mail.
 *
 * The rule (common practice, no source): three significant digits — enough for a band value
 * read off a spectrum — keeping trailing zeros so the precision shows (0.500, 1.50, 22.3);
 * values of 10^digits and more are written whole (1480, not 1.48e3); never exponent notation
 * (0.000420, not 4.20e-4); no thousands separators (CSV and chart labels stay one token).
 * Charts' tooltips and cursor read-outs ask for four digits.
 */
export const SIGNIFICANT_DIGITS = 3;

/** `value` by the rule above; '—' for a missing or non-finite value. */
export function formatNumber(
  value: number | null | undefined,
  digits: number = SIGNIFICANT_DIGITS,
): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  if (value === 0) return '0';
  const rounded = Number(value.toPrecision(digits));
  const abs = Math.abs(rounded);
  if (abs >= 10 ** digits) return Math.round(value).toString();
  const decimals = Math.max(0, digits - 1 - Math.floor(Math.log10(abs)));
  return rounded.toFixed(decimals);
}

/**
 * A value stored in `unit`, converted to the user's unit system and written with its unit:
 * `formatQuantity(7.62, 'mm/s', 'imperial')` → "0.300 in/s". A unit-less value ('') has no
 * unit text.
 */
export function formatQuantity(
  value: number | null | undefined,
  unit: string,
  system: UnitSystem,
  digits: number = SIGNIFICANT_DIGITS,
): string {
  const shown = value === null || value === undefined ? value : toDisplay(value, unit, system);
  const text = formatNumber(shown, digits);
  const u = displayUnitText(unit, system);
  return u && text !== '—' ? `${text} ${u}` : text;
}

/**
 * Program-written sentences stored with a capture (diagnosis summaries: "1× dominant (3.52 mm/s,
 * …)") restated in the reader's unit system: each "<number> mm/s" or "<number> µm" becomes the
 * converted value by the one rule. Text in metric comes back unchanged.
 */
export function restateUnits(text: string, system: UnitSystem): string {
  if (system === 'metric') return text;
  return text.replace(/(-?\d+(?:\.\d+)?) (mm\/s|µm|um)(?![\w/²])/g, (_, n: string, u: string) =>
    formatQuantity(Number(n), u === 'µm' ? 'um' : u, system),
  );
}
