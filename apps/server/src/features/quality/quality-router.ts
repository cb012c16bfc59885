import {
  qualityNoticeListQuerySchema,
  qualityNoticeListSchema,
  reviewNoticesResultSchema,
  reviewNoticesSchema,
} from '@turnstone/contracts/quality';
import type { AppContext } from '../../lib/context.ts';
import { ALL_ROLES, serviceRoute, type RouteSpec } from '../../lib/route-table.ts';
import { listNotices, reviewNotices } from './quality-service.ts';

/** Whoever follows up the data: planners (the weekly review) and engineers. */
const REVIEWERS = ['planner', 'engineer'] as const;

export function qualityRoutes(ctx: AppContext): RouteSpec[] {
  return [
    serviceRoute({
      method: 'get',
      path: '/quality-notices',
      // Everyone who reads the point reads its notices (the point page's data quality).
      access: ALL_ROLES,
      summary: "a point's quality notices, newest first, with who reviewed each and when",
      schemas: { query: qualityNoticeListQuerySchema, response: qualityNoticeListSchema },
      run: ({ user, query }) => listNotices(ctx, user, query),
    }),
    serviceRoute({
      method: 'post',
      path: '/quality-notices/review',
      access: REVIEWERS,
      summary: "mark a point's quality notices reviewed (by the caller, now)",
      schemas: { body: reviewNoticesSchema, response: reviewNoticesResultSchema },
      run: ({ user, body }) => reviewNotices(ctx, user, body),
    }),
  ];
}
