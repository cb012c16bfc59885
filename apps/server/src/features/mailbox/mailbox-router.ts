import type { AppContext } from '../../lib/context.ts';
import type { RouteSpec } from '../../lib/route-table.ts';
import * as service from './mailbox-service.ts';
import { idParam } from '../../lib/route-params.ts';

export function mailboxRoutes(ctx: AppContext): RouteSpec[] {
  return [
    {
      method: 'get',
      path: '/mailbox',
      access: ['admin'],
      summary: 'list received mail',
      handler: async (_req, res) => res.json(await service.listMailbox(ctx.db)),
    },
    {
      method: 'get',
      path: '/mailbox/:id',
      access: ['admin'],
      summary: 'read one received message',
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        res.json(await service.readMessage(ctx.db, id));
      },
    },
  ];
}
