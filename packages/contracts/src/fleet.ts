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
