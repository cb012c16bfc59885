import { fleetSchema, siteListSchema } from '@turnstone/contracts/fleet';
import type { AppContext } from '../../lib/context.ts';
import { ALL_ROLES, serviceRoute, type RouteSpec } from '../../lib/route-table.ts';
import * as service from './fleet-service.ts';

export function fleetRoutes(ctx: AppContext): RouteSpec[] {
  return [
    serviceRoute({
      method: 'get',
      path: '/sites',
      access: ALL_ROLES,
      summary: 'list sites',
      schemas: { response: siteListSchema },
      run: ({ user }) => service.listSites(ctx.db, user),
    }),
    serviceRoute({
      method: 'get',
      path: '/fleet',
      access: ALL_ROLES,
      summary: 'fleet tree',
      schemas: { response: fleetSchema },
      run: ({ user }) => service.fleetTree(ctx.db, user),
    }),
  ];
}
