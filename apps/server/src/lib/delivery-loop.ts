/**
 * The loop of an outgoing queue (mail outbox, webhook deliveries): `drain()` sends until the
 * queue has nothing due (one drain at a time; a second call joins the running one), and
 * `start()` drains every five seconds, logging a database outage as a warning.
 */
import cron, { type ScheduledTask } from 'node-cron';
import { isDbUnavailable } from '@turnstone/db/errors';
import type { Logger } from './logger.ts';

export interface DeliveryLoop<R> {
  drain(): Promise<R[]>;
  start(): void;
  stop(): Promise<void>;
}

export function deliveryLoop<R>(
  log: Logger,
  o: {
    /** The cron task's name. */
    name: string;
    /** What the log says when the database is away, and when a tick failed otherwise. */
    unavailable: string;
    failed: string;
    drainOnce: () => Promise<R[]>;
    /** Runs after the loop stopped (close a transport). */
    afterStop?: () => void;
  },
): DeliveryLoop<R> {
  const tasks: ScheduledTask[] = [];
  let running: Promise<R[]> | null = null;
  const drain = () => {
    running ??= o.drainOnce().finally(() => {
      running = null;
    });
    return running;
  };
  return {
    drain,
    start() {
      tasks.push(
        cron.schedule(
          '*/5 * * * * *',
          async () => {
            try {
              await drain();
            } catch (err) {
              if (isDbUnavailable(err)) log.warn(o.unavailable);
              else log.error(o.failed, { err });
            }
          },
          { noOverlap: true, name: o.name },
        ),
      );
    },
    async stop() {
      for (const t of tasks.splice(0)) await t.stop();
      await running?.catch(() => {});
      o.afterStop?.();
    },
  };
}

/** Claims and handles batches until a claim comes back empty (at most 100 rounds). */
export async function inClaimedRounds<Row, R>(
  claim: () => Promise<Row[]>,
  handle: (row: Row) => Promise<R>,
): Promise<R[]> {
  const out: R[] = [];
  for (let round = 0; round < 100; round++) {
    const rows = await claim();
    if (rows.length === 0) break;
    for (const row of rows) out.push(await handle(row));
  }
  return out;
}
