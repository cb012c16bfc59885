/**
 * The dashboard API's contract as an integrator meets it: answers to real requests — reads
 * an integrator pulls, the writes it pushes, and the error answers — are checked against
 * `GET /api/v1/openapi.json` (status documented, JSON body valid under ajv's JSON Schema
 * 2020-12). The document itself is checked in api-document.test.ts.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Ajv2020 } from 'ajv/dist/2020.js';
import addFormats from 'ajv-formats';
import { openApiPath } from '../../apps/server/src/features/api-docs/api-openapi.ts';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { pointerOf } from '../support/openapi-refs.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { snapshotBody, toneCounts } from '../support/signals.ts';
import { pcmWavBytes } from '../support/wav-bytes.ts';

let srv: TestServer;
// eslint-disable-next-line @typescript-eslint/no-explicit-any
let doc: any;
let ajv: InstanceType<typeof Ajv2020>;
const cookies = new Map<string, string>();
/** Every operation and status answered here, to show which the test met. */
const met = new Set<string>();

/**
 * Peak acceleration (g) of a 24.7 Hz tone of `mmS` mm/s RMS: a = v·√2·2πf / 9806.65
 * (calculus of a sinusoid, textbook); 24.7 Hz is 1× of the demo pump P-101.
 */
const peakGFor = (mmS: number) => (mmS * Math.SQRT2 * 2 * Math.PI * 24.7) / 9806.65;

beforeAll(async () => {
  srv = await startTestServer();
  for (const role of ['admin', 'engineer', 'planner', 'operator'])
    cookies.set(role, await srv.signIn(role));
  const gw = await srv.call('POST', '/api/v1/gateways', {
    cookie: cookies.get('admin'),
    body: { siteId: 1, name: 'contract gw' },
  });
  const key = ((await gw.json()) as { apiKey: string }).apiKey;
  // P-101 template levels: alert 2.8, danger 4.5 mm/s, persistence 2 (condition package's
  // template defaults, common practice, no source): two captures at 3.5 raise an alert.
  const t0 = Date.now() - 10 * 24 * 3600_000;
  for (const [i, v] of [1.5, 1.5, 3.5, 3.5].entries()) {
    const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
      body: snapshotBody('MFP-P101-MDE-H', `api-contract-${i}`, {
        tones: [{ hz: 24.7, peakG: peakGFor(v) }],
        noiseG: 0.001,
        seed: i + 1,
        takenAt: new Date(t0 + i * 3600_000).toISOString(),
      }),
      headers: { authorization: `Bearer ${key}` },
    });
    expect(res.status).toBe(201);
  }
  await createWorker(srv.ctx, { owner: 'api-contract-test' }).drain();
  const res = await srv.call('GET', '/api/v1/openapi.json');
  expect(res.status).toBe(200);
  doc = await res.json();
  ajv = new Ajv2020({ strict: false, allErrors: true });
  addFormats.default(ajv);
  ajv.addSchema(doc, 'api');
});
afterAll(async () => {
  await srv?.stop();
});

