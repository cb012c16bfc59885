/**
 * Seeds the demo plant (@turnstone/demo-scenario) and one user per role into an empty database.
 * Runs at start when SEED_DEMO is not false and there are no users yet; then, when
 * DEMO_HISTORY_WEEKS > 0, that many weeks of captures through the real pipeline
 * (demo-history.ts).
 */
import { count } from 'drizzle-orm';
import {
  areas,
  bearings,
  gears,
  machines,
  points,
  sites,
  userSites,
  users,
} from '@turnstone/db/schema';
import type { AppContext } from '../../lib/context.ts';
import { hashPassword } from '../../lib/passwords.ts';
import { seedDemoSubscriptions } from '../mail/mail-seed.ts';
import { subscribeToSiteAlerts } from '../account/account-repository.ts';
import { demoPlant, demoUsers } from '@turnstone/demo-scenario/demo-plant';
import { commissionDemoGateways, seedDemoHistory } from './demo-history.ts';

export const DEMO_ACCOUNTS = demoUsers.map((u) => ({ email: u.email, role: u.role }));

export async function seedIfEmpty(ctx: AppContext, say: (m: string) => void): Promise<boolean> {
  const [row] = await ctx.db.select({ n: count() }).from(users);
  if ((row?.n ?? 0) > 0) return false;
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
  await ctx.db.transaction(async (tx) => {
    const siteIds = new Map<string, number>();
    for (const site of demoPlant) {
      const [s] = await tx
        .insert(sites)
        .values({ code: site.code, name: site.name, timeZone: site.timeZone })
        .$returningId();
      siteIds.set(site.code, s!.id);
      for (const area of site.areas) {
        const [a] = await tx
          .insert(areas)
          .values({ siteId: s!.id, name: area.name })
          .$returningId();
        for (const m of area.machines) {
          const [mach] = await tx
            .insert(machines)
            .values({
              areaId: a!.id,
              name: m.name,
              type: m.type,
              nominalRpm: m.nominalRpm,
              isoGroup: m.isoGroup,
              foundation: m.foundation,
              criticality: m.criticality,
              powerKw: m.powerKw,
              bladeCount: m.bladeCount ?? null,
              vaneCount: m.vaneCount ?? null,
              lineHz: m.lineHz,
              notes: `Demo story: ${m.story}.`,
            })
            .$returningId();
          const bearingIds = new Map<string, number>();
          for (const b of m.bearings) {
            const [bi] = await tx
              .insert(bearings)
              .values({ machineId: mach!.id, ...b, speedRatio: b.speedRatio ?? 1 })
              .$returningId();
            bearingIds.set(b.name, bi!.id);
          }
          for (const g of m.gears ?? [])
            await tx.insert(gears).values({ machineId: mach!.id, ...g });
          for (const p of m.points) {
            await tx.insert(points).values({
              machineId: mach!.id,
              siteId: s!.id,
              tag: `${site.code}-${m.code}-${p.suffix}`,
              name: p.name,
              location: p.location,
              direction: p.direction,
              sensitivityMvPerG: p.sensitivityMvPerG,
              bearingId: p.bearing ? (bearingIds.get(p.bearing) ?? null) : null,
            });
          }
        }
      }
    }
    for (const u of demoUsers) {
      const [ui] = await tx
        .insert(users)
        .values({ email: u.email, name: u.name, role: u.role, passwordHash: hash })
        .$returningId();
      for (const code of u.sites)
        await tx.insert(userSites).values({ userId: ui!.id, siteId: siteIds.get(code)! });
      // The default every operator gets when made (see users-service): their sites' alerts.
      if (u.role === 'operator')
        await subscribeToSiteAlerts(
          tx,
          ui!.id,
          u.sites.map((code) => siteIds.get(code)!),
        );
    }
  });
}
