/**
 * `npm run worker`: one queue worker on its own, for running several beside the web
 * process. Uses DATABASE_URL, or the private MariaDB that `npm start` runs on DATA_DIR.
 */
import { resolve } from 'node:path';
import { createDb } from '@turnstone/db/client';
import { runningLocalUrl } from '@turnstone/db/local-server';
import { assertNotNewer } from '@turnstone/db/migrate';
import { describeConnectionError } from '@turnstone/db/errors';
import { loadConfig } from './config.ts';
import { createLogger } from './lib/logger.ts';
import { createWorker } from './features/worker/worker.ts';
import { startMailWorker } from './features/mail/mail-runtime.ts';
import { createWebhookSender } from './features/webhooks/webhook-sender.ts';

let config;
try {
  config = loadConfig();
} catch (err) {
  process.stderr.write(`Turnstone worker could not start: ${(err as Error).message}\n`);
  process.exit(1);
}
const log = createLogger(config.LOG_LEVEL);
const dataDir = resolve(config.DATA_DIR);
const url = config.DATABASE_URL ?? runningLocalUrl(dataDir);
if (!url) {
  process.stderr.write(
    'No database: set DATABASE_URL, or start the product first (npm start) with the same DATA_DIR.\n',
  );
  process.exit(1);
}
const dbHandle = createDb(url);
// The web process migrates; a worker never runs on a database newer than its code.
await assertNotNewer(dbHandle.pool).catch((err: Error) => {
  const why = describeConnectionError(err, url) ?? err.message;
  process.stderr.write(`Turnstone worker could not start: ${why}\n`);
  process.exit(1);
});
const ctx = { config, db: dbHandle.db, dbHandle, log, jwtSecret: '', dataDir };
const worker = createWorker(ctx);
worker.start();
// The outbox is sent by every worker process; claims are leased, so several can share it.
const mail = await startMailWorker(ctx);
// Webhook deliveries likewise: leased claims, so every worker process may send them.
const webhooks = createWebhookSender(ctx);
webhooks.start();
log.info('worker started', { owner: worker.owner });
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.once(signal, async () => {
    await worker.stop();
    await mail?.stop();
    await webhooks.stop();
    await dbHandle.close();
    process.exit(0);
  });
}
