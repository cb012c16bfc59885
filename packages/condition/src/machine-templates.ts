import { machineTypeSchema } from '@turnstone/contracts/fleet';
import { NEW_BAND_RULES, type BandDefinition, type LimitSet } from './band-definition.ts';
import { isoBand } from './iso-band.ts';
import { isoDefaultLevels, isoDisplacementDefaultLevels } from './iso-default-levels.ts';
import { displacementGovernsBelowRpm, type Foundation, type MachineGroup } from './iso-zones.ts';

/** Machine types that have a limit-set template: every type a machine record may have. */
export type MachineType = (typeof machineTypeSchema.options)[number];

/** Every machine type with a template. */
export const MACHINE_TYPES: readonly MachineType[] = machineTypeSchema.options;

/** What a template needs to know about the machine. */
export interface TemplateMachine {
  readonly type: MachineType;
  readonly isoGroup: MachineGroup;
  readonly foundation: Foundation;
  /** Nominal running speed, r/min (chooses the ISO band). */
  readonly nominalRpm: number;
  /** Whether the point sits on a rolling-element bearing (adds bearing bands). @default true */
  readonly rollingBearings?: boolean;
}

/**
 * The template defaults, named so the Limits screen can show them with their source. All are
 * **common practice, no source**: starting points to be reviewed by a competent person
 * against the manufacturer's data and site standards, not values from a standard (except
 * the overall velocity levels, which follow the ISO 20816-3 zones, from memory).
 */
export const TEMPLATE_DEFAULTS = {
  /** Consecutive exceedances to raise, for template bands (one spike does not alarm). */
  persistence: NEW_BAND_RULES.persistence,
  /** Consecutive values below the clear level to clear (a scattering value clears once). */
  clearPersistence: NEW_BAND_RULES.clearPersistence,
  /** Hours below the clear level to clear as well (a slow degradation raises once). */
  clearAfterHours: NEW_BAND_RULES.clearAfterHours,
  /** Clear below this fraction of the alert level. */
  hysteresis: NEW_BAND_RULES.hysteresis,
  /** Band used when the speed is outside ISO 20816-3's 120–30 000 r/min, Hz. */
  fallbackIsoBand: { fromHz: 10, toHz: 1000 },
  /** Overall acceleration span, Hz. */
  accelerationBand: { fromHz: 10, toHz: 10_000 },
  /** Overall acceleration, g RMS (gearboxes: twice this, mesh energy is normal there). */
  overallAcceleration: { alertLevel: 1.0, dangerLevel: 2.0 },
  /** 1× band, orders, and its levels as fractions of the ISO overall velocity levels. */
  order1x: { fromOrder: 0.8, toOrder: 1.2, fraction: 0.8 },
  /** 2× band, orders, and its levels as fractions of the ISO overall velocity levels. */
  order2x: { fromOrder: 1.8, toOrder: 2.2, fraction: 0.5 },
  /**
   * Bearing defect bands on the envelope spectrum, g peak, ± 2 % (rolling elements slip
   * 1–2 %, Randall & Antoni 2011), fundamental only (`@turnstone/dsp` reads one harmonic
   * per band; add bands for higher harmonics).
   */
  bearing: { halfWidthPercent: 2, harmonics: 1, alertLevel: 0.2, dangerLevel: 0.5 },
  /** Gear mesh band on the acceleration spectrum, g RMS, ± 3 %, the mesh frequency itself. */
  gearMesh: { halfWidthPercent: 3, harmonics: 1, alertLevel: 0.5, dangerLevel: 1.0 },
  /** Blade/vane pass band on velocity, ± 3 %, levels as fractions of the ISO levels. */
  bladePass: { halfWidthPercent: 3, harmonics: 1, fraction: 0.5 },
} as const;

const NO_SOURCE = 'template default, common practice, no source';

/**
 * A default limit set for a point on a machine of the given type:
 * - every type: overall velocity over the ISO band with the ISO 20816-3 default levels
 *   (alert B/C, danger C/D), overall acceleration, a 1× and a 2× order band;
 * - with rolling bearings (default): BPFO, BPFI and BSF bands on the envelope spectrum;
 * - at speeds where displacement governs (below {@link displacementGovernsBelowRpm}, about
 *   600 r/min), an overall displacement band (µm RMS over the ISO band) at the ISO 20816-3
 *   displacement boundaries (alert B/C, danger C/D, from memory);
 * - gearbox: a gear-mesh band (and a doubled acceleration level);
 * - fan and blower: a blade-pass band; pump: the same band for vane pass.
 *
 * Band keys are stable: `overall-velocity`, `overall-displacement`, `overall-acceleration`,
 * `order-1x`, `order-2x`,
 * `bpfo`, `bpfi`, `bsf`, `gear-mesh`, `blade-pass`.
 *
 * Source: ISO 20816-3 for the overall velocity levels (from memory); everything else
 * {@link TEMPLATE_DEFAULTS}, common practice, no source.
 */
