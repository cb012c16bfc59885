/**
 * The private MariaDB killed (SIGKILL) under the product started as `npm start` starts it,
 * during a steady ingest: it comes back by itself, the API recovers, and every snapshot
 * answered 201 is stored exactly once. Prints the recovery timeline.
 */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import mysql from 'mysql2/promise';
import { postUntilAnswered, type PostOutcome } from '../support/retrying-poster.ts';
import { snapshotBody } from '../support/signals.ts';
import { exited, newGatewayKeyAt, spawnNode, waitForOutput } from '../support/product-process.ts';

const TAG = 'MFP-P101-MDE-H';

function isAlive(pid: number) {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

describe('the private MariaDB killed during ingest', () => {
  it('is started again by itself; every 201-acknowledged snapshot is stored once', async () => {
    const dataDir = mkdtempSync(join(process.env.TURNSTONE_TEST_TMP ?? tmpdir(), 'db-crash-'));
    const child = spawnNode('apps/server/src/main.ts', {
      DATA_DIR: dataDir,
      PORT: '0',
      BUILD_WEB: 'false',
      DEMO_HISTORY_WEEKS: '0',
      RUN_WORKER: 'false',
      LOG_LEVEL: 'info',
      DATABASE_URL: '',
    });
    // Every line the product prints, with the time it came.
    const lines: { at: number; text: string }[] = [];
    let partial = '';
    const collect = (d: Buffer) => {
      const parts = (partial + d.toString()).split('\n');
      partial = parts.pop()!;
      for (const text of parts) lines.push({ at: Date.now(), text });
    };
    child.stdout!.on('data', collect);
    child.stderr!.on('data', collect);
    const until = async (what: () => boolean, ms: number, label: string) => {
      const end = Date.now() + ms;
      while (!what()) {
        if (Date.now() > end) throw new Error(`no ${label} within ${ms} ms`);
        await new Promise((r) => setTimeout(r, 20));
      }
    };
    try {
      const url = (
        await waitForOutput(child, /running at (http:\/\/127\.0\.0\.1:\d+)/, 120_000)
      )[1]!;
      const apiKey = await newGatewayKeyAt(url, 'crash gw');

      const total = 80;
      let next = 0;
      const outcomes: PostOutcome[] = [];
      const sender = async () => {
        while (next < total) {
          const i = next++;
          const body = snapshotBody(TAG, `crash-${i}`, {
            takenAt: new Date(Date.parse('2026-11-02T00:00:00Z') + i * 60_000).toISOString(),
            seed: i,
          });
          outcomes.push(await postUntilAnswered(url, apiKey, body, 120_000));
          await new Promise((r) => setTimeout(r, 20));
        }
      };
      const senders = Promise.all([sender(), sender(), sender(), sender()]);

      await until(() => outcomes.length >= 15, 60_000, 'first answers');
      const pidFile = join(dataDir, 'mariadb', 'mariadbd.pid');
      const killedPid = Number(readFileSync(pidFile, 'utf8').trim());
      const killedAt = Date.now();
      process.kill(killedPid, 'SIGKILL');
      await until(() => !isAlive(killedPid), 10_000, 'death of mariadbd');

      await senders;
      const stoppedLines = lines.filter((l) => /MariaDB stopped unexpectedly/.test(l.text));
      const backLines = lines.filter((l) => /MariaDB is running again/.test(l.text));
      expect(stoppedLines).toHaveLength(1);
      expect(stoppedLines[0]!.text).toContain('SIGKILL');
      expect(backLines).toHaveLength(1);
      // One line for the requests answered 503 meanwhile, not one per request.
      expect(lines.filter((l) => l.text.includes('database unavailable'))).toHaveLength(1);
      const newPid = Number(readFileSync(pidFile, 'utf8').trim());
      expect(newPid).not.toBe(killedPid);
      expect(isAlive(newPid)).toBe(true);

      expect(outcomes).toHaveLength(total);
      expect(outcomes.filter((o) => o.status !== 201 && o.status !== 200)).toEqual([]);
      expect(outcomes.some((o) => o.attempts > 1)).toBe(true);
      expect((await fetch(`${url}/api/health`)).status).toBe(200);

      const dbUrl = readFileSync(join(dataDir, 'mariadb', 'url'), 'utf8').trim();
      const conn = await mysql.createConnection(dbUrl);
      const [rows] = await conn.query(
        "SELECT uid, COUNT(*) AS n FROM snapshots WHERE uid LIKE 'crash-%' GROUP BY uid",
      );
      await conn.end();
      const stored = new Map(
        (rows as { uid: string; n: number }[]).map((r) => [r.uid, Number(r.n)]),
      );
      const acknowledged = outcomes.filter((o) => o.status === 201).map((o) => o.uid);
      expect(acknowledged.filter((uid) => stored.get(uid) !== 1)).toEqual([]);
      expect(stored.size).toBe(total);
      expect([...stored.values()].every((n) => n === 1)).toBe(true);

      const back = backLines[0]!.at;
      const first201 = Math.min(
        ...outcomes.filter((o) => o.status === 201 && o.answeredAt > back).map((o) => o.answeredAt),
      );
      const s = (t: number) => `+${((t - killedAt) / 1000).toFixed(2)} s`;
      process.stdout.write(
        `MariaDB crash-recovery timeline: SIGKILL at 0 s; noticed ${s(stoppedLines[0]!.at)}; ` +
          `running again ${s(back)}; first 201 ${s(first201)}; ` +
          `${outcomes.filter((o) => o.attempts > 1).length} of ${total} snapshots needed a retry, ` +
          `${acknowledged.length} answered 201, all stored once\n`,
      );
    } finally {
      child.kill('SIGTERM');
      await exited(child);
    }
  }, 300_000);
});
