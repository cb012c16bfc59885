import { z } from 'zod';

/**
 * `POST /api/v1/quality-notices/review`: marks a point's unreviewed quality notices reviewed
 * (by the caller, now) — all of them, or the ones listed. A point whose notices are all
 * reviewed no longer shows "Data quality" (unless its newest capture is unusable).
 */
export const reviewNoticesSchema = z.object({
  pointId: z.number().int().positive(),
  /** Only these notices of the point; default every unreviewed notice of it. */
  ids: z.array(z.number().int().positive()).min(1).max(1000).optional(),
});
export type ReviewNoticesInput = z.input<typeof reviewNoticesSchema>;

export const reviewNoticesResultSchema = z.object({
  pointId: z.number().int(),
  /** Notices marked now (already reviewed ones are left as they were). */
  reviewed: z.number().int(),
  reviewedBy: z.object({ id: z.number().int(), name: z.string() }),
  reviewedAt: z.string(),
});
export type ReviewNoticesResult = z.infer<typeof reviewNoticesResultSchema>;
