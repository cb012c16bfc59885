import type { IncomingMessage, ServerResponse } from 'node:http';
import express from 'express';
import {
  ingestBatchSchema,
  ingestBodySchema,
  MAX_BATCH,
  type IngestResult,
} from '@turnstone/contracts/ingest';
import type { AppContext } from '../../lib/context.ts';
import { AppError } from '../../lib/app-error.ts';
import { countIngest } from '../../lib/metrics.ts';
import { errorReply } from '../../lib/error-middleware.ts';
import { trackRequest } from '../../lib/request-log.ts';
import { createGatewayRate } from './gateway-rate.ts';
import { createRejectionLog } from './rejection-log.ts';
import { authenticateGateway, ingestOne, type GatewayPrincipal } from './ingest-service.ts';

/** Where gateways post snapshots; matched as Express matched it (any case, one trailing slash). */
export const INGEST_SNAPSHOTS_PATH = '/api/ingest/v1/snapshots';

function sendJson(
  res: ServerResponse,
  status: number,
  body: unknown,
  headers: Record<string, string> = {},
): void {
  const text = JSON.stringify(body);
  res.writeHead(status, {
    ...headers,
    'Content-Type': 'application/json; charset=utf-8',
    'Content-Length': Buffer.byteLength(text),
    // The one helmet header that means something for a JSON answer to a machine.
    'X-Content-Type-Options': 'nosniff',
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

/**
 * `POST /api/ingest/v1/snapshots`, the one request every gateway makes every few minutes,
 * served on node:http itself ahead of Express. Express's per-request set-up (request and
 * response prototypes, the router's layer walk) cost about 130 µs of the ≈ 1 ms of CPU a
 * post takes; everything else is shared with the rest of the server: body-parser's JSON
 * reader (16 MiB limit, charsets, gzip/deflate bodies, its error types), the same error
 * replies as the error middleware, request ids and the access log. The other ingest routes
 * (the OpenAPI document) stay in Express.
 *
 * Returns a listener that answers true when it took the request.
 */
export function ingestEndpoint(
  ctx: AppContext,
): (req: IncomingMessage, res: ServerResponse) => boolean {
  const readJson = express.json({ limit: '16mb' });
  const rate = createGatewayRate({ windowMs: 60_000, limit: ctx.config.INGEST_MAX_PER_MIN });
  const noteRejected = createRejectionLog(ctx.log);
  const deadlineMs = ctx.config.INGEST_TIMEOUT_S * 1000;
  const bodyOf = (req: IncomingMessage, res: ServerResponse) =>
    new Promise<unknown>((resolve, reject) =>
      readJson(req as express.Request, res as express.Response, (err?: unknown) =>
        err ? reject(err) : resolve((req as { body?: unknown }).body),
      ),
    );

  async function answer(
    req: IncomingMessage,
    res: ServerResponse,
    state: { gatewayId?: number },
  ): Promise<{ status: number; body: unknown; code?: string }> {
    const gateway = await authenticateGateway(ctx, req.headers.authorization);
    state.gatewayId = gateway.id;
    const verdict = rate(gateway.id);
    for (const [k, v] of verdict.headers) res.setHeader(k, v);
    if (verdict.limited)
      throw new AppError(
        'rate_limited',
        'This gateway is sending faster than its allowed rate; retry after the delay in Retry-After.',
        429,
        undefined,
        // The real time to the window's reset: a retry sooner would be refused again.
        { headers: { 'Retry-After': String(verdict.resetS) } },
      );
    if (!isJson(req.headers['content-type']))
      throw new AppError(
        'unsupported_media_type',
        'Send the body as application/json (optionally gzip, deflate or br Content-Encoding).',
        415,
        undefined,
        { headers: { Accept: 'application/json' } },
      );
    const body = await bodyOf(req, res);
    const envelope = ingestBodySchema.safeParse(body);
    if (!envelope.success)
      throw new AppError(
        'validation_failed',
        'Send one snapshot object, or { "snapshots": [...] }, as application/json.',
        400,
      );
    if ('snapshots' in envelope.data) {
      const batch = ingestBatchSchema.safeParse(body);
      if (!batch.success)
        throw new AppError(
          'validation_failed',
          `snapshots must be an array of 1 to ${MAX_BATCH} snapshots.`,
          400,
          [{ path: 'snapshots', message: `1 to ${MAX_BATCH} items` }],
        );
      const results = await ingestBatch(ctx, gateway, batch.data.snapshots);
      for (const r of results) countIngest(r.status);
      return { status: 200, body: { results } };
    }
    const r = await ingestOne(ctx, gateway, body);
    countIngest(r.status);
    if (r.error) return { status: r.httpStatus, body: { error: r.error }, code: r.error.code };
    const { httpStatus: _status, ...result } = r;
    return { status: r.httpStatus, body: result };
  }

  async function handle(req: IncomingMessage, res: ServerResponse, path: string) {
    const requestId = trackRequest(ctx.log, req, res, () => path);
    const state: { gatewayId?: number } = {};
    let timer: NodeJS.Timeout | undefined;
    try {
      // A database that is frozen (not down: no error ever comes back) would hold the
      // gateway's request open for ever; past the deadline it gets the outage's 503.
      const deadline = new Promise<never>((_, reject) => {
        timer = setTimeout(
          () =>
            reject(
              Object.assign(new Error('the database did not answer within INGEST_TIMEOUT_S'), {
                code: 'PROTOCOL_SEQUENCE_TIMEOUT',
              }),
            ),
          deadlineMs,
        );
      });
      const a = await Promise.race([answer(req, res, state), deadline]);
      if (res.headersSent) return;
      sendJson(res, a.status, a.body);
      if (a.code)
        noteRejected({
          status: a.status,
          code: a.code,
          gatewayId: state.gatewayId,
          client: req.socket.remoteAddress ?? '?',
          path,
          requestId,
        });
    } catch (err) {
      if (res.headersSent) return;
      countIngest('rejected');
      const reply = errorReply(err, ctx.log, { requestId, path });
      if (reply.status === 401)
        // RFC 6750 §3: a 401 names the scheme (and, for a bad key, the error).
        reply.headers['WWW-Authenticate'] =
          reply.body.error.code === 'unauthenticated'
            ? 'Bearer realm="turnstone-ingest"'
            : `Bearer realm="turnstone-ingest", error="invalid_token", error_description="${reply.body.error.message}"`;
      sendJson(res, reply.status, reply.body, reply.headers);
      noteRejected({
        status: reply.status,
        code: reply.body.error.code,
        gatewayId: state.gatewayId,
        client: req.socket.remoteAddress ?? '?',
        path,
        requestId,
        message: reply.body.error.message,
      });
    } finally {
      clearTimeout(timer);
    }
  }

  return (req, res) => {
    if (req.method !== 'POST') return false;
    const url = req.url ?? '';
    const q = url.indexOf('?');
    let path = q < 0 ? url : url.slice(0, q);
    if (path.length > 1 && path.endsWith('/')) path = path.slice(0, -1);
    if (path.toLowerCase() !== INGEST_SNAPSHOTS_PATH) return false;
    void handle(req, res, path);
    return true;
  };
}

/** `application/json`, with or without parameters (charset); what body-parser reads. */
function isJson(contentType: string | undefined): boolean {
  if (!contentType) return false;
  const type = contentType.split(';', 1)[0]!.trim().toLowerCase();
  return type === 'application/json';
}
