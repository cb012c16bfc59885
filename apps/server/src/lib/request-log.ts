import { randomUUID } from 'node:crypto';
import type { IncomingMessage, ServerResponse } from 'node:http';
import type { Logger } from './logger.ts';

/**
 * Gives a request its id (answered as X-Request-Id, quoted in 500 messages) and logs it at
 * debug level when the answer is sent: the path only, as a query string can carry a token.
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
  res.on('finish', () =>
    log.debug('request', {
      requestId,
      method: req.method,
      path: path(),
      status: res.statusCode,
      ms: Number(process.hrtime.bigint() - t0) / 1e6,
    }),
  );
  return requestId;
}
