import { z } from 'zod';

/**
 * A closed set of choices the API takes and the screens name: the zod enum of the labels'
 * keys (in their order) and the label each choice shows.
 */
export function labelledChoices<const K extends string>(labels: Record<K, string>) {
  return { schema: z.enum(Object.keys(labels) as [K, ...K[]]), labels };
}
