import { machineAttentionSchema } from '@turnstone/contracts/machine-attention';
import type { AppContext } from '../../lib/context.ts';
import { ALL_ROLES, requireUser, type RouteSpec } from '../../lib/route-table.ts';
import { idParam } from '../../lib/route-params.ts';
import { machineAttention } from './machine-attention-service.ts';

/** The machine page's composition of other features (alerts, findings, points). */
export function machineRoutes(ctx: AppContext): RouteSpec[] {
  return [
    {
      method: 'get',
      path: '/machines/:id/attention',
      access: ALL_ROLES,
      summary:
        'why a machine is in alert: its open alerts and findings not done, by point and band',
      schemas: { params: idParam, response: machineAttentionSchema },
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        res.json(await machineAttention(ctx, requireUser(req), id));
      },
    },
  ];
}
