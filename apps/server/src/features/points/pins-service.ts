/**
 * Pinned captures: a person keeps a capture whole (spectra and raw waveform) whatever its
 * age — the retention passes skip it (features/worker/retention-repository.ts). Pinning and
 * unpinning are written to the audit log.
 */
import type { z } from 'zod';
import type { pinInputSchema, pinSchema } from '@turnstone/contracts/pins';
import { notFound } from '../../lib/app-error.ts';
import type { AppContext } from '../../lib/context.ts';
import type { SessionUser } from '../../lib/session-user.ts';
import { writeAudit } from '../audit/audit-repository.ts';
import { accessibleAnalysis } from './points-service.ts';
import * as repo from './pins-repository.ts';

export async function pinCapture(
  ctx: AppContext,
  user: SessionUser,
  analysisId: number,
  input: z.output<typeof pinInputSchema>,
): Promise<z.infer<typeof pinSchema>> {
  const { analysis } = await accessibleAnalysis(ctx, user, analysisId);
  const at = new Date();
  await ctx.db.transaction(async (tx) => {
    await repo.pinCapture(tx, analysisId, user.id, input.note, at);
    await writeAudit(tx, {
      actorUserId: user.id,
      action: 'capture.pin',
      entity: 'point',
      entityId: analysis.pointId,
      after: { analysisId, takenAt: analysis.takenAt.toISOString(), note: input.note },
    });
  });
  return { analysisId, by: user.name, at: at.toISOString(), note: input.note };
}

export async function unpinCapture(
  ctx: AppContext,
  user: SessionUser,
  analysisId: number,
): Promise<void> {
  const { analysis } = await accessibleAnalysis(ctx, user, analysisId);
  await ctx.db.transaction(async (tx) => {
    if (!(await repo.unpinCapture(tx, analysisId))) throw notFound('Pin');
    await writeAudit(tx, {
      actorUserId: user.id,
      action: 'capture.unpin',
      entity: 'point',
      entityId: analysis.pointId,
      before: { analysisId, takenAt: analysis.takenAt.toISOString() },
    });
  });
}
