import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import { AppError } from './app-error.ts';
import type { Logger } from './logger.ts';

const DB_DOWN_CODES = new Set([
  'ECONNREFUSED',
  'PROTOCOL_CONNECTION_LOST',
  'ETIMEDOUT',
  'ECONNRESET',
  'EPIPE',
  'ER_SERVER_SHUTDOWN',
  'ER_CON_COUNT_ERROR',
  'PROTOCOL_SEQUENCE_TIMEOUT',
]);

/** True for errors that mean "the database is away", as opposed to a bad query. */
export function isDbUnavailable(err: unknown): boolean {
  for (let e: unknown = err, i = 0; e && i < 5; i++) {
    const code = (e as { code?: string }).code;
    if (code && DB_DOWN_CODES.has(code)) return true;
    // The server's socket file is gone while it is stopped.
    if (code === 'ENOENT' && (e as { syscall?: string }).syscall === 'connect') return true;
    if ((e as { fatal?: boolean }).fatal === true && (e as { errno?: number }).errno === undefined)
      return true;
    e = (e as { cause?: unknown }).cause;
  }
  return false;
}

/** An outage ends when no request has met the database away for this long. */
export const OUTAGE_QUIET_MS = 30_000;
const outages = new WeakMap<Logger, { last: number; answers: number }>();

/** One log line per database outage, not one per 503 answered during it. */
function noteDbDown(log: Logger, fields: Record<string, unknown>): void {
  const now = Date.now();
  const o = outages.get(log);
  if (o && now - o.last < OUTAGE_QUIET_MS) {
    o.last = now;
    o.answers++;
    return;
  }
  outages.set(log, { last: now, answers: 1 });
  log.warn('database unavailable; answering 503 with Retry-After until it is back', fields);
}

export function zodDetails(err: ZodError) {
  return err.issues.map((i) => ({ path: i.path.join('.'), message: i.message }));
}

export const apiNotFound: RequestHandler = (req, res) => {
  res.status(404).json({
    error: {
      code: 'not_found',
      message: `No API route ${req.method} ${req.originalUrl.split('?')[0]}.`,
    },
  });
};

export interface ErrorReply {
  status: number;
  headers: Record<string, string>;
  body: { error: { code: string; message: string; details?: unknown } };
}

/**
 * How any error leaves the server: `{ error: { code, message, details? } }` with its status
 * and headers. Shared by the Express error middleware and the gateways' ingest endpoint.
 */
export function errorReply(
  err: unknown,
  log: Logger,
  request: { requestId?: string; path: string },
): ErrorReply {
  const headers: Record<string, string> = {};
  const reply = (status: number, code: string, message: string, details?: unknown) => ({
    status,
    headers,
    body: { error: details === undefined ? { code, message } : { code, message, details } },
  });

  if (err instanceof AppError) {
    Object.assign(headers, err.headers);
    return reply(err.httpStatus, err.code, err.message, err.details);
  }
  if (err instanceof ZodError) {
    const details = zodDetails(err);
    const first = details[0];
    return reply(
      400,
      'validation_failed',
      first ? `Invalid request: ${first.path || 'body'}: ${first.message}` : 'Invalid request.',
      details,
    );
  }
  const type = (err as { type?: string }).type;
  if (type === 'entity.parse.failed')
    return reply(400, 'invalid_json', 'The request body is not valid JSON.');
  if (type === 'entity.too.large')
    return reply(413, 'payload_too_large', 'The request body is too large.');
  if (type === 'charset.unsupported' || type === 'encoding.unsupported')
    return reply(415, 'unsupported_encoding', 'Unsupported request encoding.');
  if (isDbUnavailable(err)) {
    headers['Retry-After'] = '5';
    noteDbDown(log, {
      requestId: request.requestId,
      path: request.path,
      code: (err as { code?: string }).code,
    });
    return reply(503, 'db_unavailable', 'The database is not answering; try again shortly.');
  }
  const status = (err as { status?: number }).status;
  if (typeof status === 'number' && status >= 400 && status < 500) {
    return reply(status, 'bad_request', (err as Error).message || 'Bad request.');
  }
  log.error('unhandled error', { requestId: request.requestId, path: request.path, err });
  return reply(
    500,
    'internal',
    `Something went wrong on our side (request ${request.requestId ?? '?'}).`,
  );
}

/** The last middleware: every error leaves as `{ error: { code, message, details? } }`. */
export function errorMiddleware(log: Logger): ErrorRequestHandler {
  return (err, req, res, _next) => {
    if (res.headersSent) return;
    const r = errorReply(err, log, { requestId: req.requestId, path: req.path });
    for (const [k, v] of Object.entries(r.headers)) res.setHeader(k, v);
    res.status(r.status).json(r.body);
  };
}
