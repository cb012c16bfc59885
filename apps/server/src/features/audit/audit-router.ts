import { auditPageSchema, auditQuerySchema } from '@turnstone/contracts/audit';
import type { AppContext } from '../../lib/context.ts';
import { serviceRoute, type RouteSpec } from '../../lib/route-table.ts';
import { listAudit } from './audit-service.ts';

export function auditRoutes(ctx: AppContext): RouteSpec[] {
  return [
    serviceRoute({
      method: 'get',
      path: '/audit',
      access: ['admin', 'engineer'],
      summary: 'audit log with filters',
      schemas: { query: auditQuerySchema, response: auditPageSchema },
      run: ({ user, query }) => listAudit(ctx.db, user, query),
    }),
  ];
}
