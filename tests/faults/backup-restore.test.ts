/**
 * A backup taken while a gateway keeps posting and the worker keeps analysing, restored
 * into a new data folder, and the product started on it: every snapshot acknowledged before
 * the backup began is there, every analysis, alert and audit entry of that moment is there
 * unchanged, and the queue goes on consistently (no job lost, none done twice).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Pool, RowDataPacket } from 'mysql2/promise';
import { start, type RunningServer } from '../../apps/server/src/server.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { captureVelocities, gatewayKey } from '../support/alert-captures.ts';
import { snapshotBody } from '../support/signals.ts';

const tsx = join(process.cwd(), 'node_modules', 'tsx', 'dist', 'cli.mjs');
const tmp = () => process.env.TURNSTONE_TEST_TMP ?? tmpdir();
const TAG = 'MFP-P102-MDE-V';

function runCli(
  script: string,
  args: string[],
  env: Record<string, string>,
): Promise<{ code: number; out: string }> {
  return new Promise((resolve) => {
    const child = spawn(process.execPath, [tsx, script, ...args], {
      env: { ...process.env, DATABASE_URL: '', ...env },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let out = '';
    child.stdout.on('data', (d: Buffer) => (out += d.toString()));
    child.stderr.on('data', (d: Buffer) => (out += d.toString()));
    child.on('close', (code) => resolve({ code: code ?? 1, out }));
  });
}

/** Every row of a table as id → a digest of all its columns, computed by MariaDB. */
async function rowDigests(pool: Pool, table: string): Promise<Map<number, string>> {
  const [cols] = await pool.query<RowDataPacket[]>(
    'SELECT column_name AS c FROM information_schema.columns WHERE table_schema = DATABASE() AND table_name = ? ORDER BY ordinal_position',
    [table],
  );
  const list = cols.map((r) => `IFNULL(HEX(\`${r.c}\`), '∅')`).join(', ');
  const [rows] = await pool.query<RowDataPacket[]>(
    `SELECT id, SHA2(CONCAT_WS('|', ${list}), 256) AS d FROM \`${table}\``,
  );
  return new Map(rows.map((r) => [Number(r.id), String(r.d)]));
}

async function scalar(pool: Pool, sql: string): Promise<number> {
  const [[row]] = await pool.query<RowDataPacket[]>(sql);
  return Number(Object.values(row ?? {})[0]);
}

async function drained(pool: Pool, ms = 120_000): Promise<void> {
  const until = Date.now() + ms;
  while (
    (await scalar(pool, "SELECT COUNT(*) FROM jobs WHERE state IN ('queued','running')")) > 0
  ) {
    if (Date.now() > until) throw new Error('the queue did not drain');
    await new Promise((r) => setTimeout(r, 300));
  }
}

const CHECKED = ['analyses', 'alerts', 'alert_events', 'audit_log'] as const;

