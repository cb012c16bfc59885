/**
 * Read replicas through MariaDB's own replication: a real primary and a real replica (two
 * private `mariadbd` on loopback, binary log with GTID). The product writes to the primary,
 * dashboard reads come from the replica, a user's own write is read back from the primary,
 * and a replica that stops replicating or stops altogether is skipped.
 *
 * Replication set-up as in the MariaDB Knowledge Base, "Setting up replication" and "Global
 * Transaction ID" (CHANGE MASTER TO … MASTER_USE_GTID=slave_pos); the lag signal is
 * `Seconds_Behind_Master` of SHOW SLAVE STATUS, NULL while the SQL thread is stopped (same
 * source, "SHOW REPLICA STATUS").
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import mysql from 'mysql2/promise';
import { freePort, startLocalMariadb, type LocalMariadb } from '@turnstone/db/local-server';
import { start, type RunningServer } from '../../apps/server/src/server.ts';
import { OWN_WRITES_COOKIE } from '../../apps/server/src/lib/read-routing.ts';

const DB = 'repl_db';
let primary: LocalMariadb;
let replica: LocalMariadb | null = null;
let srv: RunningServer;
let replicaRoot: mysql.Connection;
let primaryRoot: mysql.Connection;

const rootOf = (m: LocalMariadb) =>
  mysql.createConnection({
    socketPath: m.socket,
    user: 'root',
    password: readFileSync(join(m.dir, 'root-password'), 'utf8').trim(),
  });

async function until(what: string, ok: () => Promise<boolean>, ms = 20_000): Promise<void> {
  const end = Date.now() + ms;
  while (Date.now() < end) {
    if (await ok()) return;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`timed out waiting for ${what}`);
}

beforeAll(async () => {
  const tmp = process.env.TURNSTONE_TEST_TMP ?? tmpdir();
  primary = await startLocalMariadb({
    dataDir: mkdtempSync(join(tmp, 'repl-primary-')),
    database: DB,
    port: await freePort(),
    serverArgs: ['--log-bin=binlog', '--server-id=1', '--binlog-format=ROW'],
  });
  primaryRoot = await rootOf(primary);
  await primaryRoot.query("CREATE USER 'repl'@'127.0.0.1' IDENTIFIED BY 'repl-test-password'");
  await primaryRoot.query("GRANT REPLICATION SLAVE ON *.* TO 'repl'@'127.0.0.1'");
  // Both servers made their own database and account at start; the replica starts from the
  // primary's position after that, so only the product's own statements replicate.
  const [pos] = await primaryRoot.query('SELECT @@gtid_binlog_pos AS pos');
  const gtid = (pos as { pos: string }[])[0]!.pos;

  replica = await startLocalMariadb({
    dataDir: mkdtempSync(join(tmp, 'repl-replica-')),
    database: DB,
    port: await freePort(),
    serverArgs: ['--server-id=2', '--read-only=1'],
    supervise: false,
  });
  replicaRoot = await rootOf(replica);
  await replicaRoot.query('SET GLOBAL gtid_slave_pos = ?', [gtid]);
  await replicaRoot.query(
    `CHANGE MASTER TO MASTER_HOST='127.0.0.1', MASTER_PORT=${primary.port},
     MASTER_USER='repl', MASTER_PASSWORD='repl-test-password', MASTER_USE_GTID=slave_pos`,
  );
  await replicaRoot.query('START SLAVE');

  srv = await start({
    DATABASE_URL: primary.url,
    DATABASE_REPLICA_URLS: replica.url,
    REPLICA_MAX_LAG_S: '2',
    DATA_DIR: mkdtempSync(join(tmp, 'repl-data-')),
    PORT: '0',
    BUILD_WEB: 'false',
    LOG_LEVEL: 'silent',
    RUN_WORKER: 'false',
    DEMO_HISTORY_WEEKS: '0',
  });
}, 120_000);

afterAll(async () => {
  await srv?.stop();
  await replicaRoot?.end().catch(() => {});
  await primaryRoot?.end();
  await replica?.stop();
  await primary?.stop();
});

/** Sign-in answers two cookies: the session, and the own-writes mark (sign-in is a POST). */
async function signIn(): Promise<{ session: string; ownWrites: string }> {
  const res = await fetch(`${srv.url}/api/v1/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: 'admin@turnstone.local', password: 'turnstone-demo' }),
  });
  expect(res.status).toBe(200);
  const cookies = res.headers.getSetCookie().map((c) => c.split(';')[0]!);
  const ownWrites = cookies.find((c) => c.startsWith(`${OWN_WRITES_COOKIE}=`));
  const session = cookies.find((c) => !c.startsWith(`${OWN_WRITES_COOKIE}=`));
  expect(ownWrites).toBeDefined();
  return { session: session!, ownWrites: ownWrites! };
}

async function siteNames(cookie: string): Promise<string[]> {
  const res = await fetch(`${srv.url}/api/v1/sites`, { headers: { cookie } });
  expect(res.status).toBe(200);
  return ((await res.json()) as { items: { name: string }[] }).items.map((s) => s.name);
}

const usable = () => srv.ctx.dbHandle.replicas()[0]?.usable === true;

describe('reads from a MariaDB replica', () => {
  it('replicates the product’s writes, reads dashboard GETs from the replica and a user’s own write from the primary', async () => {
    const { session, ownWrites } = await signIn();
    const created = await fetch(`${srv.url}/api/v1/sites`, {
      method: 'POST',
      headers: { cookie: session, 'content-type': 'application/json', origin: srv.url },
      body: JSON.stringify({ name: 'Harbour Pumping Station', code: 'HPS', timeZone: 'UTC' }),
    });
    expect(created.status).toBe(201);
    // The write reached the replica through the binary log.
    await until('the new site on the replica', async () => {
      const [rows] = await replicaRoot.query(`SELECT name FROM ${DB}.sites WHERE code = 'HPS'`);
      return (rows as unknown[]).length === 1;
    });
    await until('the replica to be usable', async () => usable());

    // Mark one row on the replica only, so an answer shows which server it came from.
    const [before] = await primaryRoot.query(
      `SELECT id, name FROM ${DB}.sites ORDER BY id LIMIT 1`,
    );
    const first = (before as { id: number; name: string }[])[0]!;
    await replicaRoot.query(`UPDATE ${DB}.sites SET name = 'seen on the replica' WHERE id = ?`, [
      first.id,
    ]);
    const fromReplica = await siteNames(session);
    expect(fromReplica).toContain('seen on the replica');
    expect(fromReplica).toContain('Harbour Pumping Station');
    // The same user right after their own write reads the primary.
    const own = await siteNames(`${session}; ${ownWrites}`);
    expect(own).toContain(first.name);
    expect(own).not.toContain('seen on the replica');
  });

  it('checks sessions on the primary: a session ended a moment ago does not pass on a replica that is behind', async () => {
    const { session } = await signIn();
    const signOut = await fetch(`${srv.url}/api/v1/auth/sign-out`, {
      method: 'POST',
      headers: { cookie: session, origin: srv.url },
    });
    expect(signOut.status).toBeLessThan(300);
    await until('the sign-out on the replica', async () => {
      const [rows] = await replicaRoot.query(
        `SELECT token_version AS v FROM ${DB}.users WHERE email = 'admin@turnstone.local'`,
      );
      const [prim] = await primaryRoot.query(
        `SELECT token_version AS v FROM ${DB}.users WHERE email = 'admin@turnstone.local'`,
      );
      return (rows as { v: number }[])[0]!.v === (prim as { v: number }[])[0]!.v;
    });
    // The replica as it was a moment before the sign-out (a replica that is behind).
    await replicaRoot.query(
      `UPDATE ${DB}.users SET token_version = token_version - 1 WHERE email = 'admin@turnstone.local'`,
    );
    const res = await fetch(`${srv.url}/api/v1/sites`, { headers: { cookie: session } });
    expect(res.status).toBe(401);
    await replicaRoot.query(
      `UPDATE ${DB}.users SET token_version = token_version + 1 WHERE email = 'admin@turnstone.local'`,
    );
  });

  it('skips a replica whose replication stopped, and uses it again when it catches up', async () => {
    const { session } = await signIn();
    await replicaRoot.query('STOP SLAVE SQL_THREAD');
    await until('the stopped replica to be skipped', async () => !usable());
    expect(await siteNames(session)).not.toContain('seen on the replica');
    expect(srv.ctx.dbHandle.replicas()[0]!.lastError).toMatch(/replication not running/);
    // The metrics say so (a loopback scrape).
    const metrics = await (await fetch(`${srv.url}/metrics`)).text();
    expect(metrics).toMatch(
      /^turnstone_database_replica_usable\{replica="mysql:\/\/turnstone@127\.0\.0\.1:\d+\/repl_db[^"]*"\} 0$/m,
    );
    await replicaRoot.query('START SLAVE SQL_THREAD');
    await until('the replica to be usable again', async () => usable());
    expect(await siteNames(session)).toContain('seen on the replica');
  });

  it('falls back to the primary when the replica server is down', async () => {
    const { session } = await signIn();
    await replicaRoot.end();
    await replica!.stop();
    replica = null;
    await until('the stopped replica to be skipped', async () => !usable());
    const health = srv.ctx.dbHandle.replicas()[0]!;
    expect(health.up).toBe(false);
    // Every read answers, from the primary.
    for (let i = 0; i < 5; i++)
      expect(await siteNames(session)).not.toContain('seen on the replica');
  });
});
