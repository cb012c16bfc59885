import type { RetentionPolicyView } from '@turnstone/contracts/retention';
import type { AppContext } from '../../lib/context.ts';
import { RETENTION_CRON, retentionPolicy } from '../worker/retention.ts';

/** The retention policy of this server's configuration, for the administrator. */
export function policyView(ctx: AppContext): RetentionPolicyView {
  return { ...retentionPolicy(ctx.config), schedule: RETENTION_CRON };
}
