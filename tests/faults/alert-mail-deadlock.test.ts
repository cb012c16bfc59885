/**
 * A real InnoDB deadlock while an alert's e-mail is queued inside the worker's batch
 * transaction. InnoDB has then rolled the whole transaction back, so the worker must not
 * carry on as if only the mail failed: the batch is written again (its jobs one by one) and
 * afterwards every job is done, every capture analysed once, the alert raised once and its
 * mail queued — nothing half-written, nothing lost.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import mysql from 'mysql2/promise';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { postVelocities } from '../support/alert-captures.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';

let srv: TestServer;
let key = '';
const TAG = 'MFP-P101-MDE-H';
const t0 = Date.now() - 48 * 3600_000;
let seq = 0;

type Row = Record<string, unknown>;
const q = (sqlText: string, params: unknown[] = []) => srv.q<Row>(sqlText, params);

async function ingest(velocities: number[]) {
  seq = await postVelocities(srv, key, TAG, velocities, { t0, from: seq, uidPrefix: 'dl' });
}

async function waitFor(what: string, check: () => Promise<boolean>, ms = 60_000) {
  const until = Date.now() + ms;
  while (Date.now() < until) {
    if (await check()) return;
    await new Promise((r) => setTimeout(r, 20));
  }
  const sessions = await q(
    'SELECT ID, COMMAND, STATE, TIME_MS, LEFT(INFO, 80) AS info FROM information_schema.PROCESSLIST',
  );
  throw new Error(`timed out waiting for ${what}: ${JSON.stringify(sessions)}`);
}

beforeAll(async () => {
  srv = await startTestServer();
  key = await srv.gatewayKey(1, 'gw-deadlock');
});
afterAll(async () => {
  await srv?.stop();
});

describe('a deadlock while alert mail is queued', () => {
  it('is not swallowed: the batch is written again whole and the alert and its mail are stored once', async () => {
    // P-101 overall velocity: template alert level 2.8 mm/s, persistence 2 (the condition
    // package's template defaults, ISO 20816-3 group 2 rigid; from memory). Two quiet
    // captures first, judged on their own.
    await ingest([1.5, 1.5]);
    await createWorker(srv.ctx, { owner: 'deadlock-warmup' }).drain();
    const [point] = await q('SELECT id FROM points WHERE tag = ?', [TAG]);
    const pointId = Number(point!.id);

    // The two loud captures of one batch raise the alert on the second: its mail is queued
    // inside the batch transaction, which by then holds the point's state row.
    await ingest([3.5, 3.5]);
    const jobIds = (
      await q(
        `SELECT j.id FROM jobs j JOIN snapshots s ON s.id = j.snapshot_id
          WHERE s.point_id = ? AND j.state <> 'done'`,
        [pointId],
      )
    ).map((r) => Number(r.id));
    expect(jobIds.length).toBe(2);

    // Another session makes itself the heavier transaction (InnoDB rolls back the lighter
    // one of a deadlock: MariaDB's documentation on deadlocks), then locks the outbox's
    // rows and gaps so the worker's mail insert waits for it.
    const url = new URL(srv.databaseUrl);
    const other = await mysql.createConnection({
      host: url.hostname,
      port: Number(url.port),
      user: decodeURIComponent(url.username),
      password: decodeURIComponent(url.password),
      database: url.pathname.slice(1),
      socketPath: url.searchParams.get('socketPath') ?? undefined,
    });
    try {
      await other.query('CREATE TABLE ballast (id INT PRIMARY KEY, pad CHAR(50)) ENGINE=InnoDB');
      await other.query('SET SESSION TRANSACTION ISOLATION LEVEL REPEATABLE READ');
      await other.query('START TRANSACTION');
      const rows = Array.from({ length: 3000 }, (_, i) => [i + 1, 'x']);
      await other.query('INSERT INTO ballast (id, pad) VALUES ?', [rows]);
      await other.query('SELECT id FROM outbox WHERE id >= 0 FOR UPDATE');

      const worker = createWorker(srv.ctx, { owner: 'deadlock-worker', batch: 2 });
      let finished = false;
      const drained = worker.drain().finally(() => {
        finished = true;
      });
      drained.catch(() => {});
      await waitFor('the worker to wait on the outbox', async () => {
        if (finished)
          throw new Error(
            `the worker finished without waiting: ${JSON.stringify(await q('SELECT id, state, last_error FROM jobs WHERE id IN (?)', [jobIds]))} ${JSON.stringify(await q('SELECT id, state FROM alerts'))}`,
          );
        // The product's account has no PROCESS privilege, so information_schema.innodb_trx
        // shows only its own session; the process list shows every session of the same
        // account. An insert into the outbox still running after half a second on this idle
        // database is waiting for the lock this session holds.
        const waiting = await q(
          `SELECT ID FROM information_schema.PROCESSLIST
            WHERE INFO LIKE 'insert into \`outbox\`%' AND TIME_MS > 500`,
        );
        return waiting.length > 0;
      });
      // Close the cycle: the worker holds the point's state row, this session the outbox.
      const closing = other.query('SELECT * FROM point_states WHERE point_id = ? FOR UPDATE', [
        pointId,
      ]);
      await closing;
      await other.query('ROLLBACK');
      await drained;
    } finally {
      await other.end();
    }

    const jobs = await q(`SELECT id, state FROM jobs WHERE id IN (?)`, [jobIds]);
    expect(jobs.map((j) => j.state)).toEqual(['done', 'done']);
    const analyses = await q(
      `SELECT snapshot_id, COUNT(*) AS n FROM analyses WHERE point_id = ? GROUP BY snapshot_id`,
      [pointId],
    );
    expect(analyses.length).toBe(4);
    expect(analyses.every((a) => Number(a.n) === 1)).toBe(true);
    const alerts = await q(
      `SELECT id FROM alerts WHERE point_id = ? AND band_key = 'overall-velocity'`,
      [pointId],
    );
    expect(alerts.length).toBe(1);
    const raised = await q(`SELECT id FROM alert_events WHERE alert_id = ? AND kind = 'raised'`, [
      alerts[0]!.id,
    ]);
    expect(raised.length).toBe(1);
    const mail = await q(`SELECT id FROM outbox WHERE dedupe_key LIKE ?`, [
      `alert:${String(raised[0]!.id)}:%`,
    ]);
    // The engineer subscribes to every alert on site 1 (demo seed).
    expect(mail.length).toBeGreaterThan(0);
  });
});
