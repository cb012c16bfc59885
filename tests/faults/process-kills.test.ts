/**
 * Processes killed with SIGKILL: a worker ten times mid-analysis, and the whole product
 * once mid-ingest. Every accepted snapshot survives and is analysed exactly once; no
 * half-written analysis is visible.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import mysql from 'mysql2/promise';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { prng, snapshotBody } from '../support/signals.ts';
import { exited, newGatewayKeyAt, spawnNode, waitForOutput } from '../support/product-process.ts';

const TAG = 'MFP-P102-MDE-V';
async function rows<T>(url: string, sql: string): Promise<T[]> {
  const conn = await mysql.createConnection(url);
  try {
    const [r] = await conn.query(sql);
    return r as T[];
  } finally {
    await conn.end();
  }
}

describe('a worker killed mid-analysis, ten times', () => {
  let srv: TestServer;
  beforeAll(async () => {
    srv = await startTestServer();
  });
  afterAll(async () => {
    await srv?.stop();
  });

  it('every job ends analysed exactly once', async () => {
    const apiKey = await srv.gatewayKey(1, 'kill gw');
    const total = 80;
    for (let i = 0; i < total; i++) {
      const body = snapshotBody(TAG, `kill-${i}`, {
        n: 32768,
        fs: 25600,
        seed: i,
        takenAt: new Date(Date.parse('2026-10-01T00:00:00Z') + i * 3_600_000).toISOString(),
      });
      expect(
        (
          await srv.call('POST', '/api/ingest/v1/snapshots', {
            body,
            headers: { authorization: `Bearer ${apiKey}` },
          })
        ).status,
      ).toBe(201);
    }
    const env = { DATABASE_URL: srv.databaseUrl, JOB_LEASE_S: '1', LOG_LEVEL: 'info' };
    // Seeded kill delays: every run kills at the same moments after start-up.
    const delay = prng(13);
    let kills = 0;
    while (kills < 10) {
      const child = spawnNode('apps/server/src/worker-main.ts', env);
      await waitForOutput(child, /worker started/);
      await new Promise((r) => setTimeout(r, 300 + delay() * 700));
      child.kill('SIGKILL');
      await exited(child);
      kills++;
    }
    const last = spawnNode('apps/server/src/worker-main.ts', env);
    await waitForOutput(last, /worker started/);
    const until = Date.now() + 120_000;
    for (;;) {
      const [r] = await rows<{ n: number }>(
        srv.databaseUrl,
        "SELECT COUNT(*) AS n FROM jobs WHERE state <> 'done'",
      );
      if (Number(r!.n) === 0 || Date.now() > until) break;
      await new Promise((res) => setTimeout(res, 500));
    }
    last.kill('SIGTERM');
    await exited(last);
    const perSnapshot = await rows<{ uid: string; n: number }>(
      srv.databaseUrl,
      "SELECT s.uid, COUNT(a.id) AS n FROM snapshots s LEFT JOIN analyses a ON a.snapshot_id = s.id WHERE s.uid LIKE 'kill-%' GROUP BY s.uid",
    );
    expect(perSnapshot.length).toBe(total);
    expect(perSnapshot.filter((r) => Number(r.n) !== 1)).toEqual([]);
    const [jobs] = await rows<{ n: number }>(
      srv.databaseUrl,
      "SELECT COUNT(*) AS n FROM jobs WHERE state = 'done'",
    );
    expect(Number(jobs!.n)).toBe(total);
  }, 240_000);
});

describe('the whole product killed and restarted', () => {
  it('keeps every accepted snapshot and shows no half-written analysis', async () => {
    const dataDir = mkdtempSync(join(process.env.TURNSTONE_TEST_TMP ?? tmpdir(), 'kill-product-'));
    const env = {
      DATA_DIR: dataDir,
      PORT: '0',
      BUILD_WEB: 'false',
      DEMO_HISTORY_WEEKS: '0',
      LOG_LEVEL: 'warn',
      JOB_LEASE_S: '2',
      DATABASE_URL: '',
    };
    const startProduct = async () => {
      const child = spawnNode('apps/server/src/main.ts', env);
      const m = await waitForOutput(child, /running at (http:\/\/127\.0\.0\.1:\d+)/, 120_000);
      return { child, url: m[1]! };
    };
    let { child, url } = await startProduct();
    const apiKey = await newGatewayKeyAt(url, 'gw');
    const accepted: string[] = [];
    for (let i = 0; i < 30; i++) {
      const body = snapshotBody(TAG, `pk-${i}`, {
        n: 16384,
        fs: 25600,
        seed: i,
        takenAt: new Date(Date.parse('2026-10-01T00:00:00Z') + i * 3_600_000).toISOString(),
      });
      const res = await fetch(`${url}/api/ingest/v1/snapshots`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', authorization: `Bearer ${apiKey}` },
        body: JSON.stringify(body),
      });
      if (res.status === 201) accepted.push(body.uid);
    }
    expect(accepted.length).toBe(30);
    child.kill('SIGKILL');
    await exited(child);

    ({ child, url } = await startProduct());
    try {
      const dbUrl = (await import('node:fs'))
        .readFileSync(join(dataDir, 'mariadb', 'url'), 'utf8')
        .trim();
      const until = Date.now() + 120_000;
      for (;;) {
        const [r] = await rows<{ n: number }>(
          dbUrl,
          "SELECT COUNT(*) AS n FROM jobs WHERE state <> 'done'",
        );
        if (Number(r!.n) === 0 || Date.now() > until) break;
        await new Promise((res) => setTimeout(res, 500));
      }
      const snaps = await rows<{ uid: string; status: string; analyses: number; bands: number }>(
        dbUrl,
        "SELECT s.uid, s.status, COUNT(DISTINCT a.id) AS analyses, COUNT(b.id) AS bands FROM snapshots s LEFT JOIN analyses a ON a.snapshot_id = s.id LEFT JOIN band_values b ON b.analysis_id = a.id WHERE s.uid LIKE 'pk-%' GROUP BY s.uid, s.status",
      );
      expect(snaps.map((s) => s.uid).sort()).toEqual([...accepted].sort());
      expect(
        snaps.filter(
          (s) => s.status !== 'done' || Number(s.analyses) !== 1 || Number(s.bands) === 0,
        ),
      ).toEqual([]);
    } finally {
      child.kill('SIGTERM');
      await exited(child);
    }
  }, 300_000);
});
