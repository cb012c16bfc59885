import {
  mailboxListSchema,
  mailboxMessageSchema,
  mailboxQuerySchema,
  undeliveredMailListSchema,
} from '@turnstone/contracts/mail';
import type { AppContext } from '../../lib/context.ts';
import { requireUser, type RouteSpec } from '../../lib/route-table.ts';
import * as service from './mailbox-service.ts';
import { idParam } from '../../lib/route-params.ts';
import { parseQuery } from '../../lib/query.ts';

export function mailboxRoutes(ctx: AppContext): RouteSpec[] {
  return [
    {
      method: 'get',
      path: '/mailbox',
      access: ['admin'],
      summary: 'list received mail',
      schemas: { query: mailboxQuerySchema, response: mailboxListSchema },
      handler: async (req, res) => {
        const { search } = parseQuery(mailboxQuerySchema, req.query);
        res.json(await service.listMailbox(ctx.db, search));
      },
    },
    {
      method: 'get',
      path: '/mailbox/:id',
      access: ['admin'],
      summary: 'read one received message',
      schemas: { params: idParam, response: mailboxMessageSchema },
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        res.json(await service.readMessage(ctx.db, id, requireUser(req)));
      },
    },
    {
      method: 'get',
      path: '/mail/undelivered',
      access: ['admin'],
      summary: 'outgoing mail not delivered (retrying, failed, uncertain)',
      schemas: { response: undeliveredMailListSchema },
      handler: async (_req, res) => res.json(await service.listUndeliveredMail(ctx.db)),
    },
    {
      method: 'post',
      path: '/mail/undelivered/:id/resend',
      access: ['admin'],
      summary: 'send a failed or uncertain message again',
      schemas: { params: idParam, status: 204 },
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        await service.resendMail(ctx.db, req.user!, id);
        res.status(204).end();
      },
    },
  ];
}
