/**
 * `start()` brings up everything `npm start` promises — database (private or configured),
 * migrations, demo seed, web build, HTTP server, worker — and `stop()` takes it down in
 * reverse order. Tests run the real server in-process with PORT=0.
 */
import { mkdirSync } from 'node:fs';
import { resolve } from 'node:path';
import type { AddressInfo } from 'node:net';
import { createServer, type Server } from 'node:http';
import { createDb } from '@turnstone/db/client';
import { runMigrations } from '@turnstone/db/migrate';
import { describeConnectionError } from '@turnstone/db/errors';
import { startLocalMariadb, type LocalMariadb } from '@turnstone/db/local-server';
import { loadConfig, type Config } from './config.ts';
import { httpHandler } from './app.ts';
import type { AppContext } from './lib/context.ts';
import { createLogger } from './lib/logger.ts';
import { loadOrCreateSecrets } from './lib/secrets.ts';
import { checkSessionKey } from './lib/session-key-check.ts';
import { ensureWebBuilt } from './lib/web-build.ts';
import { backup } from './backup/backup.ts';
import { seedIfEmpty } from './features/demo/demo-seed.ts';
import { fillMissingBandDaySums } from './features/analysis/band-day-sums.ts';
import { fillMissingBandHours } from './features/analysis/band-hours.ts';
import { checkDemoExposure } from './features/demo/demo-exposure.ts';
import { createWorker, type Worker } from './features/worker/worker.ts';
import { startMail, type MailRuntime } from './features/mail/mail-runtime.ts';
import { createWebhookSender, type WebhookSender } from './features/webhooks/webhook-sender.ts';

export interface RunningServer {
  url: string;
  port: number;
  ctx: AppContext;
  /** The in-process worker when RUN_WORKER is on. */
  worker: Worker | null;
  /** The SMTP fake (when SMTP_URL is unset) and the outbox sender (ticking when RUN_WORKER). */
  mail: MailRuntime;
  /** The webhook deliveries' sender (ticking when RUN_WORKER; tests call drain()). */
  webhooks: WebhookSender;
  stop(): Promise<void>;
}

export async function start(env: Record<string, string | undefined> = {}): Promise<RunningServer> {
  const config: Config = loadConfig({ ...process.env, ...env });
  const log = createLogger(config.LOG_LEVEL);
  const say = (m: string) => log.info(m);
  const dataDir = resolve(config.DATA_DIR);
  mkdirSync(dataDir, { recursive: true });
  const secrets = loadOrCreateSecrets(dataDir);

  let localDb: LocalMariadb | null = null;
  let url = config.DATABASE_URL;
  if (!url) {
    localDb = await startLocalMariadb({ dataDir, port: config.DB_PORT, log: say });
    url = localDb.url;
  }
  const dbHandle = createDb(url, {
    connectionLimit: 20,
    batchConnectionLimit: 32,
    replicaUrls: config.DATABASE_REPLICA_URLS,
    maxReplicaLagSeconds: config.REPLICA_MAX_LAG_S,
  });
  const cleanup: Array<() => Promise<void>> = [];
  try {
    await runMigrations(dbHandle, {
      log: say,
      // A destructive migration (see packages/db/src/migrate.ts) is preceded by a backup.
      beforeDestructive: async (pending) => {
        const tags = pending.filter((m) => m.destructive.length > 0).map((m) => m.tag);
        say(`Migration(s) ${tags.join(', ')} change or remove stored data; backing up first…`);
        const { dir } = await backup({
          dataDir,
          databaseUrl: url,
          reason: `before migrations ${pending.map((m) => m.tag).join(', ')}`,
          log: say,
        });
        say(`Backup before the upgrade written to ${dir}.`);
      },
    }).catch((err: unknown) => {
      // The first query is the migrations table; name the real reason it failed.
      const why = describeConnectionError(err, url);
      throw why ? new Error(why, { cause: err }) : err;
    });
    const ctx: AppContext = {
      config,
      db: dbHandle.db,
      dbHandle,
      log,
      jwtSecret: config.JWT_SECRET ?? secrets.jwtSecret,
      dataDir,
    };
    const keyCheck = await checkSessionKey(ctx.db, ctx.jwtSecret, {
      replace: config.JWT_SECRET_REPLACE,
    });
    if (keyCheck === 'replaced') log.warn('session key replaced: every earlier session has ended');
    await fillMissingBandDaySums(ctx.db, say);
    await fillMissingBandHours(ctx.db, say);
    if (config.SEED_DEMO) await seedIfEmpty(ctx, say);
    await checkDemoExposure(ctx);
    if (config.BUILD_WEB) await ensureWebBuilt(say);

    const server: Server = await new Promise((resolveListen, reject) => {
      const s = createServer(httpHandler(ctx));
      // Idle keep-alive connections are closed by the client, not raced by the server: with
      // Node's 5 s default, a gateway (or a test client in this process, after the event loop
      // was busy) could send a request on a socket the server was closing (ECONNRESET). The
      // server announces the longer timeout in its Keep-Alive header, so clients stay below it.
      s.keepAliveTimeout = 65_000;
      s.on('error', reject);
      s.listen(config.PORT, config.HOST, () => resolveListen(s));
    });
    const port = (server.address() as AddressInfo).port;
    const mail = await startMail(ctx, {
      listenUrl: `http://${config.HOST === '0.0.0.0' ? '127.0.0.1' : config.HOST}:${port}`,
      runSender: config.RUN_WORKER,
    });
    cleanup.push(() => mail.stop());
    const webhooks = createWebhookSender(ctx);
    if (config.RUN_WORKER) webhooks.start();
    cleanup.push(() => webhooks.stop());
    let worker: Worker | null = null;
    if (config.RUN_WORKER) {
      worker = createWorker(ctx);
      worker.start();
      cleanup.push(() => worker!.stop());
    }
    const host = config.HOST === '0.0.0.0' ? '127.0.0.1' : config.HOST;
    const publicUrl = `http://${host}:${port}`;

    let stopped: Promise<void> | null = null;
    const stop = () => {
      stopped ??= (async () => {
        for (const fn of cleanup.reverse())
          await fn().catch((e) => log.warn('stop step failed', { err: e }));
        // Stop accepting, let requests in flight finish for up to 2 s, then cut what is left
        // (a client that never reads its answer would otherwise hold the stop for ever).
        const closed = new Promise<void>((r) => server.close(() => r()));
        server.closeIdleConnections?.();
        const grace = new Promise<void>((r) => setTimeout(r, 2000).unref());
        await Promise.race([closed, grace]);
        server.closeAllConnections?.();
        await closed;
        await dbHandle.close().catch(() => {});
        await localDb?.stop();
      })();
      return stopped;
    };
    return { url: publicUrl, port, ctx, worker, mail, webhooks, stop };
  } catch (err) {
    await dbHandle.close().catch(() => {});
    await localDb?.stop();
    throw err;
  }
}
