import {
  createWebhookSchema,
  createdWebhookSchema,
  updateWebhookSchema,
  webhookDeliveryListSchema,
  webhookListSchema,
  webhookSchema,
} from '@turnstone/contracts/webhooks';
import type { AppContext } from '../../lib/context.ts';
import { serviceRoute, type RouteSpec } from '../../lib/route-table.ts';
import { idParam } from '../../lib/route-params.ts';
import * as service from './webhooks-service.ts';

/** Outgoing webhooks: admin only. */
export function webhookRoutes(ctx: AppContext): RouteSpec[] {
  return [
    serviceRoute({
      method: 'get',
      path: '/webhooks',
      access: ['admin'],
      summary: 'list webhooks',
      schemas: { response: webhookListSchema },
      run: () => service.listWebhooks(ctx),
    }),
    serviceRoute({
      method: 'post',
      path: '/webhooks',
      access: ['admin'],
      summary: 'add a webhook (the answer holds its signing secret, this once)',
      schemas: { body: createWebhookSchema, response: createdWebhookSchema, status: 201 },
      // The answer holds the secret, shown once: it is never stored for a replay.
      idempotency: 'refused',
      headers: { 'Cache-Control': 'no-store' },
      run: ({ user, body }) => service.createWebhook(ctx, user, body),
    }),
    serviceRoute({
      method: 'patch',
      path: '/webhooks/:id',
      access: ['admin'],
      summary: 'change a webhook (name, URL, events, enabled)',
      schemas: { params: idParam, body: updateWebhookSchema, response: webhookSchema },
      run: ({ user, params, body }) => service.updateWebhook(ctx, user, params.id, body),
    }),
    serviceRoute({
      method: 'delete',
      path: '/webhooks/:id',
      access: ['admin'],
      summary: 'remove a webhook and its queued deliveries',
      schemas: { params: idParam, status: 204 },
      run: ({ user, params }) => service.deleteWebhook(ctx, user, params.id),
    }),
    serviceRoute({
      method: 'get',
      path: '/webhooks/:id/deliveries',
      access: ['admin'],
      summary: "a webhook's latest deliveries",
      schemas: { params: idParam, response: webhookDeliveryListSchema },
      run: ({ params }) => service.listDeliveries(ctx, params.id),
    }),
  ];
}
