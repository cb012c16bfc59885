/** What one request is told by the per-gateway rate: its headers, and whether it is over. */
export interface RateVerdict {
  headers: [string, string][];
  limited: boolean;
  /** Whole seconds until the window resets (the 429's Retry-After). */
  resetS: number;
}

/**
 * Per-gateway request budget for ingest: `limit` requests per `windowMs`, counted from the
 * gateway's first request of the window (the window express-rate-limit's memory store
 * keeps), answered with the IETF draft-7 `RateLimit` / `RateLimit-Policy` headers; the
 * caller answers 429 with Retry-After when `limited`. Written out because it runs on every
 * post, where the general-purpose middleware (promises, per-request validations, key
 * generators) took several percent of the request's CPU.
 */
export function createGatewayRate(options: {
  limit: number;
  windowMs: number;
}): (gatewayId: number, now?: number) => RateVerdict {
  const { limit, windowMs } = options;
  const windows = new Map<number, { hits: number; resetAt: number }>();
  const policy = `${limit};w=${Math.ceil(windowMs / 1000)}`;
  return (id, now = Date.now()) => {
    let w = windows.get(id);
    if (!w || w.resetAt <= now) {
      if (!w && windows.size > 100_000) windows.clear();
      w = { hits: 0, resetAt: now + windowMs };
      windows.set(id, w);
    }
    w.hits++;
    const resetS = Math.max(1, Math.ceil((w.resetAt - now) / 1000));
    return {
      resetS,
      headers: [
        ['RateLimit-Policy', policy],
        ['RateLimit', `limit=${limit}, remaining=${Math.max(0, limit - w.hits)}, reset=${resetS}`],
      ],
      limited: w.hits > limit,
    };
  };
}
