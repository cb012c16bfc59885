/**
 * Posts snapshots to the ingest API like a field gateway: retries network errors and 5xx
 * with exponential back-off (full jitter), waits as long as Retry-After says on 429/503,
 * and retries with the same uids, so the server's idempotency (201 new, 200 same uid and
 * content) makes delivery exactly-once in effect. Never retries other 4xx.
 */
import type { SnapshotIn } from '@turnstone/contracts/ingest';

export interface SendTally {
  sent: number;
  accepted: number;
  duplicates: number;
  retries: number;
  failures: number;
  /** uid → why it failed (rejected by the server or out of retries). */
  failed: Map<string, string>;
}

export const newTally = (): SendTally => ({
  sent: 0,
  accepted: 0,
  duplicates: 0,
  retries: 0,
  failures: 0,
  failed: new Map(),
});

export interface ClientOptions {
  url: string;
  key: string;
  maxRetries: number;
  /** First back-off, ms. @default 500 */
  baseDelayMs?: number;
  /** Longest back-off or Retry-After honoured, ms. @default 60000 */
  maxDelayMs?: number;
  /** Aborts waits and requests (SIGINT). */
  signal?: AbortSignal;
  /** Injected for tests: the clock's sleep. @default setTimeout */
  sleep?: (ms: number, signal?: AbortSignal) => Promise<void>;
  log?: (m: string) => void;
}

/** Retry-After as seconds or an HTTP date → ms to wait (null when absent or unreadable). */
export function retryAfterMs(header: string | null, nowMs = Date.now()): number | null {
  if (!header) return null;
  const s = Number(header.trim());
  if (Number.isFinite(s) && s >= 0) return s * 1000;
  const t = Date.parse(header);
  return Number.isNaN(t) ? null : Math.max(0, t - nowMs);
}

/** Exponential back-off with full jitter (AWS Architecture Blog, "Exponential Backoff and Jitter", 2015). */
export function backoffMs(
  attempt: number,
  baseMs: number,
  maxMs: number,
  random = Math.random,
): number {
  return Math.min(maxMs, baseMs * 2 ** attempt) * (0.5 + 0.5 * random());
}

const defaultSleep = (ms: number, signal?: AbortSignal) =>
  new Promise<void>((resolve) => {
    const t = setTimeout(resolve, ms);
    signal?.addEventListener('abort', () => {
      clearTimeout(t);
      resolve();
    });
  });

interface ItemResult {
  uid: string | null;
  status: string;
  httpStatus: number;
  error?: { code: string; message: string };
}

/**
 * Sends one batch (1 item: a single-snapshot request; more: `{ snapshots: [...] }`),
 * retrying what can be retried, and adds the outcome to `tally`.
 */
export async function sendBatch(
  items: SnapshotIn[],
  o: ClientOptions,
  tally: SendTally,
): Promise<void> {
  const sleep = o.sleep ?? defaultSleep;
  const base = o.baseDelayMs ?? 500;
  const max = o.maxDelayMs ?? 60_000;
  let pending = items;
  tally.sent += items.length;
  for (let attempt = 0; pending.length > 0; attempt++) {
    if (o.signal?.aborted) break;
    let wait: number | null = null;
    let reason = '';
    try {
      const body = pending.length === 1 ? pending[0] : { snapshots: pending };
      const res = await fetch(`${o.url}/api/ingest/v1/snapshots`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', authorization: `Bearer ${o.key}` },
        body: JSON.stringify(body),
        ...(o.signal ? { signal: o.signal } : {}),
      });
      const text = await res.text();
      if (res.status === 429 || res.status === 503 || res.status >= 500) {
        reason = `HTTP ${res.status}`;
        wait = retryAfterMs(res.headers.get('retry-after')) ?? backoffMs(attempt, base, max);
      } else {
        const json = text ? (JSON.parse(text) as Record<string, unknown>) : {};
        const results: ItemResult[] =
          pending.length === 1
            ? [
                {
                  uid: pending[0]!.uid,
                  status: (json.status as string) ?? 'error',
                  httpStatus: res.status,
                  ...(json.error ? { error: json.error as ItemResult['error'] } : {}),
                },
              ]
            : ((json.results as ItemResult[] | undefined) ??
              pending.map((p) => ({
                uid: p.uid,
                status: 'error',
                httpStatus: res.status,
                error: json.error as ItemResult['error'],
              })));
        const again: SnapshotIn[] = [];
        results.forEach((r, i) => {
          const item = pending[i]!;
          if (r.httpStatus === 201) tally.accepted++;
          else if (r.httpStatus === 200) tally.duplicates++;
          else if (r.httpStatus === 429 || r.httpStatus >= 500) again.push(item);
          else {
            tally.failures++;
            tally.failed.set(
              item.uid,
              `${r.httpStatus} ${r.error?.code ?? r.status}: ${r.error?.message ?? ''}`,
            );
          }
        });
        pending = again;
        if (pending.length === 0) return;
        reason = 'items asked to retry';
        wait = backoffMs(attempt, base, max);
      }
    } catch (err) {
      if (o.signal?.aborted) break;
      reason = (err as Error).message;
      wait = backoffMs(attempt, base, max);
    }
    if (attempt >= o.maxRetries) {
      for (const p of pending) {
        tally.failures++;
        tally.failed.set(p.uid, `gave up after ${o.maxRetries} retries (${reason})`);
      }
      return;
    }
    tally.retries += pending.length;
    o.log?.(
      `retrying ${pending.length} snapshot(s) in ${Math.round(Math.min(wait, max))} ms: ${reason}`,
    );
    await sleep(Math.min(wait, max), o.signal);
  }
  // Interrupted: what was not confirmed is reported, never silently dropped.
  for (const p of pending) {
    tally.failures++;
    tally.failed.set(p.uid, 'interrupted before the server confirmed it');
  }
}
