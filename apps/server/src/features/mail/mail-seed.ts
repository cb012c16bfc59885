import type { AppContext } from '../../lib/context.ts';
import { addSubscriptions, allSiteIds, usersByEmail } from './mail-repository.ts';

/**
 * Demo notification settings: the engineer hears of every alert at once on both sites;
 * the planner hears of danger at once and gets the Monday digest. The operator has the
 * default every operator gets (their sites' alerts at once), given when the user was made.
 */
export async function seedDemoSubscriptions(ctx: AppContext): Promise<void> {
  const people = await usersByEmail(ctx.db, [
    'engineer@turnstone.local',
    'planner@turnstone.local',
  ]);
  const siteRows = await allSiteIds(ctx.db);
  const rows = [];
  for (const p of people) {
    for (const s of siteRows) {
      rows.push(
        p.email.startsWith('engineer')
          ? {
              userId: p.id,
              siteId: s.id,
              minLevel: 'alert' as const,
              cadence: 'immediate' as const,
            }
          : {
              userId: p.id,
              siteId: s.id,
              minLevel: 'danger' as const,
              cadence: 'immediate' as const,
              weeklyDigest: true,
            },
      );
    }
  }
  await addSubscriptions(ctx.db, rows);
}
