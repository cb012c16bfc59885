/**
 * The ingest contract as an integrator meets it: the served OpenAPI 3.1 document passes a
 * standard validator (@seriousme/openapi-schema-validator), every answer to real requests
 * — each documented status and error code we can provoke against a healthy database — is
 * checked against it (status documented, JSON body valid with ajv's JSON Schema 2020-12,
 * required headers present and valid), and a client generated from it (openapi-typescript
 * types + openapi-fetch) round-trips a snapshot and reads its snapshotId. The 503 is met
 * for real in tests/faults/frozen-database.test.ts.
 */
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { readFileSync } from 'node:fs';
import { brotliCompressSync, deflateSync, gzipSync } from 'node:zlib';
import { Validator } from '@seriousme/openapi-schema-validator';
import { Ajv2020 } from 'ajv/dist/2020.js';
import addFormats from 'ajv-formats';
import openapiTS, { astToString } from 'openapi-typescript';
import createClient from 'openapi-fetch';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { snapshotBody } from '../support/signals.ts';
import type { paths } from '../support/ingest-api.ts';
import { INGEST_ERROR_CODES } from '../../apps/server/src/features/ingest/ingest-openapi.ts';

const TAG = 'MFP-P101-MDE-H';
const PATH = '/api/ingest/v1/snapshots';
let srv: TestServer;
let key: string;
let burnKey: string;
let revokedKey: string;
// eslint-disable-next-line @typescript-eslint/no-explicit-any
let doc: any;
let ajv: InstanceType<typeof Ajv2020>;
/** Every (status, code) answered, to check the document's list against what was met. */
const met = new Set<string>();

beforeAll(async () => {
  srv = await startTestServer({ INGEST_MAX_PER_MIN: '30', LOG_LEVEL: 'warn' });
  const admin = await srv.signIn('admin');
  const mk = async (name: string) => {
    const res = await srv.call('POST', '/api/v1/gateways', {
      cookie: admin,
      body: { siteId: 1, name },
    });
    return (await res.json()) as { id: number; apiKey: string };
  };
  key = (await mk('contract gw')).apiKey;
  burnKey = (await mk('contract burner')).apiKey;
  const revoked = await mk('contract revoked');
  revokedKey = revoked.apiKey;
  await srv.call('POST', `/api/v1/gateways/${revoked.id}/revoke`, { cookie: admin });
  doc = await (await srv.call('GET', '/api/ingest/v1/openapi.json')).json();
  ajv = new Ajv2020({ strict: false, allErrors: true });
  addFormats.default(ajv);
  ajv.addSchema(doc, 'ingest');
});
afterAll(async () => {
  await srv?.stop();
});

const resolveRef = (o: { $ref?: string }) =>
  o.$ref
    ? o.$ref
        .slice(2)
        .split('/')
        .reduce((n: Record<string, unknown>, k) => n[k.replace(/~1/g, '/')] as never, doc)
    : o;

/** Checks one real answer against the document; returns its parsed body. */
async function conforms(res: Response): Promise<Record<string, unknown>> {
  const status = String(res.status);
  const spec = doc.paths['/snapshots'].post.responses[status];
  expect(spec, `status ${status} is not documented`).toBeDefined();
  expect(res.headers.get('content-type')).toMatch(/^application\/json\b/);
  const body = (await res.json()) as Record<string, unknown>;
  const validate = ajv.getSchema(
    `ingest#/paths/~1snapshots/post/responses/${status}/content/application~1json/schema`,
  )!;
  expect(validate(body), `${status} body: ${ajv.errorsText(validate.errors)}`).toBe(true);
  for (const [name, ref] of Object.entries(spec.headers ?? {})) {
    const h = resolveRef(ref as { $ref?: string }) as {
      required?: boolean;
      schema: Record<string, unknown>;
    };
    const value = res.headers.get(name);
    if (value === null) {
      expect(h.required, `${status}: header ${name} missing`).not.toBe(true);
      continue;
    }
    const typed = h.schema.type === 'integer' ? Number(value) : value;
    expect(ajv.validate(h.schema, typed), `${status}: header ${name}: ${value}`).toBe(true);
  }
  const code = (body.error as { code?: string } | undefined)?.code;
  met.add(code ? `${status} ${code}` : status);
  return body;
}

