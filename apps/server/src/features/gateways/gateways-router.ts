import { gatewayKeySchema, gatewayListSchema, gatewaySchema } from '@turnstone/contracts/gateways';
import type { AppContext } from '../../lib/context.ts';
import { serviceRoute, type RouteSpec } from '../../lib/route-table.ts';
import * as service from './gateways-service.ts';
import { idParam } from '../../lib/route-params.ts';

export function gatewayRoutes(ctx: AppContext): RouteSpec[] {
  return [
    serviceRoute({
      method: 'get',
      path: '/gateways',
      access: ['admin'],
      summary: 'list gateways',
      schemas: { response: gatewayListSchema },
      run: ({ user }) => service.listGateways(ctx.db, user),
    }),
    serviceRoute({
      method: 'post',
      path: '/gateways',
      access: ['admin'],
      summary: 'create a gateway',
      schemas: { body: service.createGatewaySchema, response: gatewayKeySchema, status: 201 },
      // The answer holds the key, shown once: it is never stored for a replay.
      idempotency: 'refused',
      run: ({ user, body }) => service.createGateway(ctx.db, user, body),
    }),
    serviceRoute({
      method: 'post',
      path: '/gateways/:id/revoke',
      access: ['admin'],
      summary: 'revoke a gateway key',
      schemas: { params: idParam, response: gatewaySchema },
      run: ({ user, params }) => service.revokeGateway(ctx.db, user, params.id),
    }),
    serviceRoute({
      method: 'post',
      path: '/gateways/:id/rotate',
      access: ['admin'],
      summary: 'rotate a gateway key',
      schemas: { params: idParam, response: gatewayKeySchema },
      run: ({ user, params }) => service.rotateGatewayKey(ctx.db, user, params.id),
    }),
  ];
}
