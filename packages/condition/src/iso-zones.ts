/**
 * ISO 20816-3 evaluation zones from overall velocity.
 *
 * ISO 20816-3:2022 ("Mechanical vibration — Measurement and evaluation of machine vibration —
 * Part 3: Industrial machines with a power rating above 15 kW and operating speeds between
 * 120 r/min and 30 000 r/min"; replaces ISO 10816-3) grades broadband vibration velocity
 * (mm/s RMS) into four zones:
 * - A: newly commissioned machines,
 * - B: acceptable for unrestricted long-term operation,
 * - C: unsatisfactory for long-term continuous operation,
 * - D: severe enough to cause damage.
 */

/**
 * ISO 20816-3 machine group: 1 = large machines (300 kW to 50 MW), 2 = medium-sized machines
 * (15 kW to 300 kW). Source: ISO 20816-3 (from memory).
 */
export type MachineGroup = 1 | 2;

/**
 * Support flexibility as classified by ISO 20816-3 (rigid or flexible foundation).
 * Source: ISO 20816-3 (from memory).
 */
export type Foundation = 'rigid' | 'flexible';

/** ISO 20816-3 evaluation zone. Source: ISO 20816-3 (from memory). */
export type IsoZone = 'A' | 'B' | 'C' | 'D';

/** The three zone boundaries of one machine class, overall velocity in mm/s RMS. */
export interface ZoneBoundaries {
  /** Boundary between zone A and zone B, mm/s RMS. */
  readonly ab: number;
  /** Boundary between zone B and zone C, mm/s RMS. */
  readonly bc: number;
  /** Boundary between zone C and zone D, mm/s RMS. */
  readonly cd: number;
}

/**
 * Zone boundaries in mm/s RMS by machine group and foundation.
 *
 * Source: ISO 20816-3 / ISO 10816-3, zone boundary table for groups 1 and 2, values **from
 * memory** (nobody on the project has read the primary text). Check them against the purchased standard before relying on them.
 */
export const ISO_20816_3_ZONE_BOUNDARIES: Readonly<
  Record<MachineGroup, Readonly<Record<Foundation, ZoneBoundaries>>>
> = {
  1: {
    // group 1 (large: 300 kW–50 MW), from memory
    rigid: { ab: 2.3, bc: 4.5, cd: 7.1 },
    flexible: { ab: 3.5, bc: 7.1, cd: 11.0 },
  },
  2: {
    // group 2 (medium: 15–300 kW), from memory
    rigid: { ab: 1.4, bc: 2.8, cd: 4.5 },
    flexible: { ab: 2.3, bc: 4.5, cd: 7.1 },
  },
};

/**
 * The zone boundaries for one machine group and foundation.
 * Source: ISO 20816-3 (values from memory, see {@link ISO_20816_3_ZONE_BOUNDARIES}).
 */
export function isoZoneBoundaries(group: MachineGroup, foundation: Foundation): ZoneBoundaries {
  const byFoundation = ISO_20816_3_ZONE_BOUNDARIES[group];
  if (byFoundation === undefined) throw new RangeError(`unknown ISO 20816-3 group: ${group}`);
  const boundaries = byFoundation[foundation];
  if (boundaries === undefined) throw new RangeError(`unknown foundation: ${foundation}`);
  return boundaries;
}

/**
 * ISO 20816-3 zone of an overall velocity.
 *
 * Boundary rule (the standard does not say; Turnstone's choice): **a value exactly on a
 * boundary belongs to the higher zone** — 4.5 mm/s for group 1 rigid is zone C. This errs
 * towards the earlier warning and matches the limit rule of {@link evaluateBand}, where a
 * value equal to a level counts as exceeding it, so the ISO default levels (alert at B/C,
 * danger at C/D) and the zones agree.
 *
 * Source: ISO 20816-3 (boundaries from memory); boundary rule: Turnstone, no source.
 *
 * @param velocityMmS overall velocity in mm/s RMS over the ISO band (see {@link isoBand}).
 * @throws RangeError when the velocity is negative or not finite.
 */
