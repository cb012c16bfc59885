/**
 * Mail at start: the local SMTP fake when SMTP_URL is unset, the link base in settings,
 * and — in the process that runs the worker — the outbox sender and the digest schedule.
 */
import cron, { type ScheduledTask } from 'node-cron';
import type { AppContext } from '../../lib/context.ts';
import { startSmtpFake, type SmtpFake } from './smtp-fake.ts';
import { createOutboxSender, type OutboxSender } from './outbox-sender.ts';
import { loadRuntime, saveRuntime } from './outbox-repository.ts';
import { queueWeeklyDigests } from './digest-service.ts';
import { firstSiteTimeZone } from './mail-repository.ts';

export interface MailRuntime {
  fake: SmtpFake | null;
  smtpUrl: string;
  sender: OutboxSender;
  stop(): Promise<void>;
}

async function digestTimeZone(ctx: AppContext): Promise<string> {
  if (ctx.config.DIGEST_TIME_ZONE) return ctx.config.DIGEST_TIME_ZONE;
  return (await firstSiteTimeZone(ctx.db)) ?? 'UTC';
}

/** In the web process: `listenUrl` is where the app answers (links use PUBLIC_URL first). */
export async function startMail(
  ctx: AppContext,
  options: { listenUrl: string; runSender: boolean },
): Promise<MailRuntime> {
  const fake = ctx.config.SMTP_URL ? null : await startSmtpFake(ctx.db, ctx.log);
  const smtpUrl = ctx.config.SMTP_URL ?? fake!.url;
  await saveRuntime(ctx.db, { baseUrl: options.listenUrl, fakeSmtpUrl: fake?.url ?? null });
  const sender = createOutboxSender(ctx, { smtpUrl, canConfirmArrival: fake !== null });
  const tasks: ScheduledTask[] = [];
  if (options.runSender) {
    sender.start();
    tasks.push(
      cron.schedule(
        ctx.config.DIGEST_CRON,
        async () => {
          try {
            await queueWeeklyDigests(ctx);
          } catch (err) {
            ctx.log.error('weekly digest failed', { err });
          }
        },
        { noOverlap: true, name: 'digest', timezone: await digestTimeZone(ctx) },
      ),
    );
  }
  return {
    fake,
    smtpUrl,
    sender,
    async stop() {
      for (const t of tasks.splice(0)) await t.stop();
      await sender.stop();
      await fake?.stop();
    },
  };
}

/** In a worker-only process: send through the relay the web process recorded. */
export async function startMailWorker(ctx: AppContext): Promise<OutboxSender | null> {
  const runtime = await loadRuntime(ctx.db);
  const smtpUrl = ctx.config.SMTP_URL ?? runtime?.fakeSmtpUrl;
  if (!smtpUrl) return null;
  const sender = createOutboxSender(ctx, { smtpUrl, canConfirmArrival: !ctx.config.SMTP_URL });
  sender.start();
  return sender;
}
