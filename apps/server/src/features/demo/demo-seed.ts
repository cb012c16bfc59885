/**
 * Seeds the demo plant (@turnstone/demo-scenario) and one user per role into an empty database.
 * Runs at start when SEED_DEMO is not false and there are no users yet; then, when
 * DEMO_HISTORY_WEEKS > 0, that many weeks of captures through the real pipeline
 * (demo-history.ts).
 */
import type { AppContext } from '../../lib/context.ts';
import { hashPassword } from '../../lib/passwords.ts';
import { seedDemoSubscriptions } from '../mail/mail-seed.ts';
import { demoUsers } from '@turnstone/demo-scenario/demo-plant';
import { insertDemoPlant, userCount } from './demo-repository.ts';
import { commissionDemoGateways, seedDemoHistory } from './demo-history.ts';

export const DEMO_ACCOUNTS = demoUsers.map((u) => ({ email: u.email, role: u.role }));

export async function seedIfEmpty(ctx: AppContext, say: (m: string) => void): Promise<boolean> {
  if ((await userCount(ctx.db)) > 0) return false;
  const t0 = Date.now();
  await seedPlant(ctx);
  await seedDemoSubscriptions(ctx);
  const gatewayOf = await commissionDemoGateways(ctx);
  say(`Seeded the demo plant in ${Date.now() - t0} ms.`);
  const weeks = ctx.config.DEMO_HISTORY_WEEKS;
  if (weeks > 0) {
    say(`Generating ${weeks} weeks of demo history through the analysis pipeline…`);
    await seedDemoHistory(ctx, weeks, say, gatewayOf);
  }
  return true;
}

export async function seedPlant(ctx: AppContext): Promise<void> {
  const hash = await hashPassword(ctx.config.DEMO_PASSWORD);
  await insertDemoPlant(ctx.db, hash);
}
