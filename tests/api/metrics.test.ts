import { afterAll, beforeAll, describe, expect, it } from 'vitest';
// An outside reader of the Prometheus text exposition format (npm parse-prometheus-text-format),
// so the answer is checked as a scraper reads it, not as our writer meant it.
import parsePrometheusTextFormat from 'parse-prometheus-text-format';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { snapshotBody } from '../support/signals.ts';

let srv: TestServer;
let key: string;
const TAG = 'MFP-P102-MDE-H';
const TOKEN = 'metrics-token-for-the-test-0123456789';
/** A client that is not on this host, as a trusted proxy on loopback reports it. */
const REMOTE = { 'x-forwarded-for': '203.0.113.7' };

interface Family {
  name: string;
  type: string;
  metrics: { value?: string; labels?: Record<string, string>; count?: string }[];
}

async function scrape(headers: Record<string, string> = {}): Promise<Map<string, Family>> {
  const res = await srv.call('GET', '/metrics', { headers });
  expect(res.status).toBe(200);
  // The text exposition format 0.0.4 (Prometheus "Exposition formats" documentation).
  expect(res.headers.get('content-type')).toMatch(/^text\/plain; version=0\.0\.4/);
  const families = parsePrometheusTextFormat(await res.text()) as Family[];
  return new Map(families.map((f) => [f.name, f]));
}

function value(m: Map<string, Family>, name: string, labels: Record<string, string> = {}) {
  const fam = m.get(name);
  if (!fam) return undefined;
  const hit = fam.metrics.find((x) =>
    Object.entries(labels).every(([k, v]) => x.labels?.[k] === v),
  );
  return hit?.value === undefined
    ? hit?.count === undefined
      ? undefined
      : Number(hit.count)
    : Number(hit.value);
}

async function post(body: unknown, auth = key) {
  return srv.call('POST', '/api/ingest/v1/snapshots', {
    body,
    headers: { authorization: `Bearer ${auth}` },
  });
}

beforeAll(async () => {
  srv = await startTestServer({ TRUST_PROXY: 'loopback', METRICS_TOKEN: TOKEN });
  key = await srv.gatewayKey();
});
afterAll(async () => {
  await srv?.stop();
});

describe('GET /metrics', () => {
  it('counts each ingest outcome, the queue it fills, and the analyses that drain it', async () => {
    await srv.ctx.dbHandle.pool.query(
      "UPDATE jobs SET state = 'failed' WHERE state IN ('queued', 'running')",
    );
    const before = await scrape();
    const base = (outcome: string) =>
      value(before, 'turnstone_ingest_snapshots_total', { outcome }) ?? 0;
    const body = snapshotBody(TAG, 'm-1', { tones: [{ hz: 24.7, peakG: 0.2 }] });
    expect((await post(body)).status).toBe(201);
    expect((await post(body)).status).toBe(200); // the same capture again: a duplicate
    expect((await post(body, 'not-a-key')).status).toBe(401);
    const batch = await post({
      snapshots: [snapshotBody(TAG, 'm-2', {}), snapshotBody('NO-SUCH-TAG', 'm-3', {})],
    });
    expect(batch.status).toBe(200);

    const after = await scrape();
    const delta = (outcome: string) =>
      (value(after, 'turnstone_ingest_snapshots_total', { outcome }) ?? 0) - base(outcome);
    expect({
      created: delta('created'),
      duplicate: delta('duplicate'),
      unknown_point: delta('unknown_point'),
      rejected: delta('rejected'),
    }).toEqual({ created: 2, duplicate: 1, unknown_point: 1, rejected: 1 });
    expect(after.get('turnstone_ingest_snapshots_total')?.type).toBe('COUNTER');
    expect(value(after, 'turnstone_queue_jobs', { state: 'due' })).toBe(2);
    expect(value(after, 'turnstone_queue_oldest_due_age_seconds')).toBeGreaterThan(0);
    expect(value(after, 'turnstone_database_up')).toBe(1);
    // The dashboard pool answered the scrapes: connections open, within its limit.
    const pool = (state: string) =>
      value(after, 'turnstone_database_pool_connections', { pool: 'main', state }) ?? NaN;
    expect(pool('busy') + pool('idle')).toBeGreaterThanOrEqual(1);
    expect(pool('busy') + pool('idle')).toBeLessThanOrEqual(pool('limit'));

    const storedBefore = value(after, 'turnstone_analyses_total', { result: 'stored' }) ?? 0;
    const computedBefore = value(after, 'turnstone_analysis_compute_seconds') ?? 0;
    expect(await createWorker(srv.ctx).drain()).toBe(2);
    const drained = await scrape();
    expect(value(drained, 'turnstone_queue_jobs', { state: 'due' })).toBe(0);
    expect(value(drained, 'turnstone_queue_oldest_due_age_seconds')).toBe(0);
    expect(
      (value(drained, 'turnstone_analyses_total', { result: 'stored' }) ?? 0) - storedBefore,
    ).toBe(2);
    expect((value(drained, 'turnstone_analysis_compute_seconds') ?? 0) - computedBefore).toBe(2);
  });

  it('shows mail waiting in the outbox and how long the oldest has waited', async () => {
    const before = value(await scrape(), 'turnstone_outbox_messages', { state: 'pending' }) ?? 0;
    await srv.ctx.dbHandle.pool.query(
      `INSERT INTO outbox (kind, dedupe_key, to_address, subject, text_body, created_at)
       VALUES ('test', 'metrics-test-1', 'x@example.test', 's', 't', NOW(3) - INTERVAL 90 SECOND)`,
    );
    const m = await scrape();
    expect((value(m, 'turnstone_outbox_messages', { state: 'pending' }) ?? 0) - before).toBe(1);
    expect(value(m, 'turnstone_outbox_oldest_pending_age_seconds')).toBeGreaterThanOrEqual(90);
    await srv.ctx.dbHandle.pool.query("DELETE FROM outbox WHERE dedupe_key = 'metrics-test-1'");
  });

  it('answers a remote client only with the token or an administrator’s session', async () => {
    expect((await srv.call('GET', '/metrics', { headers: REMOTE })).status).toBe(401);
    const wrong = { ...REMOTE, authorization: `Bearer ${TOKEN.replace('0', '1')}` };
    expect((await srv.call('GET', '/metrics', { headers: wrong })).status).toBe(401);
    const engineer = await srv.signIn('engineer');
    expect((await srv.call('GET', '/metrics', { headers: REMOTE, cookie: engineer })).status).toBe(
      403,
    );
    const admin = await srv.signIn('admin');
    const m = await scrape({ ...REMOTE, cookie: admin });
    // Node's process metrics come with it (prom-client's default collectors).
    expect(value(m, 'process_cpu_seconds_total')).toBeGreaterThan(0);
    await scrape({ ...REMOTE, authorization: `Bearer ${TOKEN}` });
    // Requests are counted by area and status class; the 401s above among them.
    expect(
      value(m, 'turnstone_http_requests_total', { area: 'api', status_class: '4xx' }),
    ).toBeGreaterThanOrEqual(2);
  });
});
