import type { AppContext } from '../../lib/context.ts';
import { isDbUnavailable } from '../../lib/error-middleware.ts';
import type { Tx } from './analysis-repository.ts';
import { queueAlertChangeMail } from '../mail/alert-mail.ts';

// InnoDB rolls the whole transaction back on these; the job must retry, not carry on.
const TX_ABORTING = new Set(['ER_LOCK_DEADLOCK', 'ER_LOCK_WAIT_TIMEOUT']);

/**
 * Where an alert state change becomes e-mail: outbox rows written in the same
 * transaction as the change (subscriptions → one row per user per alert event). Sending
 * is the outbox sender's, outside this transaction. A fault while composing the mail is
 * logged and the analysis goes on: mail never blocks analysis (a failed statement in
 * MariaDB does not undo the rest of the transaction).
 */
export async function queueAlertMail(
  ctx: AppContext,
  tx: Tx,
  change: { alertId: number; kind: 'raised' | 'escalated' | 'cleared' },
): Promise<void> {
  try {
    await queueAlertChangeMail(ctx, tx, change);
  } catch (err) {
    const code = (err as { code?: unknown }).code;
    if (isDbUnavailable(err) || (typeof code === 'string' && TX_ABORTING.has(code))) throw err;
    ctx.log.error('alert mail could not be queued; the alert stands', { err, ...change });
  }
}
