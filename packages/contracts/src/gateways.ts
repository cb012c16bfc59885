import { z } from 'zod';
import { oneLine } from './text.ts';

export const createGatewaySchema = z.object({
  siteId: z.number({ error: 'Choose a site.' }).int().positive('Choose a site.'),
  name: oneLine(
    z.string().trim().min(1, 'Name is required.').max(200, 'Name is at most 200 characters.'),
  ),
});
export type CreateGatewayInput = z.infer<typeof createGatewaySchema>;

export const gatewaySchema = z.object({
  id: z.number().int(),
  siteId: z.number().int(),
  siteName: z.string(),
  siteCode: z.string(),
  name: z.string(),
  /** The key's public first part (`tsg_<prefix>_…`); never the key itself. */
  keyPrefix: z.string(),
  revokedAt: z.string().nullable(),
  lastSeenAt: z.string().nullable(),
  /** Captures the gateway posted in the last hour (its recent post rate, per hour). */
  postsLastHour: z.number().int(),
  createdAt: z.string(),
});
export type Gateway = z.infer<typeof gatewaySchema>;
export const gatewayListSchema = z.object({ items: z.array(gatewaySchema) });

/** The answer to create and rotate: the only time the key is ever sent. */
export const gatewayKeySchema = z.object({
  id: z.number().int(),
  apiKey: z.string(),
  keyPrefix: z.string(),
});
export type GatewayKey = z.infer<typeof gatewayKeySchema>;
