/**
 * The dashboard API's OpenAPI document as an integrator meets it: `GET /api/v1/openapi.json`
 * is served without a session and passes a standard validator
 * (@seriousme/openapi-schema-validator); every RouteSpec of the route table is in it with its
 * roles (the table is walked, so a new route cannot be left out); openapi-typescript makes
 * a typed client of it. Real answers are checked against it in api-contract.test.ts.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Validator } from '@seriousme/openapi-schema-validator';
import openapiTS, { astToString } from 'openapi-typescript';
import { dashboardRoutes } from '../../apps/server/src/app.ts';
import { openApiPath, operationId } from '../../apps/server/src/features/api-docs/api-openapi.ts';
import { deref } from '../support/openapi-refs.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';

let srv: TestServer;
// eslint-disable-next-line @typescript-eslint/no-explicit-any
let doc: any;

beforeAll(async () => {
  srv = await startTestServer();
  const res = await srv.call('GET', '/api/v1/openapi.json');
  expect(res.status).toBe(200);
  doc = await res.json();
});
afterAll(async () => {
  await srv?.stop();
});

describe('the /api/v1 OpenAPI document', () => {
  it('is valid OpenAPI 3.1, served without a session, with an absolute server URL', async () => {
    const result = await new Validator().validate(doc);
    expect(result.errors ?? [], JSON.stringify(result.errors)).toEqual([]);
    expect(result.valid).toBe(true);
    expect(doc.openapi).toBe('3.1.0');
    expect(doc.servers[0].url).toBe(`${srv.url}/api/v1`);
    expect(doc.components.securitySchemes.sessionCookie).toMatchObject({
      type: 'apiKey',
      in: 'cookie',
      name: 'turnstone_session',
    });
    expect(doc.info.description).toMatch(/cross_origin/);
  });

  it('has every route of the route table, with its roles, tag and error answers', () => {
    const specs = dashboardRoutes(srv.ctx);
    const ids = new Set<string>();
    let described = 0;
    for (const spec of specs) {
      const op = doc.paths[openApiPath(spec.path)]?.[spec.method];
      expect(op, `${spec.method} ${spec.path} (${spec.summary}) is not documented`).toBeDefined();
      expect(op.operationId).toBe(operationId(spec.method, spec.path));
      ids.add(op.operationId);
      expect(op['x-roles']).toEqual(spec.access === 'public' ? 'public' : [...spec.access]);
      expect(op.tags).toHaveLength(1);
      if (spec.access === 'public') expect(op.security).toEqual([]);
      else {
        expect(op.security).toBeUndefined(); // the document's default: the session cookie
        expect(deref(doc, op.responses['401']).content['application/json'].schema).toEqual({
          $ref: '#/components/schemas/Error',
        });
        expect(op.responses['403']).toBeDefined();
      }
      if (spec.method !== 'get')
        expect(deref(doc, op.responses['403']).description).toMatch(/cross_origin/);
      if (spec.schemas?.response || spec.schemas?.produces || spec.schemas?.status === 204)
        described++;
    }
    // operationIds are unique, and the document has no operation the table lacks.
    expect(ids.size).toBe(specs.length);
    const documented = Object.values(doc.paths).flatMap((p) => Object.keys(p as object));
    expect(documented.length).toBe(specs.length);
    // The routes an integrator pulls and pushes have their answers described.
    for (const id of [
      'getFleet',
      'getSites',
      'getAlerts',
      'getAlertsById',
      'postAlertsByIdAcknowledge',
      'postAlertsAcknowledge',
      'getPointsById',
      'getPointsByIdTrend',
      'getPointsByIdAnalyses',
      'getFindings',
      'postFindings',
      'patchFindingsById',
      'getAudit',
      'getMe',
    ]) {
      const op = Object.values(doc.paths)
        .flatMap((p) => Object.values(p as object))
        .find((o) => o.operationId === id);
      expect(op, id).toBeDefined();
      const ok = op.responses['200'] ?? op.responses['201'];
      expect(ok.content['application/json'].schema, id).toBeDefined();
    }
    console.info(`api-contract: ${described} of ${specs.length} routes describe their answer`);
  });

  it('generates a typed client with openapi-typescript, as an integrator would', async () => {
    const types = astToString(await openapiTS(doc));
    // One operation per route, named by its operationId, with the paged list's cursor.
    expect(types).toMatch(/getAlerts: \{/);
    expect(types).toMatch(/patchFindingsById: \{/);
    expect(types).toMatch(/nextCursor: string \| null;/);
    expect(types).toMatch(/"\/alerts\/\{id\}\/acknowledge": \{/);
  });

  it('describes query, path and body parameters from the zod schemas', () => {
    const list = doc.paths['/alerts'].get;
    expect(list.parameters.map((p: { name: string }) => p.name)).toEqual([
      'state',
      'level',
      'siteId',
      'pointId',
      'limit',
      'since',
      'cursor',
    ]);
    expect(list.parameters.find((p: { name: string }) => p.name === 'limit').schema).toMatchObject({
      type: 'integer',
      minimum: 1,
      maximum: 1000,
      default: 500,
    });
    const ack = doc.paths['/alerts/{id}/acknowledge'].post;
    expect(ack.parameters[0]).toMatchObject({ name: 'id', in: 'path', required: true });
    expect(ack.parameters[0].schema.type).toBe('integer');
    expect(deref(doc, ack.requestBody.content['application/json'].schema).required).toEqual([
      'note',
    ]);
    expect(doc.paths['/findings'].post.responses['201']).toBeDefined();
    expect(doc.paths['/auth/sign-out'].post.responses['204']).toBeDefined();
    const upload = doc.paths['/points/{id}/uploads'].post;
    const form = upload.requestBody.content['multipart/form-data'].schema;
    expect(form.required).toEqual(['file']);
    expect(form.properties.file).toEqual({ type: 'string', format: 'binary' });
    expect(Object.keys(upload.responses)).toEqual(expect.arrayContaining(['200', '201']));
  });
});
