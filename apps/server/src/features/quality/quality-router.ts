import { reviewNoticesResultSchema, reviewNoticesSchema } from '@turnstone/contracts/quality';
import type { AppContext } from '../../lib/context.ts';
import { requireUser, type RouteSpec } from '../../lib/route-table.ts';
import { reviewNotices } from './quality-service.ts';

/** Whoever follows up the data: planners (the weekly review) and engineers. */
const REVIEWERS = ['planner', 'engineer'] as const;

export function qualityRoutes(ctx: AppContext): RouteSpec[] {
  return [
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
