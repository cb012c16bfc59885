import { randomUUID } from 'node:crypto';
import type { IncomingMessage, ServerResponse } from 'node:http';
import type { Logger } from './logger.ts';
import { observeRequest } from './metrics.ts';

/**
 * Gives a request its id (answered as X-Request-Id, quoted in 500 messages) and logs it at
 * debug level when the answer is sent: the path only, as a query string can carry a token.
 * Counts it in the operations metrics (area and status class).
 */
export function trackRequest(
  log: Logger,
  req: IncomingMessage,
  res: ServerResponse,
  path: () => string,
): string {
  const requestId = randomUUID();
  res.setHeader('X-Request-Id', requestId);
  const t0 = process.hrtime.bigint();
  res.on('finish', () => {
    const ms = Number(process.hrtime.bigint() - t0) / 1e6;
    const p = path();
    observeRequest(p, res.statusCode, ms / 1000);
    log.debug('request', { requestId, method: req.method, path: p, status: res.statusCode, ms });
  });
  return requestId;
}
