import type { Tx } from '@turnstone/db/client';
import { abortsTransaction } from '@turnstone/db/errors';
import type { AppContext } from '../../lib/context.ts';
import { queueAlertChangeMail } from '../mail/alert-mail.ts';
import { queueAlertWebhook } from '../alerts/alerts-service.ts';

/**
 * Where an alert state change becomes e-mail and webhook deliveries: outbox rows written in the same
 * transaction as the change (subscriptions → one row per user per alert event). Sending
 * is the outbox sender's, outside this transaction. A fault while composing the mail is
 * logged and the analysis goes on: mail never blocks analysis (a failed statement in
 * MariaDB does not undo the rest of the transaction). A deadlock, a lock-wait timeout or a
 * lost connection is different: InnoDB has already rolled the whole transaction back, so it
 * is thrown and the batch is written again from the start.
 */
export async function queueAlertMail(
  ctx: AppContext,
  tx: Tx,
  change: { alertId: number; kind: 'raised' | 'escalated' | 'cleared' },
): Promise<void> {
  try {
    await queueAlertChangeMail(ctx, tx, change);
  } catch (err) {
    if (abortsTransaction(err)) throw err;
    ctx.log.error('alert mail could not be queued; the alert stands', { err, ...change });
  }
  try {
    await queueAlertWebhook(tx, change.alertId, change.kind);
  } catch (err) {
    if (abortsTransaction(err)) throw err;
    ctx.log.error('alert webhook could not be queued; the alert stands', { err, ...change });
  }
}
