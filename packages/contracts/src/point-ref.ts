import { z } from 'zod';

/**
 * Where a row's point sits, as lists and tables name it: the point, its machine and its site.
 * Spread into a row's object schema (`z.object({ ...pointRefShape, … })`).
 */
export const pointRefShape = {
  pointId: z.number().int(),
  pointTag: z.string(),
  pointName: z.string(),
  machineId: z.number().int(),
  machineName: z.string(),
  siteId: z.number().int(),
  siteCode: z.string(),
};

/** The band a row is about: its key, the name it shows and the unit of its values. */
export const bandRefShape = {
  bandKey: z.string(),
  bandName: z.string(),
  unit: z.string(),
};
