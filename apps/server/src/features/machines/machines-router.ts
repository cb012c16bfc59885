import { machineAttentionSchema } from '@turnstone/contracts/machine-attention';
import type { AppContext } from '../../lib/context.ts';
import { ALL_ROLES, serviceRoute, type RouteSpec } from '../../lib/route-table.ts';
import { idParam } from '../../lib/route-params.ts';
import { machineAttention } from './machine-attention-service.ts';

/** The machine page's composition of other features (alerts, findings, points). */
export function machineRoutes(ctx: AppContext): RouteSpec[] {
  return [
    serviceRoute({
      method: 'get',
      path: '/machines/:id/attention',
      access: ALL_ROLES,
      summary:
        'why a machine is in alert: its open alerts and findings not done, by point and band',
      schemas: { params: idParam, response: machineAttentionSchema },
      run: ({ user, params }) => machineAttention(ctx, user, params.id),
    }),
  ];
}
