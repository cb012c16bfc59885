/**
 * Hostile and broken input against the real server: a generated corpus of bad requests.
 * Every one must get a 4xx with `{ error: { code, message } }`, the server must stay up, and
 * nothing may be stored. (OWASP ASVS 5.0: input validation, 1.x/2.x; file handling 5.x.)
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import {
  badBatchesAndKeys,
  good,
  hostileTextFields,
  malformedIngestBodies,
} from '../support/hostile-requests.ts';
import { badSessionsUploadsAndRoutes } from '../support/hostile-sessions-uploads.ts';

let srv: TestServer;
let key: string;
let revokedKey: string;
let admin: string;

async function stored(): Promise<number[]> {
  const out: number[] = [];
  for (const t of ['snapshots', 'jobs', 'analyses', 'gateways', 'users', 'audit_log']) {
    const [rows] = await srv.ctx.dbHandle.pool.query(`SELECT COUNT(*) AS n FROM ${t}`);
    out.push(Number((rows as { n: number }[])[0]!.n));
  }
  return out;
}

/** The whole corpus, in one order: ingest bodies, text fields, batches and keys, the rest. */
const corpus = () => [
  ...malformedIngestBodies(),
  ...hostileTextFields(),
  ...badBatchesAndKeys(),
  ...badSessionsUploadsAndRoutes(srv.ctx.jwtSecret),
];

beforeAll(async () => {
  srv = await startTestServer({
    INGEST_MAX_PER_MIN: '100000',
    SIGN_IN_MAX_PER_IP: '100000',
    SIGN_IN_MAX_PER_ACCOUNT: '100000',
  });
  admin = await srv.signIn('admin');
  key = await srv.gatewayKey();
  const r = await (
    await srv.call('POST', '/api/v1/gateways', {
      cookie: admin,
      body: { siteId: 1, name: 'revoked' },
    })
  ).json();
  revokedKey = r.apiKey;
  await srv.call('POST', `/api/v1/gateways/${r.id}/revoke`, { cookie: admin });
});
afterAll(async () => {
  await srv?.stop();
});

describe('hostile and broken input', () => {
  it('the corpus has at least 200 requests', () => {
    const n = corpus().length;
    expect(n, `corpus size ${n}`).toBeGreaterThanOrEqual(200);
  });

  it('every bad request gets a 4xx with a clear error body, nothing is stored, the server stays up', async () => {
    const before = await stored();
    const failures: string[] = [];
    for (const bad of corpus()) {
      const headers: Record<string, string> = { ...(bad.headers ?? {}) };
      if (bad.auth === 'gateway') headers.authorization ??= `Bearer ${key}`;
      if (bad.auth === 'revoked') headers.authorization = `Bearer ${revokedKey}`;
      const res = await srv.call(bad.method, bad.path, {
        body: bad.body,
        raw: bad.raw,
        headers,
        cookie: bad.auth === 'admin' ? admin : undefined,
      });
      const text = await res.text();
      let body: { error?: { code?: unknown; message?: unknown } } | null = null;
      try {
        body = JSON.parse(text);
      } catch {
        body = null;
      }
      const ok =
        res.status >= 400 &&
        res.status < 500 &&
        typeof body?.error?.code === 'string' &&
        typeof body?.error?.message === 'string' &&
        (body.error.message as string).length > 5;
      if (!ok) failures.push(`${bad.name}: ${res.status} ${text.slice(0, 120)}`);
    }
    expect(failures).toEqual([]);
    expect(await stored()).toEqual(before);
    expect((await srv.call('GET', '/api/health')).status).toBe(200);
    // And a good request still works afterwards.
    expect(
      (
        await srv.call('POST', '/api/ingest/v1/snapshots', {
          body: good(),
          headers: { authorization: `Bearer ${key}` },
        })
      ).status,
    ).toBe(201);
  }, 120_000);
});
