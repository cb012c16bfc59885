import { Router } from 'express';
import type { AppContext } from '../../lib/context.ts';
import { pingDb } from './health-repository.ts';

/** `GET /api/health`: the process answers, and whether the database does. */
export function healthRouter(ctx: AppContext): Router {
  const router = Router();
  router.get('/health', async (_req, res) => {
    try {
      await Promise.race([
        pingDb(ctx.db),
        new Promise((_, reject) => setTimeout(() => reject(new Error('timeout')), 2000)),
      ]);
      res.json({ status: 'ok', db: 'up' });
    } catch {
      res.setHeader('Retry-After', '5');
      res.status(503).json({ status: 'degraded', db: 'down' });
    }
  });
  return router;
}
