import {
  mailboxListSchema,
  mailboxMessageSchema,
  mailboxQuerySchema,
  undeliveredMailListSchema,
} from '@turnstone/contracts/mail';
import type { AppContext } from '../../lib/context.ts';
import { serviceRoute, type RouteSpec } from '../../lib/route-table.ts';
import * as service from './mailbox-service.ts';
import { idParam } from '../../lib/route-params.ts';

export function mailboxRoutes(ctx: AppContext): RouteSpec[] {
  return [
    serviceRoute({
      method: 'get',
      path: '/mailbox',
      access: ['admin'],
      summary: 'list received mail',
      schemas: { query: mailboxQuerySchema, response: mailboxListSchema },
      run: ({ query }) => service.listMailbox(ctx.db, query.search),
    }),
    serviceRoute({
      method: 'get',
      path: '/mailbox/:id',
      access: ['admin'],
      summary: 'read one received message',
      schemas: { params: idParam, response: mailboxMessageSchema },
      run: ({ user, params }) => service.readMessage(ctx.db, params.id, user),
    }),
    serviceRoute({
      method: 'get',
      path: '/mail/undelivered',
      access: ['admin'],
      summary: 'outgoing mail not delivered (retrying, failed, uncertain)',
      schemas: { response: undeliveredMailListSchema },
      run: () => service.listUndeliveredMail(ctx.db),
    }),
    serviceRoute({
      method: 'post',
      path: '/mail/undelivered/:id/resend',
      access: ['admin'],
      summary: 'send a failed or uncertain message again',
      schemas: { params: idParam, status: 204 },
      run: ({ user, params }) => service.resendMail(ctx.db, user, params.id),
    }),
  ];
}
