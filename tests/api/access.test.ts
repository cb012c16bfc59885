/**
 * The role × route matrix, generated from the server's route table: every dashboard route
 * is called by every role, so a route added without a rule (or with a wrong one) fails here.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { dashboardRoutes } from '../../apps/server/src/app.ts';
import { ALL_ROLES } from '../../apps/server/src/lib/route-table.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';

let srv: TestServer;
const cookies = new Map<string, string>();
beforeAll(async () => {
  srv = await startTestServer();
  for (const role of ALL_ROLES) cookies.set(role, await srv.signIn(role));
});
afterAll(async () => {
  await srv?.stop();
});

const concretePath = (path: string) => path.replace(/:(\w+)/g, '1');

describe('role × route matrix', () => {
  it('every route is covered', async () => {
    const specs = dashboardRoutes(srv.ctx);
    expect(specs.length).toBeGreaterThan(2);
    for (const spec of specs) {
      const path = `/api/v1${concretePath(spec.path)}`;
      if (spec.access === 'public') continue;
      const anon = await srv.call(spec.method.toUpperCase(), path, {
        body: spec.method === 'get' ? undefined : {},
      });
      expect(anon.status, `${spec.method} ${spec.path} without a session`).toBe(401);
      for (const role of ALL_ROLES) {
        const cookie = cookies.get(role)!;
        const res = await srv.call(spec.method.toUpperCase(), path, {
          cookie,
          body: spec.method === 'get' ? undefined : {},
        });
        const allowed = spec.access.includes(role);
        if (allowed) {
          expect(
            [401, 403],
            `${role} may ${spec.method} ${spec.path} (${spec.summary})`,
          ).not.toContain(res.status);
        } else {
          expect(res.status, `${role} may not ${spec.method} ${spec.path} (${spec.summary})`).toBe(
            403,
          );
        }
        // A route that ended the session (sign-out) gets a fresh one for the next check.
        if ((await srv.call('GET', '/api/v1/me', { cookie })).status === 401)
          cookies.set(role, await srv.signIn(role));
      }
    }
  });
});

describe('per-site access', () => {
  it('the operator of one site sees only that site in the fleet', async () => {
    const res = await srv.call('GET', '/api/v1/fleet', { cookie: cookies.get('operator') });
    const body = await res.json();
    expect(body.items.map((s: { code: string }) => s.code)).toEqual(['MFP']);
    const admin = await (
      await srv.call('GET', '/api/v1/sites', { cookie: cookies.get('admin') })
    ).json();
    expect(admin.items.length).toBe(2);
  });
});
