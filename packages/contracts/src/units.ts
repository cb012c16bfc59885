import { z } from 'zod';

/**
 * Display units: the one home for how a stored vibration value is shown in the user's unit
 * system (screens, CSV exports, e-mails). Values are always stored in the metric units the
 * analysis computes (g, mm/s, µm — written 'um'); only what people read and type converts.
 *
 * Sources of the factors:
 * - 1 in = 25.4 mm exactly: international yard and pound agreement (1959), as given in
 *   NIST SP 811 (2008) appendix B and ISO 80000-3.
 * - 1 mil = 0.001 in = 25.4 µm (NIST SP 811, appendix B: "mil").
 * - g₀ = 9.80665 m/s² (3rd CGPM, 1901; ISO 80000-3). Acceleration stays in g in both systems
 *   (common practice, no source), so g₀ is here for the analysis' integration only.
 *
 * Levels in dB: a level is 20·log10(x / x₀) with the ISO 1683 reference x₀ in SI units
 * (1 nm/s, 1 pm, 1 µm/s²). Turnstone converts the amplitude to SI before taking the level, so
 * the reference converts with it and a dB value reads the same in either unit system.
 */

/** Millimetres per inch, exact by definition (1959 agreement; NIST SP 811; ISO 80000-3). */
export const MM_PER_INCH = 25.4;

/** Standard acceleration of gravity in m/s² (3rd CGPM 1901; ISO 80000-3). */
export const STANDARD_GRAVITY = 9.80665;

export const unitSystemSchema = /* @__PURE__ */ z.enum(['metric', 'imperial']);
/** `metric`: mm/s, µm, g. `imperial`: in/s, mil, g. */
export type UnitSystem = z.infer<typeof unitSystemSchema>;

/** Units a shown value may carry: the stored ones and their imperial counterparts. */
export type DisplayUnit = 'g' | 'mm/s' | 'um' | 'in/s' | 'mil';

/** The imperial counterpart of each stored unit and how many stored units make one of it. */
const IMPERIAL: Record<string, { unit: DisplayUnit; storedPerUnit: number }> = {
  'mm/s': { unit: 'in/s', storedPerUnit: MM_PER_INCH }, // 1 in/s = 25.4 mm/s
  um: { unit: 'mil', storedPerUnit: MM_PER_INCH }, // 1 mil = 0.001 in = 25.4 µm
};

/**
 * Significant digits kept when a converted value is handed on as a number (an input field,
 * a CSV cell), so the binary rounding of ×/÷ 25.4 (one ulp, ~1e-16 relative) drops out:
 * 0.3 in/s → 7.62 mm/s, not 7.619999999999999. Shown values keep 15 digits and typed ones
 * come back with 14, so both round trips hold: a typed value shows again as typed, and a
 * stored level shown in imperial and saved untouched stays the stored level.
 */
const clean = (v: number, digits: number) =>
  Number.isFinite(v) && v !== 0 ? Number(v.toPrecision(digits)) : v;

/** The unit a value stored in `unit` is shown in; units without a counterpart pass through. */
export function displayUnit(unit: string, system: UnitSystem): string {
  return system === 'imperial' ? (IMPERIAL[unit]?.unit ?? unit) : unit;
}

/** A value stored in `unit`, in the unit `displayUnit(unit, system)` names. */
export function toDisplay(value: number, unit: string, system: UnitSystem): number {
  const k = system === 'imperial' ? IMPERIAL[unit] : undefined;
  return k ? clean(value / k.storedPerUnit, 15) : value;
}

/** Inverse of {@link toDisplay}: a value typed in the display unit, in the stored unit. */
export function fromDisplay(value: number, unit: string, system: UnitSystem): number {
  const k = system === 'imperial' ? IMPERIAL[unit] : undefined;
  return k ? clean(value * k.storedPerUnit, 14) : value;
}

/**
 * Significant digits of a converted level shown for editing (the limits inputs) and in the
 * audit log: 4.5 mm/s reads 0.1772 in/s, not 0.177165354330709 (common practice, no source).
 */
export const LEVEL_DIGITS = 4;

/**
 * A stored level as an input field shows it: as stored when the unit does not convert
 * (metric, or g), converted and rounded to {@link LEVEL_DIGITS} otherwise.
 */
export function levelForInput(value: number, unit: string, system: UnitSystem): number {
  const shown = toDisplay(value, unit, system);
  return shown === value || !Number.isFinite(shown) || shown === 0
    ? shown
    : Number(shown.toPrecision(LEVEL_DIGITS));
}

/**
 * A level read back from an input field, in the stored unit. `stored` is the level the field
 * was filled from: while the field still shows it (untouched, or typed back to the same
 * text), that stored value comes back exactly, so a save of an untouched imperial field does
 * not move the level by the display rounding; a value typed anew is converted.
 */
export function levelFromInput(
  typed: number,
  unit: string,
  system: UnitSystem,
  stored?: number,
): number {
  if (
    stored !== undefined &&
    Number.isFinite(stored) &&
    levelForInput(stored, unit, system) === typed
  )
    return stored;
  return fromDisplay(typed, unit, system);
}

/** How a unit is written for people (µm, not um). */
export function unitText(unit: string): string {
  return unit === 'um' ? 'µm' : unit;
}

/** The shown unit of a stored unit, as written: `mm/s` → `in/s` in imperial, `um` → `µm`. */
export function displayUnitText(unit: string, system: UnitSystem): string {
  return unitText(displayUnit(unit, system));
}

export const unitSystemLabels: Record<UnitSystem, string> = {
  metric: 'Metric (mm/s, µm)',
  imperial: 'Imperial (in/s, mil)',
};
