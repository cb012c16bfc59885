/**
 * Nightly: bands with a statistical rule whose baseline is not yet established get it
 * from their stored trend (mean and σ over the first N good values or the chosen period),
 * so the level mean + k·σ applies from then on. Each change is audited.
 */

import { computeBaseline, type BandDefinition as LimitBand } from '@turnstone/condition';

import type { AppContext } from '../../lib/context.ts';
import { loadLimitSet, pointsWithLimitSets, saveLimitSet } from './limit-set-repository.ts';
import { bandTrend } from './limits-repository.ts';
import { writeAudit } from '../audit/audit-repository.ts';

export async function baselineFor(ctx: AppContext, pointId: number, band: LimitBand) {
  const rule = band.statistical;
  if (!rule) return null;
  const rows = await bandTrend(
    ctx.db,
    pointId,
    band.key,
    rule.baseline.from === 'first-n' ? Math.max(rule.baseline.count * 3, 100) : 100_000,
  );
  return computeBaseline(
    rule.baseline,
    rows.map((r) => ({ takenAt: r.takenAt.getTime(), value: r.value, quality: r.quality })),
    { includeSuspect: rule.includeSuspect ?? true },
  );
}

export async function recomputeBaselines(ctx: AppContext): Promise<number> {
  let changed = 0;
  for (const pointId of await pointsWithLimitSets(ctx.db)) {
    const set = await loadLimitSet(ctx.db, pointId);
    if (!set) continue;
    let touched = false;
    const next: LimitBand[] = [];
    for (const band of set.bands) {
      if (band.statistical && !band.statistical.established) {
        const stats = await baselineFor(ctx, pointId, band);
        if (stats) {
          next.push({ ...band, statistical: { ...band.statistical, established: stats } });
          touched = true;
          continue;
        }
      }
      next.push(band);
    }
    if (!touched) continue;
    await ctx.db.transaction(async (tx) => {
      await saveLimitSet(tx, pointId, set.name, next, null);
      await writeAudit(tx, {
        actorUserId: null,
        action: 'limits.baseline',
        entity: 'point',
        entityId: pointId,
        before: set.bands,
        after: next,
        reason: 'statistical baseline established',
      });
    });
    changed++;
  }
  return changed;
}
