import { bandHzOf } from '@turnstone/contracts/band-label';
import { eq } from 'drizzle-orm';
import { analyses, snapshots } from '@turnstone/db/schema';
import type { AppContext } from '../../lib/context.ts';
import { notFound } from '../../lib/app-error.ts';
import { accessiblePoint } from '../../lib/point-access.ts';
import { ALL_ROLES, requireUser, type RouteSpec } from '../../lib/route-table.ts';
import { idParam } from '../../lib/route-params.ts';

export function snapshotRoutes(ctx: AppContext): RouteSpec[] {
  return [
    {
      method: 'get',
      path: '/snapshots/:id',
      access: ALL_ROLES,
      summary: 'snapshot status and its analysis',
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        const [s] = await ctx.db
          .select({
            id: snapshots.id,
            pointId: snapshots.pointId,
            source: snapshots.source,
            status: snapshots.status,
            statusReason: snapshots.statusReason,
            takenAt: snapshots.takenAt,
            receivedAt: snapshots.receivedAt,
            sampleRateHz: snapshots.sampleRateHz,
            sampleCount: snapshots.sampleCount,
            fileName: snapshots.fileName,
          })
          .from(snapshots)
          .where(eq(snapshots.id, id));
        if (!s) throw notFound('Snapshot');
        await accessiblePoint(ctx.db, requireUser(req), s.pointId);
        const [a] = await ctx.db
          .select({
            id: analyses.id,
            qualityVerdict: analyses.qualityVerdict,
            qualityFindings: analyses.qualityFindings,
            bitsUsed: analyses.bitsUsed,
            accelRmsG: analyses.accelRmsG,
            accelPeakG: analyses.accelPeakG,
            velocityRmsMmS: analyses.velocityRmsMmS,
            displacementPkPkUm: analyses.displacementPkPkUm,
            crestFactor: analyses.crestFactor,
            kurtosis: analyses.kurtosis,
            speedRpm: analyses.speedRpm,
            speedSource: analyses.speedSource,
            isoZone: analyses.isoZone,
            summary: analyses.summary,
          })
          .from(analyses)
          .where(eq(analyses.snapshotId, id));
        let analysis = null;
        if (a) {
          const { summary, ...rest } = a;
          const bands = (summary ?? {}) as { isoBandHz?: unknown; accelBandHz?: unknown };
          analysis = {
            ...rest,
            accelBandHz: bandHzOf(bands.accelBandHz),
            velocityBandHz: bandHzOf(bands.isoBandHz),
          };
        }
        res.json({
          ...s,
          takenAt: s.takenAt.toISOString(),
          receivedAt: s.receivedAt.toISOString(),
          analysis,
        });
      },
    },
  ];
}
