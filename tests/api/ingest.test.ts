/**
 * Storing captures through the ingest API: created and repeated uids, the stored forms,
 * refused bodies, batches, one transaction per capture, the OpenAPI document and the rate.
 * Gateway keys and what one site may learn of another: ingest-gateways.test.ts.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { inflateRawSync } from 'node:zlib';
import { sql } from 'drizzle-orm';
import { testServerForFile } from '../support/api-suite.ts';
import { startTestServer } from '../support/test-server.ts';
import { snapshotBody } from '../support/signals.ts';

const srv = testServerForFile({ env: { INGEST_MAX_PER_MIN: '100000' } });
let keyMfp: string;
const TAG = 'MFP-P101-MDE-H';

async function count(table: string): Promise<number> {
  const [rows] = await srv.ctx.dbHandle.pool.query(`SELECT COUNT(*) AS n FROM ${table}`);
  return Number((rows as { n: number }[])[0]!.n);
}
beforeAll(async () => {
  keyMfp = await srv.gatewayKey(1, 'MFP gateway A');
});

describe('ingest', () => {
  it('accepts a new snapshot with 201 and stores it with its job in one go', async () => {
    const before = await count('snapshots');
    const res = await srv.ingest(keyMfp, snapshotBody(TAG, 'ing-1'));
    expect(res.status).toBe(201);
    const body = await res.json();
    expect(body).toMatchObject({ uid: 'ing-1', status: 'created' });
    expect(await count('snapshots')).toBe(before + 1);
    const [jobs] = await srv.ctx.dbHandle.pool.query(
      'SELECT COUNT(*) AS n FROM jobs WHERE snapshot_id = ?',
      [body.snapshotId],
    );
    expect(Number((jobs as { n: number }[])[0]!.n)).toBe(1);
  });

  it('keeps idle connections open longer than a gateway waits between posts, and says so', async () => {
    // RFC 9112 §9.3 / the Keep-Alive header's `timeout` hint: the server announces 65 s, so a
    // client reusing the connection never races the server closing it (common practice, no
    // source, for the value: longer than the usual 60 s idle timeout of load balancers).
    const res = await srv.ingest(keyMfp, snapshotBody(TAG, 'ing-keepalive'));
    expect(res.status).toBe(201);
    expect(res.headers.get('keep-alive')).toBe('timeout=65');
  });

  it('stores a gateway-sized capture as sent, and a large one as raw deflate that inflates back, smaller', async () => {
    const small = snapshotBody(TAG, 'ing-z', { takenAt: '2026-11-30T09:00:00.000Z' });
    // 131,072 int16 samples = 256 kB, past STORE_AS_SENT_BYTES (64 kB).
    const large = snapshotBody(TAG, 'ing-zl', {
      takenAt: '2026-11-30T09:05:00.000Z',
      n: 131_072,
      tones: [{ hz: 24.7, peakG: 0.2 }],
      noiseG: 0.01,
    });
    expect((await srv.ingest(keyMfp, small)).status).toBe(201);
    expect((await srv.ingest(keyMfp, large)).status).toBe(201);
    const [rows] = await srv.ctx.dbHandle.pool.query(
      "SELECT uid, samples, samples_codec, sample_count FROM snapshots WHERE uid IN ('ing-z', 'ing-zl') ORDER BY uid",
    );
    const [s, l] = rows as { samples: Buffer; samples_codec: string; sample_count: number }[];
    const postedSmall = Buffer.from(small.samples, 'base64');
    expect(s!.samples_codec).toBe('none');
    expect(s!.samples.equals(postedSmall)).toBe(true);
    expect(s!.sample_count).toBe(postedSmall.length / 2);
    const postedLarge = Buffer.from(large.samples, 'base64');
    expect(l!.samples_codec).toBe('deflate-raw');
    expect(inflateRawSync(l!.samples).equals(postedLarge)).toBe(true);
    expect(l!.samples.length).toBeLessThan(postedLarge.length);
    expect(l!.sample_count).toBe(131_072);
  });

  it('when a snapshot repeats its uid with the same content, answers 200 and stores nothing new', async () => {
    const b = snapshotBody(TAG, 'ing-2', { takenAt: '2026-11-30T10:00:00.000Z' });
    expect((await srv.ingest(keyMfp, b)).status).toBe(201);
    const [s, j] = [await count('snapshots'), await count('jobs')];
    const again = await srv.ingest(keyMfp, b);
    expect(again.status).toBe(200);
    expect((await again.json()).status).toBe('duplicate');
    expect([await count('snapshots'), await count('jobs')]).toEqual([s, j]);
  });

  it('the same samples sent as a number array are the same content as base64', async () => {
    const b = snapshotBody(TAG, 'ing-3', { takenAt: '2026-11-30T11:00:00.000Z' });
    expect((await srv.ingest(keyMfp, b)).status).toBe(201);
    const asArray = {
      ...b,
      samples: Array.from(new Int16Array(Buffer.from(b.samples, 'base64').buffer.slice(0))),
    };
    const res = await srv.ingest(keyMfp, asArray);
    expect(res.status).toBe(200);
  });

  it('when the uid repeats with other content, answers 409', async () => {
    await srv.ingest(keyMfp, snapshotBody(TAG, 'ing-4', { seed: 1 }));
    const res = await srv.ingest(keyMfp, snapshotBody(TAG, 'ing-4', { seed: 2 }));
    expect(res.status).toBe(409);
    expect((await res.json()).error.code).toBe('uid_conflict');
  });

  it.each([
    ['an unknown encoding', { encoding: 'int12' }, 'encoding'],
    ['a takenAt far in the future', { takenAt: '2099-01-01T00:00:00Z' }, 'takenAt'],
    ['a sample count that disagrees', { sampleCount: 4000 }, 'samples'],
    ['base64 that is not', { samples: 'this is not base64!!' }, 'samples'],
    ['NaN as a sample', { samples: [1, 2, 'NaN'] }, 'samples'],
    ['a missing sensor', { sensor: undefined }, 'sensor'],
    [
      'a byte count that is not whole samples',
      { samples: Buffer.alloc(1025).toString('base64') },
      'samples',
    ],
  ])('refuses %s with 400 naming the field, and stores nothing', async (_what, patch, field) => {
    const before = await count('snapshots');
    const res = await srv.ingest(keyMfp, {
      ...snapshotBody(TAG, `bad-${Math.random()}`),
      ...patch,
    });
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.code).toBe('validation_failed');
    expect(body.error.message).toContain(field);
    expect(await count('snapshots')).toBe(before);
  });

  it('accepts and ignores fields it does not know (newer firmware), naming them in the answer', async () => {
    // The forward-compatibility rule of the ingest contract (packages/contracts/src/ingest.ts).
    const body = snapshotBody(TAG, 'ing-fwd-1');
    const res = await srv.ingest(keyMfp, { ...body, firmware: '4.2', batteryV: 3.6 });
    expect(res.status).toBe(201);
    const answer = await res.json();
    expect(answer).toMatchObject({ uid: 'ing-fwd-1', status: 'created' });
    expect(answer.ignoredFields).toEqual(['firmware', 'batteryV']);
    // Nothing of them is stored: the same capture without them is a plain repeat.
    const again = await srv.ingest(keyMfp, body);
    expect(again.status).toBe(200);
    expect((await again.json()).ignoredFields).toBeUndefined();
  });

  it('answers 413 for a body over 16 MiB', async () => {
    const res = await srv.ingest(keyMfp, {
      ...snapshotBody(TAG, 'big'),
      samples: 'A'.repeat(17 * 1024 * 1024),
    });
    expect(res.status).toBe(413);
    expect((await res.json()).error.code).toBe('payload_too_large');
  });

  it('reports a result per item for a batch', async () => {
    const first = snapshotBody(TAG, 'b-1');
    const res = await srv.ingest(keyMfp, {
      snapshots: [first, snapshotBody('NO-SUCH-TAG', 'b-2'), { uid: 'b-3' }, first],
    });
    expect(res.status).toBe(200);
    const { results } = await res.json();
    expect(results.map((r: { httpStatus: number }) => r.httpStatus)).toEqual([201, 404, 400, 200]);
  });

  it('a batch answers repeated uids in order even when the first item is the slowest to store', async () => {
    // Items are stored side by side; a big first item (its samples compress on the thread
    // pool) would otherwise lose the race to a small repeat of its uid.
    const big = snapshotBody(TAG, 'bo-1', { n: 1 << 17, seed: 3 });
    const other = snapshotBody(TAG, 'bo-1', { seed: 4 });
    const fresh = Array.from({ length: 8 }, (_, i) => snapshotBody(TAG, `bo-${i + 2}`));
    const res = await srv.ingest(keyMfp, { snapshots: [big, other, ...fresh, big] });
    expect(res.status).toBe(200);
    const { results } = await res.json();
    expect(results.map((r: { httpStatus: number }) => r.httpStatus)).toEqual([
      201,
      409,
      ...fresh.map(() => 201),
      200,
    ]);
    expect(results.map((r: { uid: string }) => r.uid)).toEqual([
      'bo-1',
      'bo-1',
      ...fresh.map((f) => f.uid),
      'bo-1',
    ]);
    const [rows] = await srv.ctx.dbHandle.pool.query(
      "SELECT COUNT(*) AS n, COUNT(j.id) AS j FROM snapshots s LEFT JOIN jobs j ON j.snapshot_id = s.id WHERE s.uid LIKE 'bo-%'",
    );
    expect(rows).toEqual([{ n: 9, j: 9 }]);
  });

  it('when storing the job fails, the snapshot is not stored either (one transaction)', async () => {
    const before = await count('snapshots');
    await srv.ctx.db.execute(sql`RENAME TABLE jobs TO jobs_away`);
    try {
      const res = await srv.ingest(keyMfp, snapshotBody(TAG, 'tx-1'));
      expect(res.status).toBeGreaterThanOrEqual(500);
    } finally {
      await srv.ctx.db.execute(sql`RENAME TABLE jobs_away TO jobs`);
    }
    expect(await count('snapshots')).toBe(before);
    expect((await srv.ingest(keyMfp, snapshotBody(TAG, 'tx-1'))).status).toBe(201);
  });

  it('a failed or repeated insert leaves its pooled connection with no transaction open', async () => {
    // Ingest sends START TRANSACTION; INSERT; INSERT; COMMIT in one round trip; a failing
    // statement stops the batch mid-transaction. The connection it used is the next one the
    // pool hands out (mysql2's free list is last in, first out): it must be clean.
    const inTransaction = () =>
      new Promise<number>((resolve, reject) =>
        srv.ctx.dbHandle.batchPool.query('SELECT @@in_transaction AS t', (err, rows) =>
          err ? reject(err) : resolve(Number((rows as { t: number }[])[0]!.t)),
        ),
      );
    await srv.ctx.db.execute(sql`RENAME TABLE jobs TO jobs_away`);
    try {
      expect((await srv.ingest(keyMfp, snapshotBody(TAG, 'tx-2'))).status).toBeGreaterThanOrEqual(
        500,
      );
      expect(await inTransaction()).toBe(0);
    } finally {
      await srv.ctx.db.execute(sql`RENAME TABLE jobs_away TO jobs`);
    }
    const b = snapshotBody(TAG, 'tx-3', { takenAt: '2026-11-30T12:00:00.000Z' });
    expect((await srv.ingest(keyMfp, b)).status).toBe(201);
    expect((await srv.ingest(keyMfp, b)).status).toBe(200);
    expect(await inTransaction()).toBe(0);
    const [rows] = await srv.ctx.dbHandle.pool.query(
      "SELECT COUNT(*) AS n FROM snapshots s JOIN jobs j ON j.snapshot_id = s.id WHERE s.uid IN ('tx-2', 'tx-3')",
    );
    expect(Number((rows as { n: number }[])[0]!.n)).toBe(1);
  });

  it('serves an OpenAPI 3.1 document generated from the schemas', async () => {
    const doc = await (await srv.call('GET', '/api/ingest/v1/openapi.json')).json();
    expect(doc.openapi).toBe('3.1.0');
    expect(doc.components.schemas.Snapshot.properties.encoding.enum).toEqual([
      'int16',
      'int24',
      'int32',
      'float32',
    ]);
    expect(Object.keys(doc.paths['/snapshots'].post.responses)).toEqual(
      expect.arrayContaining(['201', '200', '409', '429', '503']),
    );
  });
});

describe('ingest rate', () => {
  it('past the per-gateway rate, answers 429 with Retry-After', async () => {
    const limited = await startTestServer({ INGEST_MAX_PER_MIN: '3' });
    try {
      const a = await limited.signIn('admin');
      const { apiKey } = await (
        await limited.call('POST', '/api/v1/gateways', {
          cookie: a,
          body: { siteId: 1, name: 'slow' },
        })
      ).json();
      const statuses: number[] = [];
      const budgets: (string | null)[] = [];
      let retryAfter: string | null = null;
      for (let i = 0; i < 5; i++) {
        const r = await limited.call('POST', '/api/ingest/v1/snapshots', {
          body: snapshotBody(TAG, `rl-${i}`),
          headers: { authorization: `Bearer ${apiKey}` },
        });
        statuses.push(r.status);
        budgets.push(r.headers.get('ratelimit'));
        expect(r.headers.get('ratelimit-policy')).toBe('3;w=60');
        if (r.status === 429) retryAfter = r.headers.get('retry-after');
      }
      expect(statuses).toEqual([201, 201, 201, 429, 429]);
      expect(Number(retryAfter)).toBeGreaterThan(0);
      // IETF draft-7 RateLimit header: what is left of the gateway's budget in this window.
      expect(budgets.map((b) => /remaining=(\d+)/.exec(b ?? '')?.[1])).toEqual([
        '2',
        '1',
        '0',
        '0',
        '0',
      ]);
      expect(Number(/reset=(\d+)/.exec(budgets[0] ?? '')?.[1])).toBeGreaterThan(50);
    } finally {
      await limited.stop();
    }
  });
});
