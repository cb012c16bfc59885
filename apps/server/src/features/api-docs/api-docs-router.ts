import type { AppContext } from '../../lib/context.ts';
import type { RouteGroup, RouteSpec } from '../../lib/route-table.ts';
import { documentOrigin } from '../../lib/openapi.ts';
import { apiOpenApi } from './api-openapi.ts';

/**
 * `GET /api/v1/openapi.json`. Public, like the ingest document: it describes the shape of
 * the API (the same for every install, readable in the source) and no data of this one, and
 * an integrator generates a client from it before holding any credentials.
 */
export function apiDocsRoutes(ctx: AppContext, groups: () => RouteGroup[]): RouteSpec[] {
  return [
    {
      method: 'get',
      path: '/openapi.json',
      access: 'public',
      summary: 'this OpenAPI document',
      handler: (req, res) => {
        res.setHeader('Cache-Control', 'no-cache');
        res.json(apiOpenApi(groups, `${documentOrigin(ctx.config, req)}/api/v1`));
      },
    },
  ];
}
