import { reviewQuerySchema, reviewSchema } from '@turnstone/contracts/review';
import type { AppContext } from '../../lib/context.ts';
import { requireUser, serviceRoute, type RouteSpec } from '../../lib/route-table.ts';
import { reviewZip } from './review-csv.ts';
import { reviewInUnits } from '@turnstone/contracts/review-units';
import { buildWeeklyReview } from './review-service.ts';
import { parseQuery } from '../../lib/query.ts';

/** The weekly review is the planner's screen; engineers and admins read it too. */
const READERS = ['planner', 'engineer', 'admin'] as const;

export function reviewRoutes(ctx: AppContext): RouteSpec[] {
  return [
    serviceRoute({
      method: 'get',
      path: '/review',
      access: READERS,
      summary: 'weekly review: movers, forecasts, open alerts, quality notices, findings due',
      schemas: { query: reviewQuerySchema, response: reviewSchema },
      headers: { 'Cache-Control': 'no-store' },
      run: ({ user, query }) => buildWeeklyReview(ctx, user, query),
    }),
    {
      method: 'get',
      path: '/review.zip',
      access: READERS,
      summary: 'weekly review as a ZIP of CSV files, one per table',
      schemas: { query: reviewQuerySchema, produces: 'application/zip' },
      handler: async (req, res) => {
        const q = parseQuery(reviewQuerySchema, req.query);
        const review = await buildWeeklyReview(ctx, requireUser(req), q);
        const sites =
          review.sites.length === 1 ? `-${review.sites[0]!.code.replace(/[^\w-]/g, '')}` : '';
        res.setHeader('Content-Type', 'application/zip');
        res.setHeader('Cache-Control', 'no-store');
        res.setHeader(
          'Content-Disposition',
          `attachment; filename="turnstone-review${sites}-${review.period.weekEnding}.zip"`,
        );
        res.send(Buffer.from(reviewZip(reviewInUnits(review, requireUser(req).unitSystem))));
      },
    },
  ];
}
