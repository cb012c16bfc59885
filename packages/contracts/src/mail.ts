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
