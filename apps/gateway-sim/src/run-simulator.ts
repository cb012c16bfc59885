/**
 * The gateway loop: every interval, one capture of each point of the site, posted in
 * batches at a bounded rate; stops after `count` rounds or when the signal aborts.
 */
import type { SnapshotIn } from '@turnstone/contracts/ingest';
import type { SimOptions } from './cli-args.ts';
import { newTally, sendBatch, type SendTally } from './ingest-client.ts';
import { demoChannels } from '@turnstone/demo-scenario/plant-channels';
import { simulateSnapshot, toIngestItem } from '@turnstone/demo-scenario/simulated-snapshot';

/** The span over which the stories run (progress 0 → 1); the simulator continues from 1. */
const STORY_SPAN_MS = 12 * 7 * 86_400_000;

export interface RunHooks {
  signal?: AbortSignal;
  log?: (m: string) => void;
  /** Injected for tests. @default Date.now */
  now?: () => number;
  sleep?: (ms: number, signal?: AbortSignal) => Promise<void>;
  /** Back-off base for retries, ms. @default 500 */
  baseDelayMs?: number;
}

const realSleep = (ms: number, signal?: AbortSignal) =>
  new Promise<void>((resolve) => {
    if (ms <= 0) return resolve();
    const t = setTimeout(resolve, ms);
    signal?.addEventListener('abort', () => {
      clearTimeout(t);
      resolve();
    });
  });

export async function runSimulator(
  o: SimOptions,
  hooks: RunHooks = {},
): Promise<SendTally & { rounds: number }> {
  const now = hooks.now ?? Date.now;
  const sleep = hooks.sleep ?? realSleep;
  const channels = demoChannels(o.site);
  if (channels.length === 0) throw new Error(`the demo plant has no site "${o.site}"`);
  const intervalMs = o.intervalS * 1000;
  const anchor = o.from ? o.from.getTime() : Math.ceil(now() / 1000) * 1000;
  const tally = newTally();
  const startedAt = now();
  let rounds = 0;
  for (let k = 0; o.count === null || k < o.count; k++) {
    if (hooks.signal?.aborted) break;
    const roundAt = anchor + k * intervalMs;
    // A live gateway captures when the time comes; a backfill of past rounds does not wait.
    await sleep(roundAt - now(), hooks.signal);
    if (hooks.signal?.aborted) break;
    const items: SnapshotIn[] = channels.map((c) =>
      toIngestItem(
        simulateSnapshot(c, new Date(roundAt), 1 + (roundAt - anchor) / STORY_SPAN_MS, {
          faults: o.faults,
        }),
      ),
    );
    for (let i = 0; i < items.length; i += o.batch) {
      const batch = items.slice(i, i + o.batch);
      if (o.ratePerS !== null) {
        // Keep the average at or below the rate: the next batch waits for its slot.
        const due = startedAt + (tally.sent / o.ratePerS) * 1000;
        await sleep(due - now(), hooks.signal);
      }
      if (hooks.signal?.aborted) break;
      await sendBatch(
        batch,
        {
          url: o.url,
          key: o.key,
          maxRetries: o.maxRetries,
          ...(hooks.signal ? { signal: hooks.signal } : {}),
          ...(hooks.log ? { log: hooks.log } : {}),
          ...(hooks.baseDelayMs !== undefined ? { baseDelayMs: hooks.baseDelayMs } : {}),
        },
        tally,
      );
    }
    rounds++;
    hooks.log?.(
      `round ${rounds} at ${new Date(roundAt).toISOString()}: ${items.length} snapshots (accepted ${tally.accepted}, duplicates ${tally.duplicates})`,
    );
  }
  return { ...tally, rounds };
}

export function summaryLine(t: SendTally & { rounds: number }): string {
  return `rounds ${t.rounds}, sent ${t.sent}, accepted ${t.accepted}, duplicates ${t.duplicates}, retries ${t.retries}, failures ${t.failures}`;
}
