import { auditPageSchema, auditQuerySchema } from '@turnstone/contracts/audit';
import type { AppContext } from '../../lib/context.ts';
import type { RouteSpec } from '../../lib/route-table.ts';
import { listAudit } from './audit-service.ts';
import { parseQuery } from '../../lib/query.ts';

export function auditRoutes(ctx: AppContext): RouteSpec[] {
  return [
    {
      method: 'get',
      path: '/audit',
      access: ['admin', 'engineer'],
      summary: 'audit log with filters',
      schemas: { query: auditQuerySchema, response: auditPageSchema },
      handler: async (req, res) =>
        res.json(await listAudit(ctx.db, req.user!, parseQuery(auditQuerySchema, req.query))),
    },
  ];
}
