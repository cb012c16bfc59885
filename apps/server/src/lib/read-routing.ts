/**
 * Which database a dashboard request reads (only with DATABASE_REPLICA_URLS): a GET may
 * read a replica; a write goes to the primary and marks the browser, so that its reads for
 * the next while also go to the primary — a user sees their own save at once even when the
 * replica is a few seconds behind. Ingest, the worker and everything outside a request read
 * the primary (packages/db/src/replicas.ts).
 */
import type { RequestHandler } from 'express';
import { readFromReplica } from '@turnstone/db/replicas';
import type { Config } from '../config.ts';

/** Cookie set by a write: its holder's reads go to the primary until it expires. */
export const OWN_WRITES_COOKIE = 'ts_own_writes';

export function readRouting(
  config: Pick<Config, 'REPLICA_MAX_LAG_S' | 'COOKIE_SECURE'>,
): RequestHandler {
  // Longer than the lag a replica may have and still serve reads, with a margin for the
  // probe interval.
  const windowMs = (config.REPLICA_MAX_LAG_S + 5) * 1000;
  return (req, res, next) => {
    if (req.method === 'GET' || req.method === 'HEAD') {
      if (req.cookies?.[OWN_WRITES_COOKIE]) return next();
      return readFromReplica(() => next());
    }
    res.cookie(OWN_WRITES_COOKIE, '1', {
      maxAge: windowMs,
      httpOnly: true,
      sameSite: 'strict',
      secure: config.COOKIE_SECURE,
      path: '/api',
    });
    next();
  };
}
