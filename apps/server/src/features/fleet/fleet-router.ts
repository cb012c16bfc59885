import { fleetSchema, siteListSchema } from '@turnstone/contracts/fleet';
import type { AppContext } from '../../lib/context.ts';
import { ALL_ROLES, requireUser, type RouteSpec } from '../../lib/route-table.ts';
import * as service from './fleet-service.ts';

export function fleetRoutes(ctx: AppContext): RouteSpec[] {
  return [
    {
      method: 'get',
      path: '/sites',
      access: ALL_ROLES,
      summary: 'list sites',
      schemas: { response: siteListSchema },
      handler: async (req, res) => res.json(await service.listSites(ctx.db, requireUser(req))),
    },
    {
      method: 'get',
      path: '/fleet',
      access: ALL_ROLES,
      summary: 'fleet tree',
      schemas: { response: fleetSchema },
      handler: async (req, res) => res.json(await service.fleetTree(ctx.db, requireUser(req))),
    },
  ];
}
