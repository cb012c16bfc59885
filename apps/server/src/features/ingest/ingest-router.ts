import { Router } from 'express';
import type { Config } from '../../config.ts';
import { ingestOpenApi } from './ingest-openapi.ts';
import { documentOrigin } from '../../lib/openapi.ts';

/**
 * `/api/ingest/v1` in Express: the OpenAPI document. `POST /snapshots` itself is served
 * ahead of Express by `ingestEndpoint` (ingest-endpoint.ts).
 */
export function ingestRouter(config: Pick<Config, 'PUBLIC_URL'>): Router {
  const router = Router();
  router.get('/openapi.json', (req, res) => {
    res.json(ingestOpenApi(`${documentOrigin(config, req)}/api/ingest/v1`));
  });
  return router;
}
