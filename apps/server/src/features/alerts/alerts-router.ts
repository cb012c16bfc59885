import {
  acknowledgeManyRequestSchema,
  acknowledgeRequestSchema,
  acknowledgeResponseSchema,
  alertDetailSchema,
  alertListQuerySchema,
  alertMailLinkQuerySchema,
  alertPageSchema,
} from '@turnstone/contracts/alerts';
import type { AppContext } from '../../lib/context.ts';
import { ALL_ROLES, serviceRoute, type RouteSpec } from '../../lib/route-table.ts';
import * as service from './alerts-service.ts';
import { idParam } from '../../lib/route-params.ts';
import { parseQuery } from '../../lib/query.ts';

export function alertRoutes(ctx: AppContext): RouteSpec[] {
  return [
    serviceRoute({
      method: 'get',
      path: '/alerts',
      access: ALL_ROLES,
      summary: 'list alerts of my sites',
      schemas: { query: alertListQuerySchema, response: alertPageSchema },
      run: ({ user, query }) => service.listAlerts(ctx, user, query),
    }),
    serviceRoute({
      // Declared before /alerts/:id so "acknowledge" is never read as an id.
      method: 'post',
      path: '/alerts/acknowledge',
      access: ['operator', 'engineer'],
      summary: 'acknowledge several alerts',
      schemas: { body: acknowledgeManyRequestSchema, response: acknowledgeResponseSchema },
      run: ({ user, body }) => service.acknowledge(ctx, user, body.ids, body.note),
    }),
    serviceRoute({
      method: 'get',
      path: '/alerts/:id',
      access: ALL_ROLES,
      summary: 'one alert with its history',
      schemas: { params: idParam, response: alertDetailSchema },
      run: ({ user, params }) => service.getAlert(ctx, user, params.id),
    }),
    {
      // The alert mail's link: public so it can check its signature before anything else;
      // the page it sends to asks for a session as every page does.
      method: 'get',
      path: '/alerts/:id/from-mail',
      access: 'public',
      summary: "open an alert from its mail's signed link",
      schemas: { params: idParam, query: alertMailLinkQuerySchema, status: 302 },
      handler: (req, res) => {
        const { id } = idParam.parse(req.params);
        const { sig } = parseQuery(alertMailLinkQuerySchema, req.query);
        res.setHeader('Cache-Control', 'no-store');
        res.redirect(302, service.alertPageFromMail(ctx, id, sig));
      },
    },
    serviceRoute({
      method: 'post',
      path: '/alerts/:id/acknowledge',
      access: ['operator', 'engineer'],
      summary: 'acknowledge an alert',
      schemas: { params: idParam, body: acknowledgeRequestSchema, response: alertDetailSchema },
      run: async ({ user, params, body }) => {
        const out = await service.acknowledge(ctx, user, [params.id], body.note);
        return service.getAlert(ctx, user, out.items[0]!.id);
      },
    }),
  ];
}