export function limitSetFromTemplate(machine: TemplateMachine): LimitSet {
  const d = TEMPLATE_DEFAULTS;
  const iso = isoDefaultLevels(machine.isoGroup, machine.foundation);
  const span = isoBand(machine.nominalRpm);
  const velocitySpan = span ?? d.fallbackIsoBand;
  const common = {
    persistence: d.persistence,
    clearPersistence: d.clearPersistence,
    clearAfterHours: d.clearAfterHours,
    hysteresis: d.hysteresis,
  };
  const scaled = (fraction: number) => ({
    alertLevel: round(iso.alertLevel * fraction),
    dangerLevel: round(iso.dangerLevel * fraction),
  });
  const accelerationFactor = machine.type === 'gearbox' ? 2 : 1;

  const bands: BandDefinition[] = [
    {
      key: 'overall-velocity',
      name: `Overall velocity ${velocitySpan.fromHz}–${velocitySpan.toHz} Hz`,
      kind: 'overall',
      fromHz: velocitySpan.fromHz,
      toHz: velocitySpan.toHz,
      spectrum: 'velocity',
      measure: 'rms',
      unit: 'mm/s',
      ...iso,
      ...common,
      levelSource:
        span === null
          ? `ISO 20816-3 zones B/C and C/D (from memory); speed outside the standard's scope, ${NO_SOURCE} band`
          : `ISO 20816-3 zones B/C and C/D, group ${machine.isoGroup} ${machine.foundation} (from memory)`,
    },
    ...(machine.nominalRpm < displacementGovernsBelowRpm(machine.isoGroup, machine.foundation)
      ? [
          {
            key: 'overall-displacement',
            name: `Overall displacement ${velocitySpan.fromHz}–${velocitySpan.toHz} Hz`,
            kind: 'overall' as const,
            fromHz: velocitySpan.fromHz,
            toHz: velocitySpan.toHz,
            spectrum: 'displacement' as const,
            measure: 'rms' as const,
            unit: 'um' as const,
            ...isoDisplacementDefaultLevels(machine.isoGroup, machine.foundation),
            ...common,
            levelSource: `ISO 20816-3 displacement zones B/C and C/D, group ${machine.isoGroup} ${machine.foundation} (from memory); displacement governs at ${machine.nominalRpm} r/min`,
          },
        ]
      : []),
    {
      key: 'overall-acceleration',
      name: `Overall acceleration ${d.accelerationBand.fromHz}–${d.accelerationBand.toHz} Hz`,
      kind: 'overall',
      ...d.accelerationBand,
      spectrum: 'acceleration',
      measure: 'rms',
      unit: 'g',
      alertLevel: d.overallAcceleration.alertLevel * accelerationFactor,
      dangerLevel: d.overallAcceleration.dangerLevel * accelerationFactor,
      ...common,
      levelSource: NO_SOURCE,
    },
    {
      key: 'order-1x',
      name: '1× running speed',
      kind: 'order',
      fromOrder: d.order1x.fromOrder,
      toOrder: d.order1x.toOrder,
      spectrum: 'velocity',
      measure: 'rms',
      unit: 'mm/s',
      ...scaled(d.order1x.fraction),
      ...common,
      levelSource: `${d.order1x.fraction} × ISO levels, ${NO_SOURCE}`,
    },
    {
      key: 'order-2x',
      name: '2× running speed',
      kind: 'order',
      fromOrder: d.order2x.fromOrder,
      toOrder: d.order2x.toOrder,
      spectrum: 'velocity',
      measure: 'rms',
      unit: 'mm/s',
      ...scaled(d.order2x.fraction),
      ...common,
      levelSource: `${d.order2x.fraction} × ISO levels, ${NO_SOURCE}`,
    },
  ];

  if (machine.rollingBearings ?? true) {
    const names = {
      bpfo: 'outer race (BPFO)',
      bpfi: 'inner race (BPFI)',
      bsf: 'rolling element (BSF)',
    };
    for (const fault of ['bpfo', 'bpfi', 'bsf'] as const) {
      bands.push({
        key: fault,
        name: `Bearing ${names[fault]}, envelope`,
        kind: 'fault',
        fault,
        halfWidth: d.bearing.halfWidthPercent,
        halfWidthUnit: 'percent',
        harmonics: d.bearing.harmonics,
        spectrum: 'envelope',
        measure: 'peak',
        unit: 'g',
        alertLevel: d.bearing.alertLevel,
        dangerLevel: d.bearing.dangerLevel,
        ...common,
        levelSource: NO_SOURCE,
      });
    }
  }

  if (machine.type === 'gearbox') {
    bands.push({
      key: 'gear-mesh',
      name: 'Gear mesh',
      kind: 'fault',
      fault: 'gear-mesh',
      halfWidth: d.gearMesh.halfWidthPercent,
      halfWidthUnit: 'percent',
      harmonics: d.gearMesh.harmonics,
      spectrum: 'acceleration',
      measure: 'rms',
      unit: 'g',
      alertLevel: d.gearMesh.alertLevel,
      dangerLevel: d.gearMesh.dangerLevel,
      ...common,
      levelSource: NO_SOURCE,
    });
  }

  if (machine.type === 'fan' || machine.type === 'blower' || machine.type === 'pump') {
    bands.push({
      key: 'blade-pass',
      name: machine.type === 'pump' ? 'Vane pass' : 'Blade pass',
      kind: 'fault',
      fault: 'blade-pass',
      halfWidth: d.bladePass.halfWidthPercent,
      halfWidthUnit: 'percent',
      harmonics: d.bladePass.harmonics,
      spectrum: 'velocity',
      measure: 'rms',
      unit: 'mm/s',
      ...scaled(d.bladePass.fraction),
      ...common,
      levelSource: `${d.bladePass.fraction} × ISO levels, ${NO_SOURCE}`,
    });
  }

  return { bands, template: machine.type };
}

/** Rounds to 0.01 so derived levels read cleanly on screen. */
function round(value: number): number {
  return Math.round(value * 100) / 100;
}
