import { Router } from 'express';
import { ingestOpenApi } from './ingest-openapi.ts';

/**
 * `/api/ingest/v1` in Express: the OpenAPI document. `POST /snapshots` itself is served
 * ahead of Express by `ingestEndpoint` (ingest-endpoint.ts).
 */
export function ingestRouter(): Router {
  const router = Router();
  router.get('/openapi.json', (_req, res) => res.json(ingestOpenApi()));
  return router;
}