export function isoZone(velocityMmS: number, group: MachineGroup, foundation: Foundation): IsoZone {
  if (!Number.isFinite(velocityMmS) || velocityMmS < 0) {
    throw new RangeError(`overall velocity must be a finite value ≥ 0 mm/s, got ${velocityMmS}`);
  }
  return zoneAgainst(velocityMmS, isoZoneBoundaries(group, foundation));
}

/** The zone of a value against one class's boundaries: on a boundary is the higher zone. */
function zoneAgainst(value: number, { ab, bc, cd }: ZoneBoundaries): IsoZone {
  if (value >= cd) return 'D';
  if (value >= bc) return 'C';
  if (value >= ab) return 'B';
  return 'A';
}

/** The three zone boundaries of one machine class, overall displacement in µm RMS. */
export type DisplacementBoundaries = ZoneBoundaries;

/**
 * Displacement zone boundaries in µm RMS by machine group and foundation, for machines where
 * displacement governs (low speeds, where a constant-velocity boundary would admit large
 * excursions).
 *
 * Source: ISO 10816-3:2009 Annex A tables (displacement beside velocity), carried into ISO
 * 20816-3 — values **from memory**, not read from the purchased text; check them against the
 * standard before relying on them.
 */
export const ISO_20816_3_DISPLACEMENT_BOUNDARIES: Readonly<
  Record<MachineGroup, Readonly<Record<Foundation, DisplacementBoundaries>>>
> = {
  1: {
    // group 1 (large), µm RMS, from memory
    rigid: { ab: 29, bc: 57, cd: 90 },
    flexible: { ab: 45, bc: 90, cd: 140 },
  },
  2: {
    // group 2 (medium), µm RMS, from memory
    rigid: { ab: 22, bc: 45, cd: 71 },
    flexible: { ab: 37, bc: 71, cd: 113 },
  },
};

/** Displacement zone boundaries (µm RMS). Source: ISO 20816-3 / 10816-3, from memory. */
export function isoDisplacementBoundaries(
  group: MachineGroup,
  foundation: Foundation,
): DisplacementBoundaries {
  const boundaries = ISO_20816_3_DISPLACEMENT_BOUNDARIES[group]?.[foundation];
  if (boundaries === undefined)
    throw new RangeError(`unknown ISO 20816-3 class: group ${group}, ${foundation}`);
  return boundaries;
}

/**
 * ISO 20816-3 zone of an overall displacement (µm RMS), on the same boundary rule as
 * {@link isoZone} (on a boundary is the higher zone). Source: boundaries from memory (see
 * {@link ISO_20816_3_DISPLACEMENT_BOUNDARIES}); boundary rule Turnstone's.
 */
export function isoDisplacementZone(
  displacementUm: number,
  group: MachineGroup,
  foundation: Foundation,
): IsoZone {
  if (!Number.isFinite(displacementUm) || displacementUm < 0) {
    throw new RangeError(
      `overall displacement must be a finite value ≥ 0 µm, got ${displacementUm}`,
    );
  }
  return zoneAgainst(displacementUm, isoDisplacementBoundaries(group, foundation));
}

/**
 * The zone when both criteria apply: the worse of the velocity and the displacement zone
 * (ISO 20816-3 evaluates both and the more severe governs; from memory).
 */
export function isoZoneBoth(
  velocityMmS: number,
  displacementUm: number,
  group: MachineGroup,
  foundation: Foundation,
): IsoZone {
  const v = isoZone(velocityMmS, group, foundation);
  const d = isoDisplacementZone(displacementUm, group, foundation);
  return v > d ? v : d;
}

/**
 * Running speed (r/min) below which the displacement B/C boundary is the stricter one for a
 * machine vibrating at its running speed: a sine at f Hz with velocity v (mm/s RMS) has
 * displacement v / (2πf) (mm RMS), so the two boundaries meet where f = v_BC / (2π·d_BC).
 * Group 2 rigid: 2.8 / (2π · 0.045) = 9.9 Hz ≈ 594 r/min.
 *
 * Source: v = 2πf·d for a sine (definition); boundaries from memory (see above).
 */
export function displacementGovernsBelowRpm(group: MachineGroup, foundation: Foundation): number {
  const v = isoZoneBoundaries(group, foundation).bc;
  const d = isoDisplacementBoundaries(group, foundation).bc / 1000;
  return (60 * v) / (2 * Math.PI * d);
}
