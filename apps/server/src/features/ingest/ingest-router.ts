import { Router } from 'express';
import type { Config } from '../../config.ts';
import { ingestOpenApi } from './ingest-openapi.ts';

/**
 * `/api/ingest/v1` in Express: the OpenAPI document. `POST /snapshots` itself is served
 * ahead of Express by `ingestEndpoint` (ingest-endpoint.ts).
 */
export function ingestRouter(config: Pick<Config, 'PUBLIC_URL'>): Router {
  const router = Router();
  router.get('/openapi.json', (req, res) => {
    // An absolute server URL, so a client generated from the document needs no base URL:
    // PUBLIC_URL when set, else the address the document was fetched from.
    const origin = config.PUBLIC_URL
      ? config.PUBLIC_URL.replace(/\/+$/, '')
      : `${req.protocol}://${req.get('host')}`;
    res.json(ingestOpenApi(`${origin}/api/ingest/v1`));
  });
  return router;
}
