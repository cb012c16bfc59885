import { MM_PER_INCH, STANDARD_GRAVITY } from '@turnstone/contracts/units';

/**
 * g₀ = 9.80665 m/s² (3rd CGPM, 1901) and 1 in = 25.4 mm (1959 agreement) have one home, the
 * display units module the server and the web app share.
 */
export { MM_PER_INCH, STANDARD_GRAVITY };

/** Acceleration units (vibration amplitude units Turnstone reads and shows follow). */
export type AccelerationUnit = 'g' | 'm/s2';
/** Velocity units. */
export type VelocityUnit = 'mm/s' | 'in/s';
/** Displacement units (µm is written 'um'). */
export type DisplacementUnit = 'um' | 'mil';
/** Any vibration amplitude unit. */
export type VibrationUnit = AccelerationUnit | VelocityUnit | DisplacementUnit;

/** The physical quantity of a unit. */
export type Quantity = 'acceleration' | 'velocity' | 'displacement';

/** SI value (m/s², m/s, m) of one of each unit. */
const SI_PER_UNIT: Record<VibrationUnit, { quantity: Quantity; si: number }> = {
  g: { quantity: 'acceleration', si: STANDARD_GRAVITY },
  'm/s2': { quantity: 'acceleration', si: 1 },
  'mm/s': { quantity: 'velocity', si: 1e-3 },
  'in/s': { quantity: 'velocity', si: MM_PER_INCH * 1e-3 },
  um: { quantity: 'displacement', si: 1e-6 },
  mil: { quantity: 'displacement', si: MM_PER_INCH * 1e-6 },
};

/** The quantity a unit measures; throws a `TypeError` for an unknown unit. */
export function quantityOf(unit: VibrationUnit): Quantity {
  const entry = SI_PER_UNIT[unit];
  if (!entry) throw new TypeError(`unknown unit "${String(unit)}"`);
  return entry.quantity;
}

/** SI value of one `unit` (m/s², m/s or m). */
export function siPerUnit(unit: VibrationUnit): number {
  const entry = SI_PER_UNIT[unit];
  if (!entry) throw new TypeError(`unknown unit "${String(unit)}"`);
  return entry.si;
}

/**
 * Converts an amplitude between units of the same quantity (g ↔ m/s², mm/s ↔ in/s,
 * µm ↔ mil). Source: SI definitions; g = 9.80665 m/s², 1 in = 25.4 mm.
 */
export function convertUnit(value: number, from: VibrationUnit, to: VibrationUnit): number {
  if (quantityOf(from) !== quantityOf(to)) {
    throw new RangeError(
      `cannot convert ${from} to ${to}: different quantities (integrate instead)`,
    );
  }
  return (value * siPerUnit(from)) / siPerUnit(to);
}

/** √2: sine peak / RMS. */
export const SINE_PEAK_PER_RMS = Math.SQRT2;

/**
 * Amplitude of a sine at `frequencyHz` after integrating it `from` one quantity `to` a
 * lower one (v = a/2πf, d = a/(2πf)² = v/2πf), in the requested units.
 *
 * Source: calculus of a sinusoid (computed: 1 g peak at 100 Hz →
 * 15.6078 mm/s, 24.8405 µm peak).
 */
export function integrateSineAmplitude(
  value: number,
  frequencyHz: number,
  from: VibrationUnit,
  to: VibrationUnit,
): number {
  return value * integrationGain(frequencyHz, from, to);
}

/**
 * Factor that turns an amplitude in `from` at `frequencyHz` into `to`, where `to` is the
 * same quantity or one or two integrations lower (acceleration → velocity →
 * displacement). Throws for differentiation or a non-positive frequency when integrating.
 */
export function integrationGain(
  frequencyHz: number,
  from: VibrationUnit,
  to: VibrationUnit,
): number {
  const order = { acceleration: 0, velocity: 1, displacement: 2 };
  const steps = order[quantityOf(to)] - order[quantityOf(from)];
  if (steps < 0) throw new RangeError(`cannot differentiate ${from} into ${to}`);
  if (steps > 0 && !(frequencyHz > 0)) {
    throw new RangeError(`integration needs a positive frequency, got ${frequencyHz}`);
  }
  const omega = 2 * Math.PI * frequencyHz;
  return siPerUnit(from) / siPerUnit(to) / omega ** steps;
}
