/**
 * What a maintenance-management system does, with clients generated from the two served
 * OpenAPI documents (openapi-typescript types, openapi-fetch calls): both documents pass a
 * standard validator (@seriousme/openapi-schema-validator); a gateway client posts a
 * snapshot and reads the 201's body; an administrator issues a service token and signs out,
 * and the integration then pulls alerts and findings page by page with that token and
 * pushes a finding with a work order, retried safely with an Idempotency-Key.
 */
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Validator } from '@seriousme/openapi-schema-validator';
import openapiTS, { astToString } from 'openapi-typescript';
import createClient from 'openapi-fetch';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import {
  startTestServer,
  DEMO_PASSWORD,
  demoEmail,
  type TestServer,
} from '../support/test-server.ts';
import { deref } from '../support/openapi-refs.ts';
import { snapshotBody } from '../support/signals.ts';
import { peakGFor } from '../support/alert-captures.ts';
import type { paths as DashboardPaths } from '../support/dashboard-api.ts';
import type { paths as IngestPaths } from '../support/ingest-api.ts';

let srv: TestServer;
// eslint-disable-next-line @typescript-eslint/no-explicit-any
let dashboardDoc: any;
// eslint-disable-next-line @typescript-eslint/no-explicit-any
let ingestDoc: any;

beforeAll(async () => {
  srv = await startTestServer();
  dashboardDoc = await (await srv.call('GET', '/api/v1/openapi.json')).json();
  ingestDoc = await (await srv.call('GET', '/api/ingest/v1/openapi.json')).json();
});
afterAll(async () => {
  await srv?.stop();
});

describe('the two OpenAPI documents', () => {
  it.each([
    ['dashboard', () => dashboardDoc],
    ['ingest', () => ingestDoc],
  ])('%s: valid OpenAPI 3.1 under a standard validator', async (_name, doc) => {
    const result = await new Validator().validate(doc());
    expect(result.errors ?? [], JSON.stringify(result.errors)).toEqual([]);
    expect(result.valid).toBe(true);
    expect(doc().openapi).toBe('3.1.0');
  });

  it('the committed dashboard types are what openapi-typescript makes of the served document', async () => {
    const generated = astToString(await openapiTS(dashboardDoc));
    const committed = readFileSync(new URL('../support/dashboard-api.ts', import.meta.url), 'utf8');
    expect(committed).toContain(generated.trim());
  });

  it('the dashboard document says how a service authenticates and retries', () => {
    expect(dashboardDoc.components.securitySchemes.apiToken).toMatchObject({
      type: 'http',
      scheme: 'bearer',
    });
    const create = dashboardDoc.paths['/findings'].post;
    expect(
      create.parameters.map((p: unknown) => (deref(dashboardDoc, p) as { name: string }).name),
    ).toContain('Idempotency-Key');
    expect(Object.keys(create.responses)).toEqual(expect.arrayContaining(['201', '409', '422']));
  });
});

describe('an integration with generated clients', () => {
  it('ingest: a snapshot posted, the 201 body read; then, with a service token issued by a person who has signed out since, alerts and findings pulled and a finding pushed', async () => {
    const api = createClient<DashboardPaths>({ baseUrl: dashboardDoc.servers[0].url });

    // A person: the administrator signs in, creates a gateway key and a service token.
    const signIn = await api.POST('/auth/sign-in', {
      body: { email: demoEmail('admin'), password: DEMO_PASSWORD },
    });
    expect(signIn.response.status).toBe(200);
    const cookie = (signIn.response.headers.get('set-cookie') ?? '').split(';')[0]!;
    const gw = await api.POST('/gateways', {
      body: { siteId: 1, name: 'integration gw' },
      headers: { cookie },
    });
    expect(gw.response.status).toBe(201);
    const issued = await api.POST('/api-tokens', {
      body: { name: 'CMMS', role: 'planner', siteIds: [1] },
      headers: { cookie },
    });
    expect(issued.response.status).toBe(201);
    const token = issued.data!.token;

    // The gateway: two captures over P-101's 2.8 mm/s alert level (persistence 2, the
    // condition package's template defaults, common practice, no source) raise an alert.
    const ingest = createClient<IngestPaths>({ baseUrl: ingestDoc.servers[0].url });
    const t0 = Date.now() - 3 * 3600_000;
    for (let i = 1; i <= 2; i++) {
      const body = snapshotBody('MFP-P101-MDE-H', `integration-${i}`, {
        tones: [{ hz: 24.7, peakG: peakGFor(3.5) }],
        noiseG: 0.001,
        seed: i,
        takenAt: new Date(t0 + i * 3600_000).toISOString(),
      }) as IngestPaths['/snapshots']['post']['requestBody']['content']['application/json'];
      const posted = await ingest.POST('/snapshots', {
        body,
        headers: { Authorization: `Bearer ${gw.data!.apiKey}` },
      });
      expect(posted.response.status).toBe(201);
      const sid = posted.data && 'snapshotId' in posted.data ? posted.data.snapshotId : 0;
      expect(sid).toBeGreaterThan(0);
    }
    await createWorker(srv.ctx, { owner: 'integration' }).drain();

    // The person signs out: every session of that account ends…
    const out = await api.POST('/auth/sign-out', { headers: { cookie } });
    expect(out.response.status).toBe(204);
    expect((await api.GET('/me', { headers: { cookie } })).response.status).toBe(401);

    // …and the integration goes on with its token.
    const cmms = createClient<DashboardPaths>({
      baseUrl: dashboardDoc.servers[0].url,
      headers: { Authorization: `Bearer ${token}` },
    });
    const pulled: number[] = [];
    let cursor: string | undefined;
    do {
      const page = await cmms.GET('/alerts', {
        params: { query: { siteId: 1, limit: 1, ...(cursor ? { cursor } : {}) } },
      });
      expect(page.response.status).toBe(200);
      pulled.push(...page.data!.items.map((a) => a.id));
      for (const a of page.data!.items) expect(a.updatedAt).toEqual(expect.any(String));
      cursor = page.data!.nextCursor ?? undefined;
    } while (cursor);
    const inDb = await srv.q<{ id: number }>('SELECT id FROM alerts ORDER BY id');
    expect(inDb.length).toBeGreaterThan(0);
    expect([...pulled].sort((a, b) => a - b)).toEqual(inDb.map((r) => r.id));

    const body = {
      pointId: 1,
      alertId: pulled[0]!,
      title: 'Check coupling alignment',
      workOrderRef: 'WO 2026:0042',
    };
    const since = new Date(Date.now() - 1000).toISOString();
    const pushed = await cmms.POST('/findings', {
      body,
      params: { header: { 'Idempotency-Key': 'cmms-wo-2026-0042' } },
    });
    expect(pushed.response.status).toBe(201);
    const retried = await cmms.POST('/findings', {
      body,
      params: { header: { 'Idempotency-Key': 'cmms-wo-2026-0042' } },
    });
    expect(retried.response.status).toBe(201);
    expect(retried.data!.id).toBe(pushed.data!.id);
    expect(retried.response.headers.get('idempotent-replayed')).toBe('true');

    const findings = await cmms.GET('/findings', { params: { query: { since } } });
    expect(findings.data!.items.map((f) => f.workOrderRef)).toEqual(['WO 2026:0042']);
    expect(findings.data!.items[0]!.createdBy.name).toBe('CMMS');
  });
});