const pointer = (...parts: string[]) =>
  parts.map((p) => encodeURIComponent(p.replace(/~/g, '~0').replace(/\//g, '~1'))).join('/');

/**
 * Calls a route and checks the answer against the document: the status is documented for
 * the operation and a JSON body is valid under its schema. Returns the body.
 */
async function conforms(
  method: string,
  template: string,
  path: string,
  init: { role?: string; body?: unknown; raw?: FormData; headers?: Record<string, string> } = {},
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
): Promise<{ status: number; body: any }> {
  const res = await srv.call(method, `/api/v1${path}`, {
    cookie: init.role ? cookies.get(init.role) : undefined,
    body: init.body,
    raw: init.raw,
    headers: init.headers,
  });
  const op = doc.paths[openApiPath(template)]?.[method.toLowerCase()];
  expect(op, `${method} ${template} is not in the document`).toBeDefined();
  const status = String(res.status);
  const key = op.responses[status] ? status : 'default';
  expect(
    op.responses[status] ?? (res.status >= 400 ? op.responses.default : undefined),
    `${method} ${template}: status ${status} is not documented`,
  ).toBeDefined();
  met.add(`${op.operationId} ${status}`);
  if (res.status === 204) return { status: res.status, body: null };
  expect(res.headers.get('content-type')).toMatch(/^application\/json\b/);
  const body = await res.json();
  const answerAt = pointer('paths', openApiPath(template), method.toLowerCase(), 'responses', key);
  const schemaPath = `${pointerOf(op.responses[key], answerAt)}/${pointer('content', 'application/json', 'schema')}`;
  const validate = ajv.getSchema(`api#/${schemaPath}`);
  expect(validate, `${method} ${template} ${status}: no schema`).toBeDefined();
  expect(
    validate!(body),
    `${method} ${template} ${status}: ${ajv.errorsText(validate!.errors)}`,
  ).toBe(true);
  return { status: res.status, body };
}

describe('real answers conform to the document', () => {
  it('reads: fleet, sites, alerts, alert detail, point, trend, analyses, audit, me', async () => {
    await conforms('GET', '/fleet', '/fleet', { role: 'operator' });
    await conforms('GET', '/sites', '/sites', { role: 'admin' });
    const alerts = await conforms('GET', '/alerts', '/alerts?state=raised', { role: 'planner' });
    expect(alerts.body.items.length).toBeGreaterThan(0);
    const alert = alerts.body.items[0];
    await conforms('GET', '/alerts/:id', `/alerts/${alert.id}`, { role: 'planner' });
    await conforms('GET', '/points/:id', `/points/${alert.pointId}`, { role: 'engineer' });
    const trend = await conforms(
      'GET',
      '/points/:id/trend',
      `/points/${alert.pointId}/trend?band=overall-velocity`,
      { role: 'engineer' },
    );
    expect(trend.body.items.length).toBe(4);
    await conforms('GET', '/points/:id/analyses', `/points/${alert.pointId}/analyses?limit=2`, {
      role: 'engineer',
    });
    await conforms('GET', '/machines/:id', `/machines/1`, { role: 'engineer' });
    await conforms('GET', '/audit', '/audit?limit=5', { role: 'admin' });
    await conforms('GET', '/me', '/me', { role: 'operator' });
    await conforms('GET', '/auth/session', '/auth/session');
  });

  it('writes: acknowledge an alert, create and update a finding', async () => {
    const { body } = await conforms('GET', '/alerts', '/alerts?state=raised', {
      role: 'operator',
    });
    const alert = body.items[0];
    const acked = await conforms(
      'POST',
      '/alerts/:id/acknowledge',
      `/alerts/${alert.id}/acknowledge`,
      {
        role: 'operator',
        body: { note: 'Checked on site, guard loose; bolted.' },
      },
    );
    expect(acked.body.state).toBe('acknowledged');
    const created = await conforms('POST', '/findings', '/findings', {
      role: 'planner',
      body: { pointId: alert.pointId, alertId: alert.id, title: 'Check guard of P-101' },
    });
    expect(created.status).toBe(201);
    const updated = await conforms('PATCH', '/findings/:id', `/findings/${created.body.id}`, {
      role: 'planner',
      body: { state: 'planned', workOrderRef: 'WO 2026:0042' },
    });
    expect(updated.body).toMatchObject({ state: 'planned', workOrderRef: 'WO 2026:0042' });
    const list = await conforms('GET', '/findings', `/findings?pointId=${alert.pointId}`, {
      role: 'operator',
    });
    expect(list.body.items.map((f: { id: number }) => f.id)).toContain(created.body.id);
  });

  it('setup, limits, review, users, gateways, mail and account answers', async () => {
    await conforms('GET', '/setup', '/setup', { role: 'admin' });
    await conforms('GET', '/points/:id/limits', '/points/1/limits', { role: 'operator' });
    await conforms('GET', '/points/:id/limits/iso-defaults', '/points/1/limits/iso-defaults', {
      role: 'engineer',
    });
    await conforms('GET', '/points/:id/limits/history', '/points/1/limits/history', {
      role: 'engineer',
    });
    await conforms('GET', '/limit-templates/:machineType', '/limit-templates/pump', {
      role: 'engineer',
    });
    await conforms('GET', '/review', '/review?weeksAhead=8', { role: 'planner' });
    await conforms('GET', '/users', '/users', { role: 'admin' });
    await conforms('GET', '/gateways', '/gateways', { role: 'admin' });
    const gw = await conforms('POST', '/gateways', '/gateways', {
      role: 'admin',
      body: { siteId: 1, name: 'contract second' },
    });
    expect(gw.status).toBe(201);
    await conforms('POST', '/gateways/:id/rotate', `/gateways/${gw.body.id}/rotate`, {
      role: 'admin',
    });
    await conforms('POST', '/gateways/:id/revoke', `/gateways/${gw.body.id}/revoke`, {
      role: 'admin',
    });
    const site = await conforms('POST', '/sites', '/sites', {
      role: 'admin',
      body: { name: 'Contract works', code: 'CW', timeZone: 'Europe/Lisbon' },
    });
    expect(site.status).toBe(201);
    await conforms('PATCH', '/sites/:id', `/sites/${site.body.id}`, {
      role: 'admin',
      body: { name: 'Contract works 2', code: 'CW', timeZone: 'Europe/Lisbon' },
    });
    const area = await conforms('POST', '/areas', '/areas', {
      role: 'admin',
      body: { siteId: site.body.id, name: 'Boiler house' },
    });
    expect(area.status).toBe(201);
    await conforms('PATCH', '/areas/:id', `/areas/${area.body.id}`, {
      role: 'admin',
      body: { name: 'Boiler hall' },
    });
    const user = await conforms('POST', '/users/invite', '/users/invite', {
      role: 'admin',
      body: { email: 'contract@turnstone.local', name: 'Contract', role: 'planner', siteIds: [1] },
    });
    expect(user.status).toBe(201);
    await conforms('PATCH', '/users/:id', `/users/${user.body.id}`, {
      role: 'admin',
      body: { siteIds: [1, site.body.id] },
    });
    await conforms('POST', '/users/:id/disable', `/users/${user.body.id}/disable`, {
      role: 'admin',
    });
    await conforms('POST', '/users/:id/enable', `/users/${user.body.id}/enable`, { role: 'admin' });
    // A recording upload (multipart): 201 when stored, 200 for the same file again.
    const wav = pcmWavBytes(
      toneCounts({ n: 8192, fs: 10240, tones: [{ hz: 100, peakG: 0.5 }] }),
      10240,
      16,
    );
    const form = () => {
      const f = new FormData();
      for (const [k, v] of Object.entries({
        sensitivityMvPerG: '100',
        fullScaleV: '5',
        bits: '16',
      }))
        f.append(k, v);
      f.append('file', new Blob([wav as Uint8Array<ArrayBuffer>]), 'contract.wav');
      return f;
    };
    const up = await conforms('POST', '/points/:id/uploads', '/points/2/uploads', {
      role: 'engineer',
      raw: form(),
    });
    expect(up).toMatchObject({ status: 201, body: { status: 'queued' } });
    const again = await conforms('POST', '/points/:id/uploads', '/points/2/uploads', {
      role: 'engineer',
      raw: form(),
    });
    expect(again).toMatchObject({ status: 200, body: { status: 'already-uploaded' } });
    const mail = await conforms('GET', '/mailbox', '/mailbox', { role: 'admin' });
    if (mail.body.items.length > 0)
      await conforms('GET', '/mailbox/:id', `/mailbox/${mail.body.items[0].id}`, { role: 'admin' });
    await conforms('GET', '/mail/undelivered', '/mail/undelivered', { role: 'admin' });
    const subs = await conforms('GET', '/account/subscriptions', '/account/subscriptions', {
      role: 'engineer',
    });
    await conforms('PUT', '/account/subscriptions', '/account/subscriptions', {
      role: 'engineer',
      body: {
        items: [
          {
            siteId: subs.body.options.sites[0].id,
            machineId: null,
            minLevel: 'danger',
            cadence: 'hourly',
          },
        ],
        weeklyDigest: false,
      },
    });
    const forgot = await conforms('POST', '/auth/forgot-password', '/auth/forgot-password', {
      body: { email: 'nobody@turnstone.local' },
    });
    expect(forgot.status).toBe(202);
  });

  it('error answers: 400, 401, 403 (role and cross-origin), 404', async () => {
    const bad = await conforms('GET', '/findings', '/findings?alertId=31', { role: 'planner' });
    expect(bad).toMatchObject({
      status: 400,
      body: { error: { code: 'unknown_query_parameter' } },
    });
    const invalid = await conforms('POST', '/findings', '/findings', {
      role: 'planner',
      body: { pointId: 'one' },
    });
    expect(invalid.body.error.code).toBe('validation_failed');
    expect((await conforms('GET', '/alerts', '/alerts')).status).toBe(401);
    const role = await conforms('GET', '/audit', '/audit', { role: 'operator' });
    expect(role).toMatchObject({ status: 403, body: { error: { code: 'forbidden' } } });
    const cross = await conforms('POST', '/findings', '/findings', {
      role: 'planner',
      body: { pointId: 1, title: 'x' },
      headers: { origin: 'https://elsewhere.example' },
    });
    expect(cross).toMatchObject({ status: 403, body: { error: { code: 'cross_origin' } } });
    const missing = await conforms('GET', '/alerts/:id', '/alerts/999999', { role: 'planner' });
    expect(missing.status).toBe(404);
    expect([...met].length).toBeGreaterThan(15);
  });
});
