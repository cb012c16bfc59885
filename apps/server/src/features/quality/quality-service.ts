import type { z } from 'zod';
import type {
  QualityNoticeList,
  ReviewNoticesResult,
  qualityNoticeListQuerySchema,
  reviewNoticesSchema,
} from '@turnstone/contracts/quality';
import type { QualityFinding } from '@turnstone/contracts/points';
import type { AppContext } from '../../lib/context.ts';
import type { SessionUser } from '../../lib/session-user.ts';
import { accessiblePoint } from '../places/point-access.ts';
import { writeAudit } from '../audit/audit-repository.ts';
import * as repo from './quality-repository.ts';

/** Marks a point's quality notices reviewed by `user` at `now`, audited in the same transaction. */
export async function reviewNotices(
  ctx: AppContext,
  user: SessionUser,
  input: z.output<typeof reviewNoticesSchema>,
  now = new Date(),
): Promise<ReviewNoticesResult> {
  await accessiblePoint(ctx.db, user, input.pointId);
  const reviewed = await ctx.db.transaction(async (tx) => {
    const rows = await repo.lockUnreviewed(tx, input.pointId, input.ids);
    if (rows.length === 0) return 0;
    const ids = rows.map((r) => r.id);
    await repo.markReviewed(tx, ids, user.id, now);
    await writeAudit(tx, {
      actorUserId: user.id,
      action: 'quality.review',
      entity: 'point',
      entityId: input.pointId,
      before: null,
      after: { noticeIds: ids, reviewedAt: now.toISOString() },
    });
    return ids.length;
  });
  return {
    pointId: input.pointId,
    reviewed,
    reviewedBy: { id: user.id, name: user.name },
    reviewedAt: now.toISOString(),
  };
}

/** A point's quality notices, newest first, each with who reviewed it and when. */
export async function listNotices(
  ctx: AppContext,
  user: SessionUser,
  q: z.output<typeof qualityNoticeListQuerySchema>,
): Promise<QualityNoticeList> {
  await accessiblePoint(ctx.db, user, q.pointId);
  const rows = await repo.noticesOfPoint(ctx.db, q.pointId, q.limit);
  return {
    items: rows.map(({ notice: n, reviewerName }) => ({
      id: n.id,
      pointId: n.pointId,
      snapshotId: n.snapshotId,
      verdict: n.verdict,
      takenAt: n.takenAt.toISOString(),
      findings: n.findings as QualityFinding[],
      reviewedBy:
        n.reviewedBy !== null ? { id: n.reviewedBy, name: reviewerName ?? 'a removed user' } : null,
      reviewedAt: n.reviewedAt ? n.reviewedAt.toISOString() : null,
    })),
  };
}
