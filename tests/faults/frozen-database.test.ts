/**
 * A frozen database — the server process stopped (SIGSTOP), not down: connections stay open
 * and no error ever comes back. Ingest must not hang: it answers 503 with Retry-After
 * within INGEST_TIMEOUT_S, and once the database thaws the gateway's retry of the same uid
 * is stored exactly once.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { startLocalMariadb, type LocalMariadb } from '@turnstone/db/local-server';
import type { RunningServer } from '../../apps/server/src/server.ts';
import { startQuietServer } from '../support/test-server.ts';
import { snapshotBody } from '../support/signals.ts';

let db: LocalMariadb;
let srv: RunningServer;
let pid = 0;
const TIMEOUT_S = 3;

beforeAll(async () => {
  const dataDir = mkdtempSync(join(process.env.TURNSTONE_TEST_TMP ?? tmpdir(), 'fault-frozen-'));
  db = await startLocalMariadb({ dataDir, database: 'fault_frozen' });
  pid = Number(readFileSync(join(db.dir, 'mariadbd.pid'), 'utf8').trim());
  srv = await startQuietServer(db.url, dataDir, { INGEST_TIMEOUT_S: String(TIMEOUT_S) });
});
afterAll(async () => {
  if (pid) process.kill(pid, 'SIGCONT');
  await srv?.stop();
  await db?.stop();
});

describe('database frozen during ingest', () => {
  it('answers 503 with Retry-After within the timeout, and the retry after the thaw stores once', async () => {
    const key = readFileSync(join(srv.ctx.dataDir, 'demo-gateway-keys.txt'), 'utf8')
      .split('\n')[0]!
      .split(' ')[1]!;
    // One body per uid, as a gateway keeps its capture for the retries.
    const bodies = new Map<string, string>();
    const bodyOf = (uid: string) => {
      if (!bodies.has(uid)) bodies.set(uid, JSON.stringify(snapshotBody('MFP-P101-MDE-H', uid)));
      return bodies.get(uid)!;
    };
    const post = (uid: string) =>
      fetch(`${srv.url}/api/ingest/v1/snapshots`, {
        method: 'POST',
        headers: { authorization: `Bearer ${key}`, 'content-type': 'application/json' },
        body: bodyOf(uid),
        // The client's own limit, far above the server's: the server must answer first.
        signal: AbortSignal.timeout(30_000),
      });
    expect((await post('frozen-0')).status).toBe(201); // warms the key and point caches

    process.kill(pid, 'SIGSTOP');
    let answers: Response[];
    try {
      // Several at once: they queue for the pool's connections as much as for the server.
      answers = await Promise.all(['frozen-1', 'frozen-2', 'frozen-3'].map(post));
    } finally {
      process.kill(pid, 'SIGCONT');
    }
    for (const res of answers) {
      expect(res.status).toBe(503);
      expect(Number(res.headers.get('retry-after'))).toBeGreaterThan(0);
      expect(((await res.json()) as { error: { code: string } }).error.code).toBe('db_unavailable');
    }

    // Thawed: the gateway's retries are stored (or found stored) exactly once.
    for (const uid of ['frozen-1', 'frozen-2', 'frozen-3']) {
      let res = await post(uid);
      for (let i = 0; i < 20 && res.status === 503; i++) {
        await new Promise((r) => setTimeout(r, 500));
        res = await post(uid);
      }
      expect([200, 201]).toContain(res.status);
    }
    const [rows] = await srv.ctx.dbHandle.pool.query(
      "SELECT uid, COUNT(*) AS n FROM snapshots WHERE uid LIKE 'frozen-%' GROUP BY uid",
    );
    expect((rows as { n: number }[]).map((r) => Number(r.n))).toEqual([1, 1, 1, 1]);
    const [jobs] = await srv.ctx.dbHandle.pool.query(
      "SELECT COUNT(*) AS n FROM jobs j JOIN snapshots s ON s.id = j.snapshot_id WHERE s.uid LIKE 'frozen-%'",
    );
    expect(Number((jobs as { n: number }[])[0]!.n)).toBe(4);
  });
});
