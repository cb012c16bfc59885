/**
 * Reading what the product mailed, as its recipient gets it: the local SMTP fake's messages
 * (sent first: the outbox is drained), the single-use link tokens in them, and the same
 * message as the admin's Mailbox screen shows it.
 */
import { enqueueMail } from '../../apps/server/src/features/mail/outbox-repository.ts';
import type { TestServer } from './test-server.ts';

export interface Received {
  id: number;
  subject: string;
  text: string;
  html: string;
}

/** Queues a message in the outbox as the product does (its bodies the placeholder "body"). */
export function queueMail(
  srv: TestServer,
  m: { to: string; subject: string; dedupeKey: string; kind?: 'test' | 'alert' },
): Promise<void> {
  return enqueueMail(srv.ctx.db, {
    kind: m.kind ?? 'test',
    dedupeKey: m.dedupeKey,
    to: m.to,
    subject: m.subject,
    text: 'body',
    html: '<p>body</p>',
  });
}

/** Sends what is due, then the newest message the SMTP fake received for `to`, or null. */
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- null until it arrives
export async function lastMailTo(srv: TestServer, to: string): Promise<any> {
  await srv.mail.sender.drain();
  const [m] = await srv.q(
    'SELECT id, subject, text_body AS text, html_body AS html FROM mail_messages WHERE mail_to = ? ORDER BY id DESC LIMIT 1',
    [to],
  );
  return (m as Received | undefined) ?? null;
}

/** The same message as the admin's Mailbox shows it. */
export const inMailbox = async (srv: TestServer, admin: string, id: number) =>
  (await srv.call('GET', `/api/v1/mailbox/${id}`, { cookie: admin })).json();

/** The token of a `<page>#token=…` link in a message's text, or null. */
export function tokenIn(srv: TestServer, text: string, page: string): string | null {
  const m = new RegExp(`${srv.url}/${page}#token=([A-Za-z0-9_-]+)`).exec(text);
  return m?.[1] ?? null;
}

export const signInAs = (srv: TestServer, email: string, password: string) =>
  srv.call('POST', '/api/v1/auth/sign-in', { body: { email, password } });

/** The session cookie an answer sets, as a request sends it back. */
export const cookieOf = (res: Response) => (res.headers.get('set-cookie') ?? '').split(';')[0]!;
