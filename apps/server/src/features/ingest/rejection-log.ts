/**
 * Rejected gateway posts (401, 403, 404, 429) at warn, so a gateway with a wrong or revoked
 * key, a mistyped point tag or a runaway send rate shows up at the default log level —
 * but a gateway retrying every few seconds does not flood the log: per sender and reason,
 * the first rejection is logged at once and the others of the next `quietMs` are counted
 * into one line when that sender and reason are rejected again after it.
 */
import type { Logger } from '../../lib/logger.ts';

export const LOGGED_REJECTIONS: ReadonlySet<number> = new Set([401, 403, 404, 429]);

export interface Rejection {
  status: number;
  code: string;
  /** The gateway's id when its key was valid; else the key prefix or the client address. */
  gatewayId?: number;
  client: string;
  path: string;
  requestId?: string;
  message?: string;
}

export function createRejectionLog(
  log: Logger,
  quietMs = 60_000,
): (r: Rejection, now?: number) => void {
  const last = new Map<string, { at: number; suppressed: number }>();
  return (r, now = Date.now()) => {
    if (!LOGGED_REJECTIONS.has(r.status)) return;
    const key = `${r.gatewayId ?? r.client}|${r.status}|${r.code}`;
    const seen = last.get(key);
    if (seen && now - seen.at < quietMs) {
      seen.suppressed++;
      return;
    }
    if (last.size > 10_000) last.clear();
    last.set(key, { at: now, suppressed: 0 });
    log.warn('gateway post rejected', {
      status: r.status,
      code: r.code,
      gatewayId: r.gatewayId,
      client: r.client,
      path: r.path,
      requestId: r.requestId,
      reason: r.message,
      ...(seen?.suppressed ? { alsoRejectedSinceLastLine: seen.suppressed } : {}),
    });
  };
}
