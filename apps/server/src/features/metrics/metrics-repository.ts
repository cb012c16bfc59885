/** The counts the metrics endpoint reads from the queue and the outbox. */
import type { DbHandle } from '@turnstone/db/client';

type Rows<T> = [T[], unknown];
type Counts = Record<string, string | number | null>;

/**
 * Each count uses an index prefix (jobs: state, run_after; outbox: sent_at), and `done`
 * jobs and sent mail, which grow for ever, are not counted here.
 */
export async function queueAndOutboxCounts(
  pool: DbHandle['pool'],
): Promise<{ jobs: Counts; mail: Counts }> {
  const [jobRows] = (await pool.query(
    `SELECT
       SUM(state = 'queued' AND run_after <= NOW(3)) AS due,
       SUM(state = 'queued' AND run_after > NOW(3)) AS waiting,
       SUM(state = 'running') AS running,
       SUM(state = 'failed') AS failed,
       TIMESTAMPDIFF(MICROSECOND,
         MIN(CASE WHEN state = 'queued' AND run_after <= NOW(3) THEN run_after END),
         NOW(3)) / 1e6 AS oldest_due_s
     FROM jobs WHERE state IN ('queued', 'running', 'failed')`,
  )) as Rows<Record<string, string | number | null>>;
  const [mailRows] = (await pool.query(
    `SELECT
       SUM(outcome IS NULL) AS pending,
       SUM(outcome = 'failed') AS failed,
       SUM(outcome = 'uncertain') AS uncertain,
       TIMESTAMPDIFF(MICROSECOND, MIN(CASE WHEN outcome IS NULL THEN created_at END), NOW(3))
         / 1e6 AS oldest_pending_s
     FROM outbox WHERE sent_at IS NULL`,
  )) as Rows<Record<string, string | number | null>>;
  return { jobs: jobRows[0] ?? {}, mail: mailRows[0] ?? {} };
}
