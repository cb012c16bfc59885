import { z } from 'zod';

export const directionSchema = z.enum(['H', 'V', 'A']);
export const machineTypeSchema = z.enum([
  'motor',
  'pump',
  'fan',
  'blower',
  'gearbox',
  'compressor',
]);
export const foundationSchema = z.enum(['rigid', 'flexible']);
export const criticalitySchema = z.enum(['low', 'medium', 'high']);
/**
 * Electrical supply (line) frequency of a machine's motor: 50 or 60 Hz (the two public mains
 * frequencies, IEC 60038). A machine without a mains-fed motor, or on an inverter, has none.
 */
export const lineHzSchema = z.union([z.literal(50), z.literal(60)], {
  error: 'Line frequency is 50 Hz, 60 Hz, or none (no mains-fed motor, or not known).',
});
export type LineHz = z.infer<typeof lineHzSchema>;
export type MachineType = z.infer<typeof machineTypeSchema>;

/** Worst status of a node, shown with text and shape as well as colour. */
export const nodeStatusSchema = z.enum(['ok', 'alert', 'danger', 'quality', 'stale', 'none']);
export type NodeStatus = z.infer<typeof nodeStatusSchema>;

export const siteSchema = z.object({
  id: z.number().int(),
  name: z.string(),
  code: z.string(),
  timeZone: z.string(),
});
export type Site = z.infer<typeof siteSchema>;
export const siteListSchema = z.object({ items: z.array(siteSchema) });

export const fleetPointSchema = z.object({
  id: z.number().int(),
  tag: z.string(),
  name: z.string(),
  direction: directionSchema,
  status: nodeStatusSchema,
  lastTakenAt: z.string().nullable(),
});
export const fleetMachineSchema = z.object({
  id: z.number().int(),
  name: z.string(),
  type: machineTypeSchema,
  nominalRpm: z.number(),
  status: nodeStatusSchema,
  points: z.array(fleetPointSchema),
});
export const fleetAreaSchema = z.object({
  id: z.number().int(),
  name: z.string(),
  machines: z.array(fleetMachineSchema),
});
export const fleetSiteSchema = siteSchema.extend({ areas: z.array(fleetAreaSchema) });
export const fleetSchema = z.object({ items: z.array(fleetSiteSchema) });
export type FleetPoint = z.infer<typeof fleetPointSchema>;
export type FleetMachine = z.infer<typeof fleetMachineSchema>;
export type FleetArea = z.infer<typeof fleetAreaSchema>;
export type FleetSite = z.infer<typeof fleetSiteSchema>;
export type Fleet = z.infer<typeof fleetSchema>;
