import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/test-server.ts';

let srv: TestServer;
let admin: string;
let engineer: string;
let adminId: number;

beforeAll(async () => {
  srv = await startTestServer();
  admin = await srv.signIn('admin');
  engineer = await srv.signIn('engineer');
  adminId = (await (await srv.call('GET', '/api/v1/me', { cookie: admin })).json()).id;
  // Known history: three gateway changes by the admin, one area by the admin.
  const gw = await (
    await srv.call('POST', '/api/v1/gateways', {
      cookie: admin,
      body: { siteId: 1, name: 'audit gw' },
    })
  ).json();
  await srv.call('POST', `/api/v1/gateways/${gw.id}/rotate`, { cookie: admin });
  await srv.call('POST', `/api/v1/gateways/${gw.id}/revoke`, { cookie: admin });
  await srv.call('POST', '/api/v1/areas', {
    cookie: admin,
    body: { siteId: 2, name: 'Audit area' },
  });
});
afterAll(async () => {
  await srv?.stop();
});

describe('audit log', () => {
  it('lists entries newest first with the actor name', async () => {
    const res = await srv.call('GET', '/api/v1/audit?limit=10', { cookie: engineer });
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.items[0]).toMatchObject({
      action: 'area.create',
      actorName: 'Ada Admin',
      actorUserId: adminId,
    });
    const ids = body.items.map((i: { id: number }) => i.id);
    expect([...ids].sort((a, b) => b - a)).toEqual(ids);
  });

  it('filters by entity and entity id, by action prefix and by actor', async () => {
    const gw = await (
      await srv.call('GET', '/api/v1/audit?entity=gateway', { cookie: admin })
    ).json();
    expect(gw.items.map((i: { action: string }) => i.action)).toEqual([
      'gateway.revoke',
      'gateway.rotate',
      'gateway.create',
    ]);
    const one = await (
      await srv.call(
        `GET`,
        `/api/v1/audit?entity=gateway&entityId=${gw.items[0].entityId}&action=gateway.rotate`,
        {
          cookie: admin,
        },
      )
    ).json();
    expect(one.items).toHaveLength(1);
    const prefix = await (
      await srv.call('GET', '/api/v1/audit?action=area.', { cookie: admin })
    ).json();
    expect(prefix.items.every((i: { action: string }) => i.action.startsWith('area.'))).toBe(true);
    expect(prefix.items.length).toBeGreaterThan(0);
    const byOther = await (
      await srv.call('GET', `/api/v1/audit?actor=${adminId + 1000}`, { cookie: admin })
    ).json();
    expect(byOther.items).toEqual([]);
  });

  it('filters by time: a window in the future is empty, one around now holds everything', async () => {
    const future = new Date(Date.now() + 3600_000).toISOString();
    const none = await (
      await srv.call('GET', `/api/v1/audit?from=${encodeURIComponent(future)}`, { cookie: admin })
    ).json();
    expect(none.items).toEqual([]);
    const from = new Date(Date.now() - 3600_000).toISOString();
    const all = await (
      await srv.call(
        'GET',
        `/api/v1/audit?from=${encodeURIComponent(from)}&to=${encodeURIComponent(future)}`,
        {
          cookie: admin,
        },
      )
    ).json();
    expect(all.items.length).toBeGreaterThanOrEqual(4);
  });

  it('pages with the cursor without repeating or skipping an entry', async () => {
    const all = await (await srv.call('GET', '/api/v1/audit?limit=200', { cookie: admin })).json();
    const seen: number[] = [];
    let cursor: string | null = null;
    do {
      const url: string = `/api/v1/audit?limit=2${cursor ? `&cursor=${cursor}` : ''}`;
      const page: { items: { id: number }[]; nextCursor: string | null } = await (
        await srv.call('GET', url, { cookie: admin })
      ).json();
      seen.push(...page.items.map((i: { id: number }) => i.id));
      cursor = page.nextCursor;
    } while (cursor);
    expect(seen).toEqual(all.items.map((i: { id: number }) => i.id));
  });

  it('a bad filter answers 400 and a planner or operator gets 403', async () => {
    expect((await srv.call('GET', '/api/v1/audit?from=yesterday', { cookie: admin })).status).toBe(
      400,
    );
    expect((await srv.call('GET', '/api/v1/audit?limit=5000', { cookie: admin })).status).toBe(400);
    for (const role of ['planner', 'operator'])
      expect(
        (await srv.call('GET', '/api/v1/audit', { cookie: await srv.signIn(role) })).status,
      ).toBe(403);
  });
});
