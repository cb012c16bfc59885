/**
 * Plant setup: sites, areas, machines with their components, and measurement points.
 * The same schemas validate the server's input and the web forms.
 */
import { z } from 'zod';
import { freeText, oneLine } from './text.ts';
import {
  criticalitySchema,
  directionSchema,
  foundationSchema,
  lineHzSchema,
  machineTypeSchema,
} from './fleet.ts';

/** True when `zone` is an IANA time zone name this runtime knows (e.g. "Europe/London"). */
export function isIanaTimeZone(zone: string): boolean {
  if (zone === 'UTC') return true;
  const intl = Intl as unknown as { supportedValuesOf?: (k: string) => string[] };
  if (
    typeof intl.supportedValuesOf === 'function' &&
    intl.supportedValuesOf('timeZone').includes(zone)
  )
    return true;
  // supportedValuesOf lists canonical names only; aliases such as "Etc/GMT+1" still format.
  if (!/^[A-Za-z]+(?:[/_+-][A-Za-z0-9_+-]+)*$/.test(zone)) return false;
  try {
    new Intl.DateTimeFormat('en', { timeZone: zone });
    return true;
  } catch {
    return false;
  }
}

const text = (max: number, label = 'This field') =>
  oneLine(
    z
      .string()
      .trim()
      .min(1, `${label} is required.`)
      .max(max, `${label} is at most ${max} characters.`),
  );

/** A number from a form field or JSON; empty input reads as "missing". */
const num = (min: number, max: number, what: string) =>
  z
    .number({ error: `${what} must be a number.` })
    .finite()
    .min(min, `${what} must be at least ${min}.`)
    .max(max, `${what} must be at most ${max}.`);
const int = (min: number, max: number, what: string) =>
  num(min, max, what).int(`${what} must be a whole number.`);

export const timeZoneSchema = z
  .string()
  .trim()
  .min(1, 'Time zone is required.')
  .refine(isIanaTimeZone, 'Not a known IANA time zone; use a name such as Europe/London.');

export const siteInputSchema = z.object({
  name: text(200, 'Name'),
  code: z
    .string()
    .trim()
    .min(2, 'Code is 2 to 32 characters.')
    .max(32, 'Code is 2 to 32 characters.')
    .regex(/^[A-Z0-9][A-Z0-9-]*$/, 'Code uses capital letters, digits and hyphens.'),
  timeZone: timeZoneSchema,
});
export type SiteInput = z.infer<typeof siteInputSchema>;

export const areaInputSchema = z.object({
  siteId: z.number().int().positive('Choose a site.'),
  name: text(200, 'Name'),
});
export const areaUpdateSchema = areaInputSchema.pick({ name: true });
export type AreaInput = z.infer<typeof areaInputSchema>;

/** The answer to creating or changing a site: the saved values with the id. */
export const savedSiteSchema = siteInputSchema.extend({ id: z.number().int() });
/** The answer to creating or renaming an area: the saved values with the id. */
export const savedAreaSchema = areaInputSchema.extend({ id: z.number().int() });
/** The answer to creating or changing a machine or a point: its id. */
export const savedIdSchema = z.object({ id: z.number().int() });

export const bearingInputSchema = z
  .object({
    /** Present for a bearing that already exists: it keeps its id, and points stay linked. */
    id: z.number().int().positive().optional(),
    name: text(100, 'Position'),
    designation: oneLine(z.string().trim().max(64)).nullish(),
    rollingElements: int(3, 200, 'Rolling elements'),
    ballDiameterMm: num(0.1, 1000, 'Ball diameter'),
    pitchDiameterMm: num(1, 5000, 'Pitch diameter'),
    contactAngleDeg: num(0, 60, 'Contact angle'),
    speedRatio: num(0.001, 1000, 'Speed ratio'),
  })
  .refine((b) => b.pitchDiameterMm > b.ballDiameterMm, {
    path: ['pitchDiameterMm'],
    message: 'Pitch diameter must be larger than the ball diameter.',
  });
export type BearingInput = z.infer<typeof bearingInputSchema>;

export const gearInputSchema = z.object({
  id: z.number().int().positive().optional(),
  name: text(100, 'Name'),
  teeth: int(1, 2000, 'Teeth'),
  mateTeeth: int(1, 2000, 'Mate teeth'),
  speedRatio: num(0.001, 1000, 'Speed ratio'),
});
export type GearInput = z.infer<typeof gearInputSchema>;

