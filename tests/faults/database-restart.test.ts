/**
 * MariaDB stopped and restarted during a steady ingest: the API answers 503 with Retry-After
 * while it is away, recovers by itself, and afterwards every snapshot is stored exactly once.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import mysql from 'mysql2/promise';
import { startLocalMariadb, type LocalMariadb } from '@turnstone/db/local-server';
import type { RunningServer } from '../../apps/server/src/server.ts';
import { startQuietServer } from '../support/test-server.ts';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { postUntilAnswered } from '../support/retrying-poster.ts';
import { snapshotBody } from '../support/signals.ts';

let db: LocalMariadb;
let srv: RunningServer;
let dataDir: string;
const TAG = 'MFP-P101-MDE-H';

beforeAll(async () => {
  dataDir = mkdtempSync(join(process.env.TURNSTONE_TEST_TMP ?? tmpdir(), 'fault-db-'));
  db = await startLocalMariadb({ dataDir, database: 'fault_db' });
  srv = await startQuietServer(db.url, dataDir);
});
afterAll(async () => {
  await srv?.stop();
  await db?.stop();
});

describe('the private MariaDB is private', () => {
  it('root needs the generated password, the folder and password files are private, no TCP', async () => {
    // common practice, no source: a database of one user, reachable by that user alone.
    await expect(
      mysql.createConnection({ socketPath: db.socket, user: 'root', password: '' }),
    ).rejects.toMatchObject({ code: 'ER_ACCESS_DENIED_ERROR' });
    const rootPassword = readFileSync(join(db.dir, 'root-password'), 'utf8').trim();
    expect(rootPassword.length).toBeGreaterThanOrEqual(20);
    expect(statSync(join(db.dir, 'root-password')).mode & 0o777).toBe(0o600);
    expect(statSync(join(db.dir, 'password')).mode & 0o777).toBe(0o600);
    expect(statSync(db.dir).mode & 0o777).toBe(0o700);
    expect(statSync(db.socket).mode & 0o077).toBe(0);
    const root = await mysql.createConnection({
      socketPath: db.socket,
      user: 'root',
      password: rootPassword,
    });
    const [rows] = await root.query('SELECT @@skip_networking AS off');
    await root.end();
    expect(Number((rows as { off: number }[])[0]!.off)).toBe(1);
    expect(db.port).toBe(0);
    expect(db.url).not.toMatch(/@127\.0\.0\.1:/);
  });
});

async function signInAdmin(): Promise<string> {
  const res = await fetch(`${srv.url}/api/v1/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: 'admin@turnstone.local', password: 'turnstone-demo' }),
  });
  return (res.headers.get('set-cookie') ?? '').split(';')[0]!;
}

describe('database away during ingest', () => {
  it('answers 503 with Retry-After while it is down, recovers, and loses or doubles nothing', async () => {
    const cookie = await signInAdmin();
    const gw = (await (
      await fetch(`${srv.url}/api/v1/gateways`, {
        method: 'POST',
        headers: { cookie, 'content-type': 'application/json' },
        body: JSON.stringify({ siteId: 1, name: 'fault gw' }),
      })
    ).json()) as { apiKey: string };
    const key = gw.apiKey;
    const total = 60;
    const bodies = Array.from({ length: total }, (_, i) =>
      snapshotBody(TAG, `fault-${i}`, {
        takenAt: new Date(Date.parse('2026-11-01T00:00:00Z') + i * 60_000).toISOString(),
        seed: i,
      }),
    );

    // A steady sender in the background, 4 at a time, each retrying until answered.
    let next = 0;
    const outcomes: { uid: string; status: number; attempts: number }[] = [];
    const sender = async () => {
      while (next < total) {
        const body = bodies[next++]!;
        outcomes.push(await postUntilAnswered(srv.url, key, body, 90_000));
        await new Promise((r) => setTimeout(r, 20));
      }
    };
    const senders = Promise.all([sender(), sender(), sender(), sender()]);

    while (outcomes.length < 15) await new Promise((r) => setTimeout(r, 20));
    await db.stop();
    // While it is away: health says so, and ingest answers 503 with Retry-After.
    const health = await fetch(`${srv.url}/api/health`);
    expect(health.status).toBe(503);
    expect(((await health.json()) as { db: string }).db).toBe('down');
    const during = await fetch(`${srv.url}/api/ingest/v1/snapshots`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', authorization: `Bearer ${key}` },
      body: JSON.stringify(bodies[total - 1]),
    });
    expect(during.status).toBe(503);
    expect(Number(during.headers.get('retry-after'))).toBeGreaterThan(0);
    expect(((await during.json()) as { error: { code: string } }).error.code).toBe(
      'db_unavailable',
    );
    await new Promise((r) => setTimeout(r, 1500));
    db = await startLocalMariadb({ dataDir, database: 'fault_db', port: db.port });

    await senders;
    expect(outcomes.length).toBe(total);
    expect(outcomes.every((o) => o.status === 201 || o.status === 200)).toBe(true);
    expect(outcomes.some((o) => o.attempts > 1)).toBe(true);
    expect((await fetch(`${srv.url}/api/health`)).status).toBe(200);

    const conn = await mysql.createConnection(db.url);
    const [rows] = await conn.query(
      "SELECT uid, COUNT(*) AS n FROM snapshots WHERE uid LIKE 'fault-%' GROUP BY uid",
    );
    const [jobs] = await conn.query(
      "SELECT COUNT(*) AS n FROM jobs j JOIN snapshots s ON s.id = j.snapshot_id WHERE s.uid LIKE 'fault-%'",
    );
    await conn.end();
    expect((rows as unknown[]).length).toBe(total);
    expect((rows as { n: number }[]).every((r) => Number(r.n) === 1)).toBe(true);
    expect(Number((jobs as { n: number }[])[0]!.n)).toBe(total);

    // And the worker, too, carries on against the restarted server.
    const worker = createWorker(srv.ctx, { owner: 'after-restart' });
    expect(await worker.drain()).toBe(total);
  }, 180_000);
});
