import express, { Router, type Request, type Response } from 'express';
import { MAX_BATCH, type IngestResult } from '@turnstone/contracts/ingest';
import type { AppContext } from '../../lib/context.ts';
import { AppError } from '../../lib/app-error.ts';
import { gatewayRateLimit } from './gateway-rate.ts';
import { ingestOpenApi } from './ingest-openapi.ts';
import { authenticateGateway, ingestOne, type GatewayPrincipal } from './ingest-service.ts';

declare module 'express-serve-static-core' {
  interface Request {
    gateway?: GatewayPrincipal;
  }
}

/**
 * A JSON answer written straight out: res.json would also compute an ETag and check
 * freshness, which no gateway's POST uses.
 */
function sendJson(res: Response, status: number, body: unknown): void {
  const text = JSON.stringify(body);
  res.writeHead(status, {
    'Content-Type': 'application/json; charset=utf-8',
    'Content-Length': Buffer.byteLength(text),
  });
  res.end(text);
}

/**
 * The items of a batch, stored side by side: one after the other, each item waited for its
 * own round trip and commit before the next one started; side by side they overlap on the
 * pool's connections (and concurrent commits can share an fsync). An item repeating an
 * earlier item's uid waits for it, so the first one is the 201 and the repeat the 200, as
 * in order.
 */
async function ingestBatch(
  ctx: AppContext,
  gateway: GatewayPrincipal,
  items: unknown[],
): Promise<IngestResult[]> {
  const results: IngestResult[] = new Array(items.length);
  const lastOfUid = new Map<string, Promise<unknown>>();
  await Promise.all(
    items.map((item, i) => {
      const uid = (item as { uid?: unknown } | null)?.uid;
      const earlier = typeof uid === 'string' ? lastOfUid.get(uid) : undefined;
      const done = (async () => {
        if (earlier) await earlier.catch(() => {});
        results[i] = await ingestOne(ctx, gateway, item);
      })();
      if (typeof uid === 'string') lastOfUid.set(uid, done);
      return done;
    }),
  );
  return results;
}

/** `/api/ingest/v1`: the gateways' API. Its own 16 MiB body limit, per-gateway rate. */
export function ingestRouter(ctx: AppContext): Router {
  const router = Router();
  router.get('/openapi.json', (_req, res) => res.json(ingestOpenApi()));
  router.post(
    '/snapshots',
    async (req: Request, _res, next) => {
      req.gateway = await authenticateGateway(ctx, req.get('authorization'));
      next();
    },
    gatewayRateLimit({
      windowMs: 60_000,
      limit: ctx.config.INGEST_MAX_PER_MIN,
      gatewayId: (req) => req.gateway!.id,
      onLimited: (_req, res) => {
        res.setHeader('Retry-After', '10');
        res.status(429).json({
          error: {
            code: 'rate_limited',
            message:
              'This gateway is sending faster than its allowed rate; retry after the delay in Retry-After.',
          },
        });
      },
    }),
    express.json({ limit: '16mb' }),
    async (req: Request, res) => {
      const body: unknown = req.body;
      if (
        !req.is('application/json') ||
        typeof body !== 'object' ||
        body === null ||
        Array.isArray(body)
      ) {
        throw new AppError(
          'validation_failed',
          'Send one snapshot object, or { "snapshots": [...] }, as application/json.',
          400,
        );
      }
      if ('snapshots' in body) {
        const items = (body as { snapshots: unknown }).snapshots;
        if (!Array.isArray(items) || items.length === 0 || items.length > MAX_BATCH) {
          throw new AppError(
            'validation_failed',
            `snapshots must be an array of 1 to ${MAX_BATCH} snapshots.`,
            400,
            [{ path: 'snapshots', message: `1 to ${MAX_BATCH} items` }],
          );
        }
        sendJson(res, 200, { results: await ingestBatch(ctx, req.gateway!, items) });
        return;
      }
      const r = await ingestOne(ctx, req.gateway!, body);
      if (r.error) sendJson(res, r.httpStatus, { error: r.error });
      else sendJson(res, r.httpStatus, { uid: r.uid, status: r.status, snapshotId: r.snapshotId });
    },
  );
  return router;
}
