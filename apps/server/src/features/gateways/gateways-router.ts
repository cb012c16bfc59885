import { gatewayKeySchema, gatewayListSchema, gatewaySchema } from '@turnstone/contracts/gateways';
import type { AppContext } from '../../lib/context.ts';
import { requireUser, type RouteSpec } from '../../lib/route-table.ts';
import * as service from './gateways-service.ts';
import { idParam } from '../../lib/route-params.ts';

export function gatewayRoutes(ctx: AppContext): RouteSpec[] {
  return [
    {
      method: 'get',
      path: '/gateways',
      access: ['admin'],
      summary: 'list gateways',
      schemas: { response: gatewayListSchema },
      handler: async (req, res) => res.json(await service.listGateways(ctx.db, requireUser(req))),
    },
    {
      method: 'post',
      path: '/gateways',
      access: ['admin'],
      summary: 'create a gateway',
      schemas: { body: service.createGatewaySchema, response: gatewayKeySchema, status: 201 },
      // The answer holds the key, shown once: it is never stored for a replay.
      idempotency: 'refused',
      handler: async (req, res) => {
        const body = service.createGatewaySchema.parse(req.body);
        res.status(201).json(await service.createGateway(ctx.db, requireUser(req), body));
      },
    },
    {
      method: 'post',
      path: '/gateways/:id/revoke',
      access: ['admin'],
      summary: 'revoke a gateway key',
      schemas: { params: idParam, response: gatewaySchema },
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        res.json(gatewaySchema.parse(await service.revokeGateway(ctx.db, requireUser(req), id)));
      },
    },
    {
      method: 'post',
      path: '/gateways/:id/rotate',
      access: ['admin'],
      summary: 'rotate a gateway key',
      schemas: { params: idParam, response: gatewayKeySchema },
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        res.json(await service.rotateGatewayKey(ctx.db, requireUser(req), id));
      },
    },
  ];
}
