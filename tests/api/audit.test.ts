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
    // Then the demo seed's two gateway.create entries (one gateway per site).
    expect(gw.items.map((i: { action: string }) => i.action)).toEqual([
      'gateway.revoke',
      'gateway.rotate',
      'gateway.create',
      'gateway.create',
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

  it('since keeps entries written at or after it; with the cursor a pull walks them all', async () => {
    const all = await (await srv.call('GET', '/api/v1/audit?limit=200', { cookie: admin })).json();
    const pivot = all.items[Math.floor(all.items.length / 2)] as { id: number; at: string };
    const want = all.items
      .filter((i: { at: string }) => Date.parse(i.at) >= Date.parse(pivot.at))
      .map((i: { id: number }) => i.id);
    const seen: number[] = [];
    let cursor: string | null = null;
    do {
      const url: string = `/api/v1/audit?limit=1&since=${encodeURIComponent(pivot.at)}${cursor ? `&cursor=${cursor}` : ''}`;
      const page: { items: { id: number }[]; nextCursor: string | null } = await (
        await srv.call('GET', url, { cookie: admin })
      ).json();
      seen.push(...page.items.map((i) => i.id));
      cursor = page.nextCursor;
    } while (cursor);
    expect(seen).toEqual(want);
    expect(seen).toContain(pivot.id);
    const bad = await srv.call('GET', '/api/v1/audit?since=yesterday', { cookie: admin });
    expect(bad.status).toBe(400);
  });

  it('a bad filter answers 400 and a planner or operator gets 403', async () => {
    expect((await srv.call('GET', '/api/v1/audit?from=yesterday', { cookie: admin })).status).toBe(
      400,
    );
    expect((await srv.call('GET', '/api/v1/audit?limit=5000', { cookie: admin })).status).toBe(400);
    // A cursor of 400 digits is no id (it used to reach the query as Infinity: 500).
    const huge = await srv.call('GET', `/api/v1/audit?cursor=${'9'.repeat(400)}`, {
      cookie: admin,
    });
    expect(huge.status).toBe(400);
    expect((await huge.json()).error.code).toBe('validation_failed');
    for (const role of ['planner', 'operator'])
      expect(
        (await srv.call('GET', '/api/v1/audit', { cookie: await srv.signIn(role) })).status,
      ).toBe(403);
  });

  it('an engineer sees the entries of their own sites only, also of a deleted machine', async () => {
    // A machine created and deleted on site 2 (area 'Audit area' was created there above).
    const areas = await (await srv.call('GET', '/api/v1/setup', { cookie: admin })).json();
    const area = areas.areas.find((a: { name: string }) => a.name === 'Audit area');
    const created = await srv.call('POST', '/api/v1/machines', {
      cookie: admin,
      body: {
        areaId: area.id,
        name: 'Audit fan',
        type: 'fan',
        nominalRpm: 980,
        isoGroup: 2,
        foundation: 'rigid',
        criticality: 'medium',
        powerKw: null,
        bladeCount: 8,
        vaneCount: null,
        bearings: [],
        gears: [],
      },
    });
    expect(created.status, await created.clone().text()).toBe(201);
    const machineId = (await created.json()).id;
    expect(
      (await srv.call('DELETE', `/api/v1/machines/${machineId}`, { cookie: admin })).status,
    ).toBe(204);

    // Both entries keep the machine's site, the delete's too (written after the row went).
    const [rows] = await srv.ctx.dbHandle.pool.query(
      "SELECT action, site_id FROM audit_log WHERE entity = 'machine' AND entity_id = ? ORDER BY id",
      [String(machineId)],
    );
    expect(rows).toEqual([
      { action: 'machine.create', site_id: 2 },
      { action: 'machine.delete', site_id: 2 },
    ]);

    // The engineer is moved to site 1 alone.
    const users = await (await srv.call('GET', '/api/v1/users', { cookie: admin })).json();
    const eng = users.items.find((u: { role: string }) => u.role === 'engineer');
    const moved = await srv.call('PATCH', `/api/v1/users/${eng.id}`, {
      cookie: admin,
      body: { siteIds: [1] },
    });
    expect(moved.status).toBe(200);
    const own = await srv.signIn('engineer');
    const list = async (cookie: string) =>
      (
        (await (await srv.call('GET', '/api/v1/audit?limit=200', { cookie })).json()).items as {
          action: string;
          entity: string;
        }[]
      ).map((i) => i.action);
    const seen = await list(own);
    expect(seen).toEqual(expect.arrayContaining(['gateway.create', 'gateway.revoke']));
    for (const hidden of ['area.create', 'machine.create', 'machine.delete', 'user.update'])
      expect(seen).not.toContain(hidden);
    // The admin sees everything, the deleted machine's entries included.
    expect(await list(admin)).toEqual(
      expect.arrayContaining(['area.create', 'machine.create', 'machine.delete', 'user.update']),
    );
  });
});
