import { z } from 'zod';

export const mailboxItemSchema = z.object({
  id: z.number().int(),
  to: z.string(),
  subject: z.string(),
  receivedAt: z.string(),
});
export type MailboxItem = z.infer<typeof mailboxItemSchema>;

export const mailboxListSchema = z.object({ items: z.array(mailboxItemSchema) });

export const mailboxMessageSchema = mailboxItemSchema.extend({
  from: z.string(),
  messageId: z.string().nullable(),
  headers: z.record(z.string(), z.string()),
  text: z.string().nullable(),
  /** Sanitised: no scripts, frames, event handlers or javascript: links. Show it sandboxed. */
  html: z.string().nullable(),
});
export type MailboxMessage = z.infer<typeof mailboxMessageSchema>;

/**
 * An outgoing message that has not been delivered: still being retried after a refusal,
 * `failed` after its last attempt, or `uncertain` (a send started and its worker died; the
 * relay cannot say whether it arrived, so it is not sent again by itself).
 */
export const undeliveredMailSchema = z.object({
  id: z.number().int(),
  kind: z.string(),
  to: z.string(),
  subject: z.string(),
  attempts: z.number().int(),
  state: z.enum(['retrying', 'failed', 'uncertain']),
  lastError: z.string().nullable(),
  createdAt: z.string(),
  nextAttemptAt: z.string().nullable(),
});
export type UndeliveredMail = z.infer<typeof undeliveredMailSchema>;
export const undeliveredMailListSchema = z.object({ items: z.array(undeliveredMailSchema) });

/** `GET /api/v1/mailbox?search=`: words found in the recipient or the subject. */
export const mailboxQuerySchema = z.object({
  search: z.string().trim().max(200).optional(),
});
