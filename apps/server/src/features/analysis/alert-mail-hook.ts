import type { AppContext } from '../../lib/context.ts';
import type { Tx } from './analysis-repository.ts';

/**
 * Where an alert state change becomes e-mail: outbox rows written in the same
 * transaction as the change. Mail delivery itself is the mail feature's.
 */
export async function queueAlertMail(
  _ctx: AppContext,
  _tx: Tx,
  _change: { alertId: number; kind: 'raised' | 'escalated' | 'cleared' },
): Promise<void> {
  // Filled in by the mail feature (subscriptions → outbox); no mail before it exists.
}
