import {
  createWebhookSchema,
  createdWebhookSchema,
  updateWebhookSchema,
  webhookDeliveryListSchema,
  webhookListSchema,
  webhookSchema,
} from '@turnstone/contracts/webhooks';
import type { AppContext } from '../../lib/context.ts';
import { requireUser, type RouteSpec } from '../../lib/route-table.ts';
import { idParam } from '../../lib/route-params.ts';
import * as service from './webhooks-service.ts';

/** Outgoing webhooks: admin only. */
export function webhookRoutes(ctx: AppContext): RouteSpec[] {
  return [
    {
      method: 'get',
      path: '/webhooks',
      access: ['admin'],
      summary: 'list webhooks',
      schemas: { response: webhookListSchema },
      handler: async (_req, res) =>
        res.json(webhookListSchema.parse(await service.listWebhooks(ctx))),
    },
    {
      method: 'post',
      path: '/webhooks',
      access: ['admin'],
      summary: 'add a webhook (the answer holds its signing secret, this once)',
      schemas: { body: createWebhookSchema, response: createdWebhookSchema, status: 201 },
      // The answer holds the secret, shown once: it is never stored for a replay.
      idempotency: 'refused',
      handler: async (req, res) => {
        const body = createWebhookSchema.parse(req.body);
        res.setHeader('Cache-Control', 'no-store');
        res
          .status(201)
          .json(
            createdWebhookSchema.parse(await service.createWebhook(ctx, requireUser(req), body)),
          );
      },
    },
    {
      method: 'patch',
      path: '/webhooks/:id',
      access: ['admin'],
      summary: 'change a webhook (name, URL, events, enabled)',
      schemas: { params: idParam, body: updateWebhookSchema, response: webhookSchema },
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        const body = updateWebhookSchema.parse(req.body);
        res.json(webhookSchema.parse(await service.updateWebhook(ctx, requireUser(req), id, body)));
      },
    },
    {
      method: 'delete',
      path: '/webhooks/:id',
      access: ['admin'],
      summary: 'remove a webhook and its queued deliveries',
      schemas: { params: idParam, status: 204 },
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        await service.deleteWebhook(ctx, requireUser(req), id);
        res.status(204).end();
      },
    },
    {
      method: 'get',
      path: '/webhooks/:id/deliveries',
      access: ['admin'],
      summary: "a webhook's latest deliveries",
      schemas: { params: idParam, response: webhookDeliveryListSchema },
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        res.json(webhookDeliveryListSchema.parse(await service.listDeliveries(ctx, id)));
      },
    },
  ];
}
