/**
 * What an integrating system (a maintenance-management system) sends: query parameters a
 * route does not know are refused rather than ignored, and work-order references are
 * taken as that system writes them.
 */
import { describe, expect, it } from 'vitest';
import { testServerForFile } from '../support/api-suite.ts';

const srv = testServerForFile({ signIn: ['planner', 'engineer'] });

describe('unknown query parameters', () => {
  it.each([
    ['/api/v1/findings?alertId=31', 'alertId'],
    ['/api/v1/alerts?offset=10', 'offset'],
    ['/api/v1/audit?limit=5&page=2', 'page'],
    ['/api/v1/review?weekEnding=2026-11-29&weeksAhead=4&site=1', 'site'],
    // A route that takes no query parameters at all refuses any.
    ['/api/v1/sites?siteId=2', 'siteId'],
  ])('%s answers 400 naming %s', async (path, name) => {
    const res = await srv.call('GET', path, { cookie: srv.cookies.engineer });
    const body = await res.json();
    expect(res.status, JSON.stringify(body)).toBe(400);
    expect(body.error.code).toBe('unknown_query_parameter');
    expect(body.error.details).toEqual([{ path: name, message: 'unknown query parameter' }]);
  });

  it('known parameters still work', async () => {
    for (const path of [
      '/api/v1/findings?state=open',
      '/api/v1/alerts?state=raised',
      '/api/v1/audit?limit=5',
      '/api/v1/review?weekEnding=2026-11-29&weeksAhead=4&siteId=1',
    ]) {
      const res = await srv.call('GET', path, { cookie: srv.cookies.engineer });
      expect(res.status, `${path}: ${await res.clone().text()}`).toBe(200);
    }
  });
});

describe('work-order references', () => {
  it('takes any printable text up to 64 characters, refuses control characters', async () => {
    const create = await srv.call('POST', '/api/v1/findings', {
      cookie: srv.cookies.planner,
      body: { pointId: 1, title: 'Integration finding' },
    });
    expect(create.status, await create.clone().text()).toBe(201);
    const f = await create.json();
    for (const ref of ['WO 2026:0042', 'PM-17/3 (B)', 'Auftrag Nr. 4711 – Lager', '#42; ok?']) {
      const res = await srv.call('PATCH', `/api/v1/findings/${f.id}`, {
        cookie: srv.cookies.planner,
        body: { state: 'planned', workOrderRef: ref },
      });
      expect(res.status, `${ref}: ${await res.clone().text()}`).toBe(200);
      expect((await res.json()).workOrderRef).toBe(ref);
    }
    for (const ref of ['WO\n42', 'WO\u000042', 'x'.repeat(65)]) {
      const res = await srv.call('PATCH', `/api/v1/findings/${f.id}`, {
        cookie: srv.cookies.planner,
        body: { workOrderRef: ref },
      });
      expect(res.status, JSON.stringify(ref)).toBe(400);
    }
  });
});
