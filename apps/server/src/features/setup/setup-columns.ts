/**
 * The columns that describe a machine and a measurement point, named once by the setup
 * contract's input schemas: setup writes them from its input and answers them in the setup
 * tree, and the demo plant writes a machine's from its scenario. Columns whose missing value
 * means something else where they are used (a machine's area, supply frequency, notes and
 * parts; a point's envelope band) stay with their user.
 */
import { machineInputSchema, pointInputSchema } from '@turnstone/contracts/setup';

export const MACHINE_FIELDS = machineInputSchema
  .keyof()
  .exclude(['areaId', 'lineHz', 'notes', 'bearings', 'gears']).options;

export const POINT_FIELDS = pointInputSchema
  .keyof()
  .exclude(['envelopeLoHz', 'envelopeHiHz']).options;

/** The `keys` of `from`, as an object of their own. */
export function pick<T, K extends keyof T>(from: T, keys: readonly K[]): Pick<T, K> {
  return Object.fromEntries(keys.map((k) => [k, from[k]])) as Pick<T, K>;
}