export const machineInputSchema = z.object({
  areaId: z.number().int().positive('Choose an area.'),
  name: text(200, 'Name'),
  type: machineTypeSchema,
  /** Nominal running speed, r/min. */
  nominalRpm: num(1, 200_000, 'Nominal speed'),
  /** ISO 20816-3 group: 1 large machines (300 kW–50 MW), 2 medium (15–300 kW). */
  isoGroup: z.union([z.literal(1), z.literal(2)], { error: 'ISO group is 1 or 2.' }),
  foundation: foundationSchema,
  criticality: criticalitySchema,
  powerKw: num(0.01, 1_000_000, 'Power').nullable(),
  bladeCount: int(1, 500, 'Blade count').nullable(),
  vaneCount: int(1, 500, 'Vane count').nullable(),
  /**
   * Supply frequency of the machine's motor, Hz (50 or 60), or null: no mains-fed motor on
   * the measured train, or not known. Left out of an edit, the stored value stays.
   */
  lineHz: lineHzSchema.nullable().optional(),
  notes: freeText(z.string().max(2000)).nullish(),
  /** The whole list: bearings left out are removed (points on them lose the link). */
  bearings: z.array(bearingInputSchema).max(50),
  gears: z.array(gearInputSchema).max(50),
});
export type MachineInput = z.infer<typeof machineInputSchema>;

export const pointInputSchema = z
  .object({
    machineId: z.number().int().positive('Choose a machine.'),
    tag: z
      .string()
      .trim()
      .min(1, 'Tag is required.')
      .max(64, 'Tag is at most 64 characters.')
      .regex(
        /^[A-Za-z0-9][A-Za-z0-9._-]*$/,
        'Tag uses letters, digits, dot, hyphen and underscore.',
      ),
    name: text(200, 'Name'),
    location: text(100, 'Location'),
    direction: directionSchema,
    sensitivityMvPerG: num(0.1, 100_000, 'Sensitivity'),
    bearingId: z.number().int().positive().nullable(),
    fmaxHz: num(10, 100_000, 'Fmax'),
    lines: int(100, 102_400, 'Lines'),
    /**
     * Envelope band edges, Hz, around the resonance the bearing impacts excite (independent
     * of Fmax); both left empty = the default from each capture's sample rate.
     */
    envelopeLoHz: num(1, 500_000, 'Envelope band low edge').nullish(),
    envelopeHiHz: num(1, 500_000, 'Envelope band high edge').nullish(),
  })
  .superRefine((p, ctx) => {
    const lo = p.envelopeLoHz ?? null;
    const hi = p.envelopeHiHz ?? null;
    if ((lo === null) !== (hi === null))
      ctx.addIssue({
        code: 'custom',
        path: [lo === null ? 'envelopeLoHz' : 'envelopeHiHz'],
        message: 'Give both edges of the envelope band, or neither for the default.',
      });
    else if (lo !== null && hi !== null && !(hi > lo))
      ctx.addIssue({
        code: 'custom',
        path: ['envelopeHiHz'],
        message: 'The high edge must be above the low edge.',
      });
  });
export type PointInput = z.infer<typeof pointInputSchema>;

// ---------------------------------------------------------------- answers

export const setupSiteSchema = z.object({
  id: z.number().int(),
  name: z.string(),
  code: z.string(),
  timeZone: z.string(),
});
export const setupAreaSchema = z.object({
  id: z.number().int(),
  siteId: z.number().int(),
  name: z.string(),
});
export const setupBearingSchema = z.object({
  id: z.number().int(),
  name: z.string(),
  designation: z.string().nullable(),
  rollingElements: z.number(),
  ballDiameterMm: z.number(),
  pitchDiameterMm: z.number(),
  contactAngleDeg: z.number(),
  speedRatio: z.number(),
});
export const setupGearSchema = z.object({
  id: z.number().int(),
  name: z.string(),
  teeth: z.number(),
  mateTeeth: z.number(),
  speedRatio: z.number(),
});
export const setupPointSchema = z.object({
  id: z.number().int(),
  machineId: z.number().int(),
  tag: z.string(),
  name: z.string(),
  location: z.string(),
  direction: directionSchema,
  sensitivityMvPerG: z.number(),
  bearingId: z.number().int().nullable(),
  fmaxHz: z.number(),
  lines: z.number(),
  envelopeLoHz: z.number().nullable(),
  envelopeHiHz: z.number().nullable(),
});
export const setupMachineSchema = z.object({
  id: z.number().int(),
  areaId: z.number().int(),
  name: z.string(),
  type: machineTypeSchema,
  nominalRpm: z.number(),
  isoGroup: z.number(),
  foundation: foundationSchema,
  criticality: criticalitySchema,
  powerKw: z.number().nullable(),
  bladeCount: z.number().nullable(),
  vaneCount: z.number().nullable(),
  lineHz: z.number().int().nullable(),
  notes: z.string().nullable(),
  bearings: z.array(setupBearingSchema),
  gears: z.array(setupGearSchema),
  points: z.array(setupPointSchema),
});
export const setupTreeSchema = z.object({
  sites: z.array(setupSiteSchema),
  areas: z.array(setupAreaSchema),
  machines: z.array(setupMachineSchema),
});
export type SetupSite = z.infer<typeof setupSiteSchema>;
export type SetupArea = z.infer<typeof setupAreaSchema>;
export type SetupMachine = z.infer<typeof setupMachineSchema>;
export type SetupPoint = z.infer<typeof setupPointSchema>;
export type SetupTree = z.infer<typeof setupTreeSchema>;
