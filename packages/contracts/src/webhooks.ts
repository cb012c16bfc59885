import { z } from 'zod';
import { oneLine } from './text.ts';

/**
 * Outgoing webhooks: an administrator names a URL and the events it wants; each event is
 * POSTed there as JSON, signed as the Standard Webhooks specification describes
 * (`webhook-id`, `webhook-timestamp`, `webhook-signature: v1,<base64 HMAC-SHA256 of
 * "id.timestamp.body">` under the secret shown once at creation).
 */
export const webhookEventTypes = [
  'alert.raised',
  'alert.escalated',
  'alert.acknowledged',
  'alert.cleared',
  'finding.created',
  'finding.updated',
] as const;
export const webhookEventTypeSchema = z.enum(webhookEventTypes);
export type WebhookEventType = z.infer<typeof webhookEventTypeSchema>;

const url = z
  .string()
  .trim()
  .max(2000, 'At most 2000 characters.')
  .url('Give the full URL, e.g. https://cmms.example.org/hooks/turnstone.')
  .refine((u) => /^https?:\/\//i.test(u), 'Use an http:// or https:// URL.');
const name = oneLine(z.string().trim().min(1, 'Name the receiver.').max(200));
const events = z
  .array(webhookEventTypeSchema)
  .min(1, 'Choose at least one event.')
  .transform((e) => [...new Set(e)]);

export const webhookSchema = z.object({
  id: z.number().int(),
  name: z.string(),
  url: z.string(),
  events: z.array(webhookEventTypeSchema),
  enabled: z.boolean(),
  createdAt: z.string(),
  updatedAt: z.string(),
  /** Deliveries waiting for a retry, and those given up (`failed`, `uncertain`). */
  pending: z.number().int(),
  undelivered: z.number().int(),
});
export type Webhook = z.infer<typeof webhookSchema>;
export const webhookListSchema = z.object({ items: z.array(webhookSchema) });

/** `POST /api/v1/webhooks` */
export const createWebhookSchema = z.object({ name, url, events });
export type CreateWebhook = z.input<typeof createWebhookSchema>;
/** The answer to creating: the signing secret, this once (`whsec_` + base64 of 32 bytes). */
export const createdWebhookSchema = webhookSchema.extend({ secret: z.string() });

/** `PATCH /api/v1/webhooks/:id` */
export const updateWebhookSchema = z
  .object({
    name: name.optional(),
    url: url.optional(),
    events: events.optional(),
    enabled: z.boolean().optional(),
  })
  .refine((v) => Object.values(v).some((x) => x !== undefined), { message: 'Nothing to change' });

/** What a receiver gets: the body of every delivery. */
export const webhookEventSchema = z.object({
  /** The event's id, also in the `webhook-id` header: the same on every retry of it. */
  id: z.string(),
  type: webhookEventTypeSchema,
  occurredAt: z.string(),
  data: z.record(z.string(), z.unknown()),
});
export type WebhookEvent = z.infer<typeof webhookEventSchema>;

export const webhookDeliverySchema = z.object({
  id: z.number().int(),
  eventId: z.string(),
  eventType: z.string(),
  attempts: z.number().int(),
  createdAt: z.string(),
  sentAt: z.string().nullable(),
  nextAttemptAt: z.string(),
  lastStatus: z.number().int().nullable(),
  lastError: z.string().nullable(),
  outcome: z.enum(['sent', 'failed', 'uncertain']).nullable(),
});
export const webhookDeliveryListSchema = z.object({ items: z.array(webhookDeliverySchema) });