describe('backup while ingest runs, restore into a new data folder, start on it', () => {
  let a: TestServer | null = null;
  let b: RunningServer | null = null;
  afterAll(async () => {
    await a?.stop();
    await b?.stop();
  });

  it('keeps every acknowledged snapshot, analysis, alert and audit entry, and a consistent queue', async () => {
    // The product on its own private MariaDB (DATABASE_URL empty), worker running.
    a = await startTestServer({ DATABASE_URL: '', RUN_WORKER: 'true', JOB_LEASE_S: '3' });
    const dataA = a.ctx.dataDir;
    const poolA = a.ctx.dbHandle.pool;
    const key = await gatewayKey(a, 1);
    // Alerts and their events (the demo pump's 1× rising into the alert zone), audit entries.
    await captureVelocities(a, key, 'MFP-P101-MDE-H', [1.5, 3.5, 3.5, 3.5]);
    const engineerCookie = await a.signIn('engineer');
    expect(await scalar(poolA, 'SELECT COUNT(*) FROM alerts')).toBeGreaterThan(0);

    // A gateway posting without pause; each 201 is an acknowledgement.
    const acked: Array<{ uid: string; at: number }> = [];
    let posting = true;
    let n = 0;
    const t0 = Date.parse('2026-11-01T00:00:00Z');
    const poster = (async () => {
      while (posting) {
        n += 1;
        const uid = `bk-${n}`;
        const res = await a!.call('POST', '/api/ingest/v1/snapshots', {
          body: snapshotBody(TAG, uid, {
            // About 0.2 mm/s RMS at 1× (v = a/2πf): well inside zone A, so no alert changes.
            tones: [{ hz: 24.7, peakG: 0.005 }],
            noiseG: 0.002,
            seed: n,
            takenAt: new Date(t0 + n * 60_000).toISOString(),
          }),
          headers: { authorization: `Bearer ${key}` },
        });
        if (res.status === 201) acked.push({ uid, at: Date.now() });
        else throw new Error(`ingest answered ${res.status}: ${await res.text()}`);
      }
    })();
    while (acked.length < 40) await new Promise((r) => setTimeout(r, 50));

    // What was committed when the backup began.
    const before = Object.fromEntries(
      await Promise.all(CHECKED.map(async (t) => [t, await rowDigests(poolA, t)] as const)),
    ) as Record<(typeof CHECKED)[number], Map<number, string>>;
    const began = Date.now();
    const ackedBefore = acked.filter((x) => x.at < began).map((x) => x.uid);

    const backupsDir = mkdtempSync(join(tmp(), 'backups-'));
    const made = await runCli('apps/server/src/backup-main.ts', ['--to', backupsDir], {
      DATA_DIR: dataA,
    });
    expect(made.out).toMatch(/Backup written to/);
    expect(made.code).toBe(0);
    const ackedDuring = acked.length - ackedBefore.length;
    posting = false;
    await poster;
    // Ingest really ran while the backup was taken.
    expect(ackedDuring).toBeGreaterThan(0);
    const [backupName] = readdirSync(backupsDir);
    const backupDir = join(backupsDir, backupName!);
    const manifest = JSON.parse(readFileSync(join(backupDir, 'manifest.json'), 'utf8'));
    expect(manifest.migrations.level).toBeGreaterThan(0);
    expect(manifest.database.source).toBe('private');
    expect(manifest.rows.snapshots).toBeGreaterThanOrEqual(ackedBefore.length);
    expect(manifest.files.map((f: { path: string }) => f.path)).toEqual(
      expect.arrayContaining(['secrets.json', 'mariadb/password', 'mariadb/root-password']),
    );
    await a.stop();
    a = null;

    // The data folder in use is not overwritten without --force.
    const refused = await runCli('apps/server/src/restore-main.ts', [backupDir], {
      DATA_DIR: dataA,
    });
    expect(refused.code).not.toBe(0);
    expect(refused.out).toMatch(/not empty/);

    const dataB = join(mkdtempSync(join(tmp(), 'restored-')), 'data');
    const restored = await runCli('apps/server/src/restore-main.ts', [backupDir], {
      DATA_DIR: dataB,
    });
    expect(restored.out).toMatch(/Restored the backup/);
    expect(restored.code).toBe(0);
    // The generated secrets came along: the private server's passwords and the session key
    // (the restored server was set up with the carried root password and answered to it).
    for (const f of ['secrets.json', 'mariadb/password', 'mariadb/root-password'])
      expect(readFileSync(join(dataB, f), 'utf8')).toBe(readFileSync(join(dataA, f), 'utf8'));

    b = await start({
      DATABASE_URL: '',
      DATA_DIR: dataB,
      PORT: '0',
      HOST: '127.0.0.1',
      BUILD_WEB: 'false',
      LOG_LEVEL: 'silent',
      RUN_WORKER: 'true',
      JOB_LEASE_S: '3',
    });
    const poolB = b.ctx.dbHandle.pool;
    // A session signed by the first installation is still valid: same secret, same user.
    const me = await fetch(`${b.url}/api/v1/me`, { headers: { cookie: engineerCookie } });
    expect(me.status).toBe(200);
    await drained(poolB);

    // Every snapshot acknowledged before the backup began.
    const [uids] = await poolB.query<RowDataPacket[]>(
      "SELECT uid FROM snapshots WHERE uid LIKE 'bk-%'",
    );
    const present = new Set(uids.map((r) => String(r.uid)));
    expect(ackedBefore.filter((u) => !present.has(u))).toEqual([]);
    expect(await scalar(poolB, 'SELECT COUNT(*) FROM snapshots')).toBe(manifest.rows.snapshots);

    // Every analysis, alert, alert event and audit entry of that moment, unchanged.
    for (const table of CHECKED) {
      const after = await rowDigests(poolB, table);
      const missingOrChanged = [...before[table]].filter(([id, d]) => after.get(id) !== d);
      expect({ table, missingOrChanged }).toEqual({ table, missingOrChanged: [] });
      expect(before[table].size).toBeGreaterThan(0);
    }

    // The queue: each snapshot has one job, each job ended, each analysed once.
    expect(
      await scalar(
        poolB,
        'SELECT COUNT(*) FROM snapshots s LEFT JOIN jobs j ON j.snapshot_id = s.id WHERE j.id IS NULL',
      ),
    ).toBe(0);
    expect(
      await scalar(
        poolB,
        'SELECT COUNT(*) FROM (SELECT snapshot_id FROM jobs GROUP BY snapshot_id HAVING COUNT(*) > 1) x',
      ),
    ).toBe(0);
    expect(
      await scalar(
        poolB,
        "SELECT COUNT(*) FROM jobs j LEFT JOIN analyses a ON a.snapshot_id = j.snapshot_id WHERE j.state = 'done' AND a.id IS NULL",
      ),
    ).toBe(0);
    expect(
      await scalar(
        poolB,
        'SELECT COUNT(*) FROM (SELECT snapshot_id FROM analyses GROUP BY snapshot_id HAVING COUNT(*) > 1) x',
      ),
    ).toBe(0);
    expect(await scalar(poolB, "SELECT COUNT(*) FROM jobs WHERE state = 'failed'")).toBe(0);
    expect(await scalar(poolB, "SELECT COUNT(*) FROM snapshots WHERE uid LIKE 'bk-%'")).toBe(
      await scalar(
        poolB,
        "SELECT COUNT(*) FROM analyses a JOIN snapshots s ON s.id = a.snapshot_id WHERE s.uid LIKE 'bk-%'",
      ),
    );
  }, 300_000);
});
