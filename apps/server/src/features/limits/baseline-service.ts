/**
 * Nightly: bands with a statistical rule whose baseline is not yet established get it
 * from their stored trend (mean and σ over the first N good values or the chosen period),
 * so the level mean + k·σ applies from then on. Each change is audited.
 */
import { and, asc, eq, isNotNull } from 'drizzle-orm';
import { computeBaseline, type BandDefinition as LimitBand } from '@turnstone/condition';
import { bandValues, limitSets } from '@turnstone/db/schema';
import type { AppContext } from '../../lib/context.ts';
import { loadLimitSet, saveLimitSet } from '../analysis/analysis-repository.ts';
import { writeAudit } from '../audit/audit-repository.ts';

export async function baselineFor(ctx: AppContext, pointId: number, band: LimitBand) {
  const rule = band.statistical;
  if (!rule) return null;
  const rows = await ctx.db
    .select({
      takenAt: bandValues.takenAt,
      value: bandValues.value,
      quality: bandValues.qualityVerdict,
    })
    .from(bandValues)
    .where(and(eq(bandValues.pointId, pointId), eq(bandValues.bandKey, band.key)))
    .orderBy(asc(bandValues.takenAt))
    .limit(rule.baseline.from === 'first-n' ? Math.max(rule.baseline.count * 3, 100) : 100_000);
  return computeBaseline(
    rule.baseline,
    rows.map((r) => ({ takenAt: r.takenAt.getTime(), value: r.value, quality: r.quality })),
    { includeSuspect: rule.includeSuspect ?? true },
  );
}

export async function recomputeBaselines(ctx: AppContext): Promise<number> {
  const sets = await ctx.db
    .select({ pointId: limitSets.pointId })
    .from(limitSets)
    .where(isNotNull(limitSets.pointId));
  let changed = 0;
  for (const { pointId } of sets) {
    if (pointId === null) continue;
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
      const [meta] = await tx
        .select({ name: limitSets.name })
        .from(limitSets)
        .where(eq(limitSets.pointId, pointId));
      await saveLimitSet(tx, pointId, meta?.name ?? 'limits', next, null);
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
