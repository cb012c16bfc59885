import {
  isoDisplacementBoundaries,
  isoZoneBoundaries,
  type Foundation,
  type MachineGroup,
} from './iso-zones.ts';

/** Alert and danger levels for overall velocity, mm/s RMS. */
export interface IsoDefaultLevels {
  readonly alertLevel: number;
  readonly dangerLevel: number;
}

/**
 * Default alert and danger levels for overall velocity from the ISO 20816-3 zones, for the
 * "apply ISO 20816 defaults" action: alert at the B/C boundary (no longer fit for long-term
 * operation), danger at the C/D boundary (severe enough to cause damage).
 *
 * Because a value on a boundary belongs to the higher zone ({@link isoZone}) and a value equal
 * to a level exceeds it ({@link evaluateBand}), an alert is raised exactly when the zone
 * becomes C, and danger exactly when it becomes D.
 *
 * Source: zone boundaries ISO 20816-3 (from memory); placing alert at B/C and danger at C/D is
 * common practice, no source. ISO 20816-3 itself leaves alarm and trip values to the user.
 */
export function isoDefaultLevels(group: MachineGroup, foundation: Foundation): IsoDefaultLevels {
  const { bc, cd } = isoZoneBoundaries(group, foundation);
  return { alertLevel: bc, dangerLevel: cd };
}

/**
 * Default alert and danger levels for overall displacement (µm RMS), alert at the B/C and
 * danger at the C/D displacement boundary, for machines where displacement governs.
 * Source: ISO 20816-3 displacement boundaries (from memory); the placement is common practice.
 */
export function isoDisplacementDefaultLevels(
  group: MachineGroup,
  foundation: Foundation,
): IsoDefaultLevels {
  const { bc, cd } = isoDisplacementBoundaries(group, foundation);
  return { alertLevel: bc, dangerLevel: cd };
}
