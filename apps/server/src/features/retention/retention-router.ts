import { retentionPolicySchema } from '@turnstone/contracts/retention';
import type { AppContext } from '../../lib/context.ts';
import type { RouteSpec } from '../../lib/route-table.ts';
import * as service from './retention-service.ts';

export function retentionRoutes(ctx: AppContext): RouteSpec[] {
  return [
    {
      method: 'get',
      path: '/retention',
      access: ['admin'],
      summary: 'the retention policy in force (read-only; set by configuration)',
      schemas: { response: retentionPolicySchema },
      handler: (_req, res) => {
        res.json(service.policyView(ctx));
      },
    },
  ];
}
