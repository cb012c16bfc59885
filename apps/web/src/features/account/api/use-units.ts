import { formatQuantity } from '@turnstone/contracts/number-format';
import {
  displayUnitText,
  fromDisplay,
  toDisplay,
  type UnitSystem,
} from '@turnstone/contracts/units';
import { useMe } from '../../auth/api/get-me.ts';

/**
 * The signed-in user's unit system applied: values arrive stored in metric (mm/s, µm, g) and
 * leave through here to be shown, and typed values come back through `fromInput`.
 */
export interface Units {
  system: UnitSystem;
  /** A stored value in the shown unit. */
  value: (v: number, unit: string) => number;
  /** The shown unit of a stored unit, as written (in/s, mil, µm, g). */
  unit: (unit: string) => string;
  /** "0.110 in/s": converted, by the one number rule, with its unit. */
  format: (v: number | null | undefined, unit: string, digits?: number) => string;
  /** A value typed in the shown unit, in the stored unit. */
  fromInput: (v: number, unit: string) => number;
}

const cache = new Map<UnitSystem, Units>();

export function unitsOf(system: UnitSystem): Units {
  let u = cache.get(system);
  if (!u) {
    u = {
      system,
      value: (v, unit) => toDisplay(v, unit, system),
      unit: (unit) => displayUnitText(unit, system),
      format: (v, unit, digits) => formatQuantity(v, unit, system, digits),
      fromInput: (v, unit) => fromDisplay(v, unit, system),
    };
    cache.set(system, u);
  }
  return u;
}

/** The units of the signed-in user (metric until the session is known). */
export function useUnits(): Units {
  const me = useMe();
  return unitsOf(me.data?.unitSystem ?? 'metric');
}
