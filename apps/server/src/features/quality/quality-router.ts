import {
  qualityNoticeListQuerySchema,
  qualityNoticeListSchema,
  reviewNoticesResultSchema,
  reviewNoticesSchema,
} from '@turnstone/contracts/quality';
import type { AppContext } from '../../lib/context.ts';
import { ALL_ROLES, requireUser, type RouteSpec } from '../../lib/route-table.ts';
import { parseQuery } from '../../lib/query.ts';
import { listNotices, reviewNotices } from './quality-service.ts';

/** Whoever follows up the data: planners (the weekly review) and engineers. */
const REVIEWERS = ['planner', 'engineer'] as const;

export function qualityRoutes(ctx: AppContext): RouteSpec[] {
  return [
    {
      method: 'get',
      path: '/quality-notices',
      // Everyone who reads the point reads its notices (the point page's data quality).
      access: ALL_ROLES,
      summary: "a point's quality notices, newest first, with who reviewed each and when",
      schemas: { query: qualityNoticeListQuerySchema, response: qualityNoticeListSchema },
      handler: async (req, res) =>
        res.json(
          await listNotices(
            ctx,
            requireUser(req),
            parseQuery(qualityNoticeListQuerySchema, req.query),
          ),
        ),
    },
    {
      method: 'post',
      path: '/quality-notices/review',
      access: REVIEWERS,
      summary: "mark a point's quality notices reviewed (by the caller, now)",
      schemas: { body: reviewNoticesSchema, response: reviewNoticesResultSchema },
      handler: async (req, res) =>
        res.json(await reviewNotices(ctx, requireUser(req), reviewNoticesSchema.parse(req.body))),
    },
  ];
}
