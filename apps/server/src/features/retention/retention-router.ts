import { retentionPolicySchema } from '@turnstone/contracts/retention';
import type { AppContext } from '../../lib/context.ts';
import { serviceRoute, type RouteSpec } from '../../lib/route-table.ts';
import * as service from './retention-service.ts';

export function retentionRoutes(ctx: AppContext): RouteSpec[] {
  return [
    serviceRoute({
      method: 'get',
      path: '/retention',
      access: ['admin'],
      summary: 'the retention policy in force (read-only; set by configuration)',
      schemas: { response: retentionPolicySchema },
      run: () => service.policyView(ctx),
    }),
  ];
}
