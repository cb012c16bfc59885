import { z } from 'zod';
import { qualityFindingSchema } from './points.ts';

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

/** `GET /api/v1/quality-notices?pointId=&limit=`: a point's notices, newest capture first. */
export const qualityNoticeListQuerySchema = z.object({
  pointId: z.coerce.number().int().positive(),
  limit: z.coerce.number().int().min(1).max(200).default(20),
});

/** A quality notice with who reviewed it and when (null while nobody has). */
export const qualityNoticeSchema = z.object({
  id: z.number().int(),
  pointId: z.number().int(),
  snapshotId: z.number().int().nullable(),
  verdict: z.enum(['ok', 'suspect', 'unusable']),
  takenAt: z.string(),
  findings: z.array(qualityFindingSchema),
  reviewedBy: z.object({ id: z.number().int(), name: z.string() }).nullable(),
  reviewedAt: z.string().nullable(),
});
export type QualityNotice = z.infer<typeof qualityNoticeSchema>;

export const qualityNoticeListSchema = z.object({ items: z.array(qualityNoticeSchema) });
export type QualityNoticeList = z.infer<typeof qualityNoticeListSchema>;
