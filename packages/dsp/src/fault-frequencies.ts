/** Geometry of a rolling-element bearing. */
export interface BearingGeometry {
  /** Label used in fault-frequency names, e.g. "DE 6205". */
  name: string;
  /** Number of rolling elements n. */
  rollingElements: number;
  /** Rolling-element (ball) diameter d, mm. */
  ballDiameterMm: number;
  /** Pitch diameter D, mm. */
  pitchDiameterMm: number;
  /** Contact angle φ, degrees. @default 0 */
  contactAngleDeg?: number;
  /** Speed of this bearing's shaft per revolution of the measured shaft. @default 1 */
  speedRatio?: number;
}

/** Bearing defect frequencies as multiples of shaft speed (orders). */
export interface BearingOrders {
  /** Ball pass frequency, outer race. */
  bpfo: number;
  /** Ball pass frequency, inner race. */
  bpfi: number;
  /** Ball (rolling element) spin frequency; a spall strikes both races, showing at 2 × BSF. */
  bsf: number;
  /** Fundamental train (cage) frequency. */
  ftf: number;
}

/**
 * Bearing defect frequencies in orders of the (inner-race) shaft speed, outer race fixed:
 * FTF = ½(1 − (d/D)cos φ); BPFO = n·FTF; BPFI = (n/2)(1 + (d/D)cos φ);
 * BSF = (D/2d)(1 − ((d/D)cos φ)²). Real bearings run 1–2 % below these (slip).
 *
 * Source: Randall & Antoni, "Rolling element bearing diagnostics — a tutorial", MSSP
 * 25:485–520, 2011, eqs. (1)–(4).
 */
export function bearingOrders(
  bearing: Omit<BearingGeometry, 'name'> & { name?: string },
): BearingOrders {
  const n = bearing.rollingElements;
  const d = bearing.ballDiameterMm;
  const D = bearing.pitchDiameterMm;
  const phi = ((bearing.contactAngleDeg ?? 0) * Math.PI) / 180;
  const label = bearing.name ? `bearing "${bearing.name}"` : 'bearing';
  if (!Number.isInteger(n) || n < 1)
    throw new RangeError(`${label}: rolling elements must be a positive integer, got ${n}`);
  if (!(d > 0) || !(D > 0)) throw new RangeError(`${label}: diameters must be positive`);
  if (!(d < D))
    throw new RangeError(
      `${label}: ball diameter ${d} mm must be smaller than pitch diameter ${D} mm`,
    );
  if (!(Math.abs(phi) < Math.PI / 2))
    throw new RangeError(`${label}: contact angle must be below 90°`);
  const r = (d / D) * Math.cos(phi);
  return {
    ftf: 0.5 * (1 - r),
    bpfo: (n / 2) * (1 - r),
    bpfi: (n / 2) * (1 + r),
    bsf: (D / (2 * d)) * (1 - r * r),
  };
}

/** A gear mesh: teeth on a gear turning at speedRatio × the measured shaft. */
export interface GearMesh {
  name: string;
  teeth: number;
  /** Speed of the gear's shaft per revolution of the measured shaft. @default 1 */
  speedRatio?: number;
}

/** Components of a machine that produce known frequencies. */
export interface MachineComponents {
  bearings?: BearingGeometry[];
  gears?: GearMesh[];
  /** Blades or vanes on the measured shaft (fan, pump impeller). */
  blades?: number;
}

/** Kind of a fault frequency. */
export type FaultKind = 'shaft' | 'bpfo' | 'bpfi' | 'bsf' | 'ftf' | 'gear-mesh' | 'blade-pass';

/** A frequency to mark on a spectrum and to centre bands on. */
export interface FaultFrequency {
  /** Unique, readable name: "1×", "2×", "3×", "DE 6205 BPFO", "input GMF", "blade pass". */
  name: string;
  kind: FaultKind;
  /** Frequency in Hz (null when the running speed is unknown). */
  hz: number | null;
  /** Multiple of the measured shaft's speed. */
  order: number;
}

/**
 * Fault frequencies of a machine: shaft 1×, 2×, 3×; BPFO, BPFI, BSF, FTF of each bearing
 * (Randall & Antoni 2011); gear mesh = teeth × gear shaft speed; blade (vane) pass =
 * blades × shaft speed. Orders always; Hz when `shaftHz` is known.
 *
 * Source: Randall & Antoni 2011, MSSP 25:485–520 (bearings); Randall, "Vibration-based
 * Condition Monitoring", Wiley 2011, ch. 2 (gear mesh, blade pass).
 */
export function faultFrequencies(
  machine: MachineComponents = {},
  shaftHz: number | null = null,
): FaultFrequency[] {
  if (shaftHz !== null && !(shaftHz > 0))
    throw new RangeError(`shaftHz must be positive or null, got ${shaftHz}`);
  const out: FaultFrequency[] = [];
  const push = (name: string, kind: FaultKind, order: number): void => {
    out.push({ name, kind, order, hz: shaftHz === null ? null : order * shaftHz });
  };
  push('1×', 'shaft', 1);
  push('2×', 'shaft', 2);
  push('3×', 'shaft', 3);
  for (const bearing of machine.bearings ?? []) {
    const ratio = bearing.speedRatio ?? 1;
    if (!(ratio > 0))
      throw new RangeError(`bearing "${bearing.name}": speedRatio must be positive`);
    const o = bearingOrders(bearing);
    push(`${bearing.name} BPFO`, 'bpfo', o.bpfo * ratio);
    push(`${bearing.name} BPFI`, 'bpfi', o.bpfi * ratio);
    push(`${bearing.name} BSF`, 'bsf', o.bsf * ratio);
    push(`${bearing.name} FTF`, 'ftf', o.ftf * ratio);
  }
  for (const gear of machine.gears ?? []) {
    const ratio = gear.speedRatio ?? 1;
    if (!Number.isInteger(gear.teeth) || gear.teeth < 1) {
      throw new RangeError(
        `gear "${gear.name}": teeth must be a positive integer, got ${gear.teeth}`,
      );
    }
    if (!(ratio > 0)) throw new RangeError(`gear "${gear.name}": speedRatio must be positive`);
    push(`${gear.name} GMF`, 'gear-mesh', gear.teeth * ratio);
  }
  if (machine.blades !== undefined) {
    if (!Number.isInteger(machine.blades) || machine.blades < 1) {
      throw new RangeError(`blades must be a positive integer, got ${machine.blades}`);
    }
    push('blade pass', 'blade-pass', machine.blades);
  }
  return out;
}
