import type { AppContext } from '../../lib/context.ts';
import type { Tx } from './analysis-repository.ts';
import { queueAlertChangeMail } from '../mail/alert-mail.ts';

/**
 * Where an alert state change becomes e-mail: outbox rows written in the same
 * transaction as the change (subscriptions → one row per user per alert event). Sending
 * is the outbox sender's, outside this transaction, so mail never blocks analysis.
 */
export async function queueAlertMail(
  ctx: AppContext,
  tx: Tx,
  change: { alertId: number; kind: 'raised' | 'escalated' | 'cleared' },
): Promise<void> {
  await queueAlertChangeMail(ctx, tx, change);
}
