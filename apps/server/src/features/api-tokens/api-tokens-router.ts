import {
  apiTokenListSchema,
  apiTokenSchema,
  issueApiTokenSchema,
  issuedApiTokenSchema,
} from '@turnstone/contracts/api-tokens';
import type { AppContext } from '../../lib/context.ts';
import { serviceRoute, type RouteSpec } from '../../lib/route-table.ts';
import { idParam } from '../../lib/route-params.ts';
import * as service from './api-tokens-service.ts';

/** API tokens admin: admin only. */
export function apiTokenRoutes(ctx: AppContext): RouteSpec[] {
  return [
    serviceRoute({
      method: 'get',
      path: '/api-tokens',
      access: ['admin'],
      summary: 'list API tokens',
      schemas: { response: apiTokenListSchema },
      headers: { 'Cache-Control': 'no-store' },
      run: () => service.listTokens(ctx),
    }),
    serviceRoute({
      method: 'post',
      path: '/api-tokens',
      access: ['admin'],
      summary: 'issue an API token (the answer holds the token, this once)',
      schemas: { body: issueApiTokenSchema, response: issuedApiTokenSchema, status: 201 },
      // The answer holds the key, shown once: it is never stored for a replay.
      idempotency: 'refused',
      headers: { 'Cache-Control': 'no-store' },
      run: ({ user, body }) => service.issueToken(ctx, user, body),
    }),
    serviceRoute({
      method: 'post',
      path: '/api-tokens/:id/revoke',
      access: ['admin'],
      summary: 'revoke an API token',
      schemas: { params: idParam, response: apiTokenSchema },
      run: ({ user, params }) => service.revokeToken(ctx, user, params.id),
    }),
  ];
}