const post = (
  body: string | Uint8Array,
  headers: Record<string, string> = {},
  auth: string | null = key,
) =>
  fetch(srv.url + PATH, {
    method: 'POST',
    headers: {
      'content-type': 'application/json',
      ...(auth ? { authorization: `Bearer ${auth}` } : {}),
      ...headers,
    },
    body,
  });
const json = (uid: string, extra: Record<string, unknown> = {}) =>
  JSON.stringify({ ...snapshotBody(TAG, uid), ...extra });

describe('the ingest OpenAPI document', () => {
  it('rejected posts reach the log at warn, once per sender and reason (first: nothing rejected before)', async () => {
    const lines: string[] = [];
    const spy = vi.spyOn(process.stderr, 'write').mockImplementation((chunk) => {
      lines.push(String(chunk));
      return true;
    });
    try {
      for (let i = 0; i < 3; i++)
        await post(json(`c-log-${i}`), {}, 'tsg_zzzzzzzz_' + 'y'.repeat(40));
    } finally {
      spy.mockRestore();
    }
    const warned = lines
      .map((l) => JSON.parse(l) as Record<string, unknown>)
      .filter((l) => l.msg === 'gateway post rejected');
    expect(warned).toHaveLength(1);
    expect(warned[0]).toMatchObject({ level: 'warn', status: 401, code: 'invalid_api_key' });
  });

  it('is valid OpenAPI 3.1, names its operation and an absolute server URL', async () => {
    const result = await new Validator().validate(doc);
    expect(result.errors ?? [], JSON.stringify(result.errors)).toEqual([]);
    expect(result.valid).toBe(true);
    expect(doc.openapi).toBe('3.1.0');
    expect(doc.paths['/snapshots'].post.operationId).toBe('submitSnapshots');
    expect(doc.servers[0].url).toBe(`${srv.url}/api/ingest/v1`);
    expect(doc.info.description).toMatch(/Forward compatibility/);
  });

  it('describes every answer to real requests: status, body and headers', async () => {
    // 201 and the single-snapshot 200 carry snapshotId.
    const one = json('c-1');
    const created = await conforms(await post(one));
    expect(created).toMatchObject({ uid: 'c-1', status: 'created' });
    expect(typeof created.snapshotId).toBe('number');
    const repeat = await conforms(await post(one));
    expect(repeat).toEqual({ uid: 'c-1', status: 'duplicate', snapshotId: created.snapshotId });
    // Unknown fields: accepted, ignored, named.
    expect(await conforms(await post(json('c-2', { firmware: '9.1' })))).toMatchObject({
      status: 'created',
      ignoredFields: ['firmware'],
    });
    // A batch: one result per item, each with its own status.
    const batch = await conforms(
      await post(
        JSON.stringify({
          snapshots: [
            snapshotBody(TAG, 'c-3'),
            JSON.parse(one),
            { ...snapshotBody(TAG, 'c-4'), encoding: 'int12' },
            snapshotBody('NO-SUCH-TAG', 'c-5'),
          ],
        }),
      ),
    );
    expect((batch.results as { status: string }[]).map((r) => r.status)).toEqual([
      'created',
      'duplicate',
      'invalid',
      'unknown_point',
    ]);
    // Compressed bodies.
    const res = await Promise.all([
      post(gzipSync(json('c-gz')), { 'content-encoding': 'gzip' }),
      post(deflateSync(json('c-df')), { 'content-encoding': 'deflate' }),
      post(brotliCompressSync(json('c-br')), { 'content-encoding': 'br' }),
    ]);
    for (const r of res) expect((await conforms(r)).status).toBe('created');

    // The errors, each with its documented code.
    await conforms(await post(json('c-6', { encoding: 'int12' })));
    await conforms(await post('{"uid":'));
    await conforms(await post(json('c-7'), {}, null));
    await conforms(await post(json('c-8'), {}, 'tsg_abcdefgh_' + 'x'.repeat(40)));
    await conforms(await post(json('c-9'), {}, revokedKey));
    await conforms(await post(json('c-10').replace(TAG, 'NO-SUCH-TAG')));
    await conforms(await post(json('c-1').replace(/"sampleRateHz":\d+/, '"sampleRateHz":5120')));
    await conforms(await post(json('c-11'), { 'content-type': 'text/plain' }));
    await conforms(await post(json('c-12'), { 'content-encoding': 'compress' }));
    await conforms(await post('{"pad":"' + 'x'.repeat(17 * 1024 * 1024) + '"}'));
    expect([...met].sort()).toEqual(
      [
        '200',
        '201',
        '400 invalid_json',
        '400 validation_failed',
        '401 invalid_api_key',
        '401 revoked_api_key',
        '401 unauthenticated',
        '404 unknown_point',
        '409 uid_conflict',
        '413 payload_too_large',
        '415 unsupported_encoding',
        '415 unsupported_media_type',
      ].sort(),
    );
  });

  it('a 401 says how to authenticate (WWW-Authenticate, RFC 6750)', async () => {
    const none = await post(json('c-20'), {}, null);
    expect(none.headers.get('www-authenticate')).toBe('Bearer realm="turnstone-ingest"');
    const bad = await post(json('c-21'), {}, revokedKey);
    expect(bad.headers.get('www-authenticate')).toMatch(
      /^Bearer realm="turnstone-ingest", error="invalid_token"/,
    );
  });

  it('a 429 gives the real time to the reset as Retry-After, as the RateLimit header does', async () => {
    let res: Response | null = null;
    for (let i = 0; i < 31; i++) res = await post(json(`burn-${i}`), {}, burnKey);
    expect(res!.status).toBe(429);
    const retryAfter = Number(res!.headers.get('retry-after'));
    const reset = Number(/reset=(\d+)/.exec(res!.headers.get('ratelimit') ?? '')![1]);
    // The window is 60 s from the gateway's first request, made a moment ago.
    expect(retryAfter).toBe(reset);
    expect(retryAfter).toBeGreaterThan(30);
    expect(retryAfter).toBeLessThanOrEqual(60);
    await conforms(res!);
    expect(met.has('429 rate_limited')).toBe(true);
  });

  it('lists every error code met, and the document lists no code the endpoint lacks', () => {
    const documented = Object.entries(INGEST_ERROR_CODES).flatMap(([s, codes]) =>
      codes.map((c) => `${s} ${c}`),
    );
    for (const m of met) if (m.includes(' ')) expect(documented).toContain(m);
  });
});

