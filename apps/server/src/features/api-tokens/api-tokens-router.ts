import {
  apiTokenListSchema,
  apiTokenSchema,
  issueApiTokenSchema,
  issuedApiTokenSchema,
} from '@turnstone/contracts/api-tokens';
import type { AppContext } from '../../lib/context.ts';
import { requireUser, type RouteSpec } from '../../lib/route-table.ts';
import { idParam } from '../../lib/route-params.ts';
import * as service from './api-tokens-service.ts';

/** API tokens admin: admin only. */
export function apiTokenRoutes(ctx: AppContext): RouteSpec[] {
  return [
    {
      method: 'get',
      path: '/api-tokens',
      access: ['admin'],
      summary: 'list API tokens',
      schemas: { response: apiTokenListSchema },
      handler: async (_req, res) => {
        res.setHeader('Cache-Control', 'no-store');
        res.json(apiTokenListSchema.parse(await service.listTokens(ctx)));
      },
    },
    {
      method: 'post',
      path: '/api-tokens',
      access: ['admin'],
      summary: 'issue an API token (the answer holds the token, this once)',
      schemas: { body: issueApiTokenSchema, response: issuedApiTokenSchema, status: 201 },
      // The answer holds the key, shown once: it is never stored for a replay.
      idempotency: 'refused',
      handler: async (req, res) => {
        const body = issueApiTokenSchema.parse(req.body);
        res.setHeader('Cache-Control', 'no-store');
        res
          .status(201)
          .json(issuedApiTokenSchema.parse(await service.issueToken(ctx, requireUser(req), body)));
      },
    },
    {
      method: 'post',
      path: '/api-tokens/:id/revoke',
      access: ['admin'],
      summary: 'revoke an API token',
      schemas: { params: idParam, response: apiTokenSchema },
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        res.json(apiTokenSchema.parse(await service.revokeToken(ctx, requireUser(req), id)));
      },
    },
  ];
}
