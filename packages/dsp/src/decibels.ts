import { quantityOf, siPerUnit, type VibrationUnit } from './units.ts';

/**
 * Reference values for vibration levels in decibels (ISO 1683:2015, "Acoustics —
 * Preferred reference values for acoustical and vibratory levels"): acceleration
 * 1 µm/s², velocity 1 nm/s, displacement 1 pm.
 */
export const ISO_1683_REFERENCE = {
  acceleration: 1e-6,
  velocity: 1e-9,
  displacement: 1e-12,
} as const;

/**
 * Level in dB re the ISO 1683 reference of the quantity: 20·log10(x / x₀).
 * 1 mm/s → 120.00 dB; 1 g → 139.83 dB (computed from the definition).
 */
export function toDecibels(value: number, unit: VibrationUnit): number {
  if (!(value > 0)) throw new RangeError(`a level in dB needs a positive amplitude, got ${value}`);
  const reference = ISO_1683_REFERENCE[quantityOf(unit)];
  return 20 * Math.log10((value * siPerUnit(unit)) / reference);
}

/** Inverse of {@link toDecibels}: amplitude in `unit` of a level in dB re ISO 1683. */
export function fromDecibels(db: number, unit: VibrationUnit): number {
  const reference = ISO_1683_REFERENCE[quantityOf(unit)];
  return (reference * 10 ** (db / 20)) / siPerUnit(unit);
}