describe('a client generated from the document', () => {
  it('the committed types are what openapi-typescript makes of the served document', async () => {
    const generated = astToString(await openapiTS(doc));
    const committed = readFileSync(new URL('../support/ingest-api.ts', import.meta.url), 'utf8');
    expect(committed).toContain(generated.trim());
  });

  it('openapi-fetch posts a snapshot and reads its snapshotId, then the repeat', async () => {
    const client = createClient<paths>({ baseUrl: doc.servers[0].url });
    const body = snapshotBody(
      TAG,
      'client-1',
    ) as paths['/snapshots']['post']['requestBody']['content']['application/json'];
    const first = await client.POST('/snapshots', {
      body,
      headers: { Authorization: `Bearer ${key}` },
    });
    expect(first.response.status).toBe(201);
    // data is the 201's or the 200's body (one snapshot's result, or a batch's results).
    const snapshotId = first.data && 'snapshotId' in first.data ? first.data.snapshotId : undefined;
    expect(snapshotId).toBeGreaterThan(0);
    const again = await client.POST('/snapshots', {
      body,
      headers: { Authorization: `Bearer ${key}` },
    });
    expect(again.response.status).toBe(200);
    expect(again.data && 'snapshotId' in again.data ? again.data.snapshotId : null).toBe(
      snapshotId,
    );
    const unknown = await client.POST('/snapshots', {
      body: { ...body, uid: 'client-2', pointTag: 'NO-SUCH-TAG' },
      headers: { Authorization: `Bearer ${key}` },
    });
    expect(unknown.response.status).toBe(404);
    expect(unknown.error?.error.code).toBe('unknown_point');
  });
});
