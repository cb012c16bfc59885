/**
 * The local SMTP fake (npm smtp-server + mailparser): listens on loopback, accepts every
 * message without authentication and keeps it in `mail_messages` for the Mailbox screen, its
 * inline pictures (CID parts) embedded in the HTML as data: URIs (inline-images.ts).
 * Stands in for the site's relay when SMTP_URL is unset; never listens on other interfaces.
 */
import type { AddressInfo } from 'node:net';
import { SMTPServer } from 'smtp-server';
import { simpleParser, type AddressObject } from 'mailparser';
import type { Db } from '@turnstone/db/client';
import type { Logger } from '../../lib/logger.ts';
import { storeReceivedMail } from './mail-repository.ts';
import { embedInlineParts } from './inline-images.ts';

export interface SmtpFake {
  url: string;
  port: number;
  stop(): Promise<void>;
}

const MAX_BYTES = 5 * 1024 * 1024;

const addressText = (a: AddressObject | AddressObject[] | undefined) =>
  (Array.isArray(a) ? a : a ? [a] : []).map((x) => x.text).join(', ');

export async function startSmtpFake(db: Db, log: Logger, port = 0): Promise<SmtpFake> {
  const server = new SMTPServer({
    secure: false,
    authOptional: true,
    disabledCommands: ['AUTH', 'STARTTLS'],
    size: MAX_BYTES,
    banner: 'Turnstone local mail fake',
    logger: false,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then(async (mail) => {
          const headers: Record<string, string> = {};
          for (const line of mail.headerLines)
            headers[line.key] = line.line.slice(line.key.length + 1).trim();
          await storeReceivedMail(db, {
            messageId: mail.messageId ?? null,
            mailFrom:
              (session.envelope.mailFrom && session.envelope.mailFrom.address) ||
              addressText(mail.from),
            mailTo: session.envelope.rcptTo.map((r) => r.address).join(', '),
            subject: (mail.subject ?? '').slice(0, 500),
            headers,
            textBody: mail.text ?? null,
            // Inline pictures (CID parts) are kept inside the HTML as data: URIs.
            htmlBody:
              typeof mail.html === 'string' ? embedInlineParts(mail.html, mail.attachments) : null,
          });
          callback();
        })
        .catch((err: Error) => {
          log.warn('mail fake could not keep a message', { err });
          callback(
            Object.assign(new Error('451 could not store the message'), { responseCode: 451 }),
          );
        });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => resolve());
  });
  server.on('error', (err) => log.warn('mail fake error', { err }));
  const bound = (server.server.address() as AddressInfo).port;
  return {
    url: `smtp://127.0.0.1:${bound}`,
    port: bound,
    stop: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
