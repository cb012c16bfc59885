/** What the local SMTP fake received, for the admin's Mailbox screen. */
import sanitize from 'sanitize-html';
import type { Db } from '@turnstone/db/client';
import type { MailboxMessage, UndeliveredMail } from '@turnstone/contracts/mail';
import { AppError, notFound } from '../../lib/app-error.ts';
import type { SessionUser } from '../../lib/session-user.ts';
import { writeAudit } from '../audit/audit-repository.ts';
import { listUndelivered, requeueUndelivered, type OutboxRow } from '../mail/outbox-repository.ts';
import { maskLinkTokens } from '../mail/link-tokens.ts';
import { findReceivedMail, listReceivedMail } from '../mail/mail-repository.ts';
import { safeImageSrc } from '../mail/inline-images.ts';

export async function listMailbox(db: Db, search?: string, limit = 200) {
  const rows = await listReceivedMail(db, limit, search || undefined);
  return { items: rows.map((r) => ({ ...r, receivedAt: r.receivedAt.toISOString() })) };
}

/**
 * Received HTML through sanitize-html (an allow-list parser, not patterns): only ordinary
 * markup survives, links keep http(s)/mailto only, inline styles only from a short list of
 * safe properties (no url()). The screen also shows the result in an iframe with an empty
 * `sandbox`, so this is the second fence, not the only.
 */
const SAFE_VALUE = [/^[-#%.,\w\s/'"]+$/];
const SAFE_STYLE = Object.fromEntries(
  [
    'margin',
    'margin-top',
    'margin-bottom',
    'padding',
    'background',
    'background-color',
    'color',
    'font-family',
    'font-size',
    'font-weight',
    'line-height',
    'text-align',
    'vertical-align',
    'border',
    'border-collapse',
    'max-width',
    'width',
  ].map((p) => [p, SAFE_VALUE]),
);

export function sanitizeHtml(html: string): string {
  return sanitize(html, {
    allowedTags: [...sanitize.defaults.allowedTags, 'img', 'h1', 'h2'],
    allowedAttributes: {
      a: ['href', 'title'],
      img: ['src', 'alt', 'width', 'height'],
      td: ['colspan', 'rowspan'],
      th: ['colspan', 'rowspan', 'scope'],
      '*': ['style'],
    },
    allowedSchemes: ['http', 'https', 'mailto'],
    allowedSchemesByTag: { img: ['cid', 'data'] },
    // Inline pictures: data: URIs of images only, an SVG's content through its own allow-list.
    transformTags: {
      img: (tagName, attribs) => {
        const { src, ...rest } = attribs;
        const safe = safeImageSrc(src);
        return { tagName, attribs: safe ? { ...rest, src: safe } : rest };
      },
    },
    allowProtocolRelative: false,
    allowedStyles: { '*': SAFE_STYLE },
    disallowedTagsMode: 'discard',
  });
}

/**
 * One received message. A sign-in link (invite, password reset) in mail to someone else is
 * shown with its token hidden: the administrator sees that it was sent, not a working link
 * to another person's account.
 */
export async function readMessage(
  db: Db,
  id: number,
  viewer: Pick<SessionUser, 'email'>,
): Promise<MailboxMessage> {
  const found = await findReceivedMail(db, id);
  if (!found) throw notFound('Message');
  const own = found.mailTo
    .split(',')
    .every((to) => to.trim().toLowerCase() === viewer.email.toLowerCase());
  const m = own
    ? found
    : {
        ...found,
        textBody: maskLinkTokens(found.textBody),
        htmlBody: maskLinkTokens(found.htmlBody),
      };
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

const undeliveredState = (r: OutboxRow): UndeliveredMail['state'] =>
  r.outcome === 'failed' ? 'failed' : r.outcome === 'uncertain' ? 'uncertain' : 'retrying';

/** Outgoing mail that was not delivered (any relay, the fake or a real one). */
export async function listUndeliveredMail(db: Db): Promise<{ items: UndeliveredMail[] }> {
  const rows = await listUndelivered(db);
  return {
    items: rows.map((r) => ({
      id: r.id,
      kind: r.kind,
      to: r.toAddress,
      subject: r.subject,
      attempts: r.attempts,
      state: undeliveredState(r),
      lastError: r.lastError,
      createdAt: r.createdAt.toISOString(),
      nextAttemptAt: r.outcome ? null : r.nextAttemptAt.toISOString(),
    })),
  };
}

/** Sends a failed or uncertain message again (audited: an uncertain one may arrive twice). */
export async function resendMail(db: Db, user: SessionUser, id: number): Promise<void> {
  await db.transaction(async (tx) => {
    const before = await requeueUndelivered(tx, id);
    if (!before)
      throw new AppError(
        'not_undelivered',
        'Only a message that failed or whose delivery is uncertain can be sent again.',
        409,
      );
    await writeAudit(tx, {
      actorUserId: user.id,
      action: 'mail.resend',
      entity: 'outbox',
      entityId: id,
      siteId: null,
      before: {
        to: before.toAddress,
        subject: before.subject,
        outcome: before.outcome,
        attempts: before.attempts,
        lastError: before.lastError,
      },
    });
  });
}
