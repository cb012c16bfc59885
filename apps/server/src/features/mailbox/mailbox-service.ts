/** What the local SMTP fake received, for the admin's Mailbox screen. */
import { desc, eq } from 'drizzle-orm';
import { mailMessages } from '@turnstone/db/schema';
import type { Db } from '@turnstone/db/client';
import type { MailboxMessage } from '@turnstone/contracts/mail';
import { notFound } from '../../lib/app-error.ts';

export async function listMailbox(db: Db, limit = 200) {
  const rows = await db
    .select({
      id: mailMessages.id,
      to: mailMessages.mailTo,
      subject: mailMessages.subject,
      receivedAt: mailMessages.receivedAt,
    })
    .from(mailMessages)
    .orderBy(desc(mailMessages.receivedAt), desc(mailMessages.id))
    .limit(limit);
  return { items: rows.map((r) => ({ ...r, receivedAt: r.receivedAt.toISOString() })) };
}

/**
 * Strips what could run or reach out from received HTML: scripts, frames, objects,
 * forms, event-handler attributes and javascript:/data: URLs. The screen also shows the
 * result in an iframe with an empty `sandbox`, so this is the second fence, not the only.
 */
export function sanitizeHtml(html: string): string {
  return html
    .replace(
      /<(script|style|iframe|object|embed|form|frame|frameset|meta|link|base)\b[\s\S]*?<\/\1\s*>/gi,
      '',
    )
    .replace(
      /<\/?(script|style|iframe|object|embed|form|frame|frameset|meta|link|base)\b[^>]*>/gi,
      '',
    )
    .replace(/\s+on[a-z]+\s*=\s*("[^"]*"|'[^']*'|[^\s>]+)/gi, '')
    .replace(
      /\s+(href|src|action|formaction|xlink:href)\s*=\s*("\s*(javascript|data|vbscript):[^"]*"|'\s*(javascript|data|vbscript):[^']*'|(javascript|data|vbscript):[^\s>]*)/gi,
      ' $1="#"',
    );
}

export async function readMessage(db: Db, id: number): Promise<MailboxMessage> {
  const [m] = await db.select().from(mailMessages).where(eq(mailMessages.id, id)).limit(1);
  if (!m) throw notFound('Message');
  return {
    id: m.id,
    to: m.mailTo,
    from: m.mailFrom,
    subject: m.subject,
    receivedAt: m.receivedAt.toISOString(),
    messageId: m.messageId,
    headers: m.headers,
    text: m.textBody,
    html: m.htmlBody === null ? null : sanitizeHtml(m.htmlBody),
  };
}
