import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { snapshotBody } from '../support/signals.ts';
import { machineBody, pointBody, POINTS_OF_SITE } from '../support/setup-bodies.ts';

let srv: TestServer;
let admin: string;
let engineer: string;
let planner: string;
let operator: string;

beforeAll(async () => {
  srv = await startTestServer();
  admin = await srv.signIn('admin');
  engineer = await srv.signIn('engineer');
  planner = await srv.signIn('planner');
  operator = await srv.signIn('operator');
});
afterAll(async () => {
  await srv?.stop();
});

describe('sites and areas', () => {
  it('an admin creates and renames a site, and both changes are in the audit log', async () => {
    const res = await srv.call('POST', '/api/v1/sites', {
      cookie: admin,
      body: { name: 'Wharf Lane Works', code: 'WLW', timeZone: 'Europe/London' },
    });
    expect(res.status).toBe(201);
    const site = await res.json();
    const upd = await srv.call('PATCH', `/api/v1/sites/${site.id}`, {
      cookie: admin,
      body: { name: 'Wharf Lane Water Works', code: 'WLW', timeZone: 'Europe/Dublin' },
    });
    expect(upd.status).toBe(200);
    const rows = await srv.q(
      'SELECT action, actor_user_id FROM audit_log WHERE entity = ? AND entity_id = ? ORDER BY id',
      ['site', String(site.id)],
    );
    expect(rows.map((r) => r.action)).toEqual(['site.create', 'site.update']);
    const [s] = await srv.q('SELECT name, time_zone FROM sites WHERE id = ?', [site.id]);
    expect(s).toEqual({ name: 'Wharf Lane Water Works', time_zone: 'Europe/Dublin' });
  });

  it('an unknown time zone answers 400 naming the timeZone field, and stores nothing', async () => {
    const res = await srv.call('POST', '/api/v1/sites', {
      cookie: admin,
      body: { name: 'Nowhere', code: 'NOW', timeZone: 'Mars/Olympus_Mons' },
    });
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.code).toBe('validation_failed');
    expect(body.error.details).toEqual([
      expect.objectContaining({ path: 'timeZone', message: expect.stringMatching(/IANA/) }),
    ]);
    expect(await srv.q('SELECT id FROM sites WHERE code = ?', ['NOW'])).toEqual([]);
  });

  it('a duplicate site code answers 409 on the code field', async () => {
    const res = await srv.call('POST', '/api/v1/sites', {
      cookie: admin,
      body: { name: 'Second pumping station', code: 'MFP', timeZone: 'UTC' },
    });
    expect(res.status).toBe(409);
    expect((await res.json()).error.details[0].path).toBe('code');
  });

  it('an engineer may not create or change sites or areas (403)', async () => {
    const site = { name: 'E', code: 'ENG', timeZone: 'UTC' };
    expect((await srv.call('POST', '/api/v1/sites', { cookie: engineer, body: site })).status).toBe(
      403,
    );
    expect(
      (await srv.call('PATCH', '/api/v1/sites/1', { cookie: engineer, body: site })).status,
    ).toBe(403);
    expect(
      (
        await srv.call('POST', '/api/v1/areas', {
          cookie: engineer,
          body: { siteId: 1, name: 'X' },
        })
      ).status,
    ).toBe(403);
  });

  it('an admin creates an area; the same name twice in one site answers 409', async () => {
    const first = await srv.call('POST', '/api/v1/areas', {
      cookie: admin,
      body: { siteId: 1, name: 'Sludge handling' },
    });
    expect(first.status).toBe(201);
    const again = await srv.call('POST', '/api/v1/areas', {
      cookie: admin,
      body: { siteId: 1, name: 'Sludge handling' },
    });
    expect(again.status).toBe(409);
  });
});

describe('machines and points', () => {
  let areaId: number;
  let machineId: number;
  let bearingId: number;

  beforeAll(async () => {
    const [a] = await srv.q('SELECT id FROM areas WHERE site_id = 1 ORDER BY id LIMIT 1');
    areaId = Number(a!.id);
  });

  it('an engineer creates a machine with a bearing; the setup tree returns it', async () => {
    const res = await srv.call('POST', '/api/v1/machines', {
      cookie: engineer,
      body: machineBody(areaId, 'Wash water pump P-150'),
    });
    expect(res.status).toBe(201);
    machineId = (await res.json()).id;
    const tree = await (await srv.call('GET', '/api/v1/setup', { cookie: engineer })).json();
    const m = tree.machines.find((x: { id: number }) => x.id === machineId);
    expect(m).toMatchObject({ nominalRpm: 2960, isoGroup: 2, vaneCount: 6, criticality: 'high' });
    expect(m.bearings).toHaveLength(1);
    bearingId = m.bearings[0].id;
    const [audit] = await srv.q('SELECT action FROM audit_log WHERE entity = ? AND entity_id = ?', [
      'machine',
      String(machineId),
    ]);
    expect(audit!.action).toBe('machine.create');
  });

  it('an engineer adds a point on that bearing; a second point with its tag answers 409', async () => {
    const res = await srv.call('POST', '/api/v1/points', {
      cookie: engineer,
      body: pointBody(machineId, 'MFP-P150-PDE-H', bearingId),
    });
    expect(res.status).toBe(201);
    const dup = await srv.call('POST', '/api/v1/points', {
      cookie: engineer,
      body: pointBody(machineId, 'MFP-P150-PDE-H'),
    });
    expect(dup.status).toBe(409);
    const body = await dup.json();
    expect(body.error.message).toBe(
      'Tag MFP-P150-PDE-H is already used by another point of this site.',
    );
    expect(body.error.details).toEqual([expect.objectContaining({ path: 'tag' })]);
    expect(await srv.q('SELECT id FROM points WHERE tag = ?', ['MFP-P150-PDE-H'])).toHaveLength(1);
  });

  it('updating the machine replaces its component lists and keeps the point on a kept bearing', async () => {
    const body = machineBody(areaId, 'Wash water pump P-150');
    const res = await srv.call('PATCH', `/api/v1/machines/${machineId}`, {
      cookie: engineer,
      body: {
        ...body,
        nominalRpm: 1480,
        bearings: [
          { ...body.bearings[0], id: bearingId, designation: '6309-C3' },
          { ...body.bearings[0], name: 'Pump NDE', designation: '6308' },
        ],
        gears: [{ name: 'Belt-free test gear', teeth: 20, mateTeeth: 60, speedRatio: 1 }],
      },
    });
    expect(res.status).toBe(200);
    const bearings = await srv.q(
      'SELECT id, designation FROM bearings WHERE machine_id = ? ORDER BY id',
      [machineId],
    );
    expect(bearings.map((b) => b.designation)).toEqual(['6309-C3', '6308']);
    expect(Number(bearings[0]!.id)).toBe(bearingId);
    const [p] = await srv.q('SELECT bearing_id FROM points WHERE tag = ?', ['MFP-P150-PDE-H']);
    expect(Number(p!.bearing_id)).toBe(bearingId);
    // Sending an empty list removes them all.
    await srv.call('PATCH', `/api/v1/machines/${machineId}`, {
      cookie: engineer,
      body: { ...body, bearings: [], gears: [] },
    });
    expect(await srv.q('SELECT id FROM bearings WHERE machine_id = ?', [machineId])).toEqual([]);
    expect(await srv.q('SELECT id FROM gears WHERE machine_id = ?', [machineId])).toEqual([]);
  });

  it('a bearing of another machine is refused with 400 on the bearingId field', async () => {
    const [other] = await srv.q('SELECT id FROM bearings WHERE machine_id <> ? LIMIT 1', [
      machineId,
    ]);
    const res = await srv.call('POST', '/api/v1/points', {
      cookie: engineer,
      body: pointBody(machineId, 'MFP-P150-PDE-V', Number(other!.id)),
    });
    expect(res.status).toBe(400);
    expect((await res.json()).error.details[0].path).toBe('bearingId');
  });

  it('invalid machine data answers 400 with the fields named', async () => {
    const res = await srv.call('POST', '/api/v1/machines', {
      cookie: admin,
      body: { ...machineBody(areaId, ''), nominalRpm: -5, isoGroup: 3 },
    });
    expect(res.status).toBe(400);
    const paths = (await res.json()).error.details.map((d: { path: string }) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['name', 'nominalRpm', 'isoGroup']));
  });

  it('the supply frequency is 50 Hz, 60 Hz or none; anything else answers 400 on lineHz and changes nothing', async () => {
    const body = machineBody(areaId, 'Backwash pump P-151');
    const res = await srv.call('POST', '/api/v1/machines', {
      cookie: engineer,
      body: { ...body, lineHz: 60 },
    });
    expect(res.status).toBe(201);
    const id = (await res.json()).id;
    const lineHzOf = async () => {
      const tree = await (await srv.call('GET', '/api/v1/setup', { cookie: engineer })).json();
      return tree.machines.find((x: { id: number }) => x.id === id).lineHz;
    };
    expect(await lineHzOf()).toBe(60);
    for (const wrong of [55, '50', 0]) {
      const bad = await srv.call('PATCH', `/api/v1/machines/${id}`, {
        cookie: engineer,
        body: { ...body, lineHz: wrong },
      });
      expect(bad.status).toBe(400);
      const err = (await bad.json()).error;
      expect(err.details).toEqual([
        {
          path: 'lineHz',
          message: 'Line frequency is 50 Hz, 60 Hz, or none (no mains-fed motor, or not known).',
        },
      ]);
      expect(await lineHzOf()).toBe(60);
    }
    // An edit that leaves the field out (an older client) keeps it; null clears it.
    const kept = await srv.call('PATCH', `/api/v1/machines/${id}`, {
      cookie: engineer,
      body: { ...body, powerKw: 90 },
    });
    expect(kept.status).toBe(200);
    expect(await lineHzOf()).toBe(60);
    await srv.call('PATCH', `/api/v1/machines/${id}`, {
      cookie: engineer,
      body: { ...body, lineHz: null },
    });
    expect(await lineHzOf()).toBeNull();
    // A machine created without it has none.
    expect(
      (await (await srv.call('GET', '/api/v1/setup', { cookie: engineer })).json()).machines.find(
        (x: { id: number }) => x.id === machineId,
      ).lineHz,
    ).toBeNull();
  });

  it('a planner or operator may not create or change machines and points (403)', async () => {
    for (const cookie of [planner, operator]) {
      expect(
        (await srv.call('POST', '/api/v1/machines', { cookie, body: machineBody(areaId, 'X') }))
          .status,
      ).toBe(403);
      expect(
        (await srv.call('PATCH', `/api/v1/points/1`, { cookie, body: pointBody(1, 'X') })).status,
      ).toBe(403);
      expect((await srv.call('DELETE', `/api/v1/machines/${machineId}`, { cookie })).status).toBe(
        403,
      );
      expect((await srv.call('GET', '/api/v1/setup', { cookie })).status).toBe(403);
    }
  });

  it('an engineer may not add a machine to a site they are not assigned to (403)', async () => {
    const site = await (
      await srv.call('POST', '/api/v1/sites', {
        cookie: admin,
        body: { name: 'Outstation', code: 'OUT', timeZone: 'UTC' },
      })
    ).json();
    const area = await (
      await srv.call('POST', '/api/v1/areas', {
        cookie: admin,
        body: { siteId: site.id, name: 'Yard' },
      })
    ).json();
    const res = await srv.call('POST', '/api/v1/machines', {
      cookie: engineer,
      body: machineBody(area.id, 'Yard pump'),
    });
    expect(res.status).toBe(403);
    expect(
      (
        await srv.call('POST', '/api/v1/machines', {
          cookie: admin,
          body: machineBody(area.id, 'Yard pump'),
        })
      ).status,
    ).toBe(201);
  });

  it('deleting a point or machine with data answers 409 suggesting a rename; without data it goes', async () => {
    const gw = await (
      await srv.call('POST', '/api/v1/gateways', { cookie: admin, body: { siteId: 1, name: 'gw' } })
    ).json();
    const ingest = await srv.call('POST', '/api/ingest/v1/snapshots', {
      body: snapshotBody('MFP-P150-PDE-H', 'setup-del-1'),
      headers: { authorization: `Bearer ${gw.apiKey}` },
    });
    expect(ingest.status).toBe(201);
    const [p] = await srv.q('SELECT id FROM points WHERE tag = ?', ['MFP-P150-PDE-H']);
    const delPoint = await srv.call('DELETE', `/api/v1/points/${p!.id}`, { cookie: engineer });
    expect(delPoint.status).toBe(409);
    expect((await delPoint.json()).error.message).toMatch(/Rename it instead/);
    const delMachine = await srv.call('DELETE', `/api/v1/machines/${machineId}`, {
      cookie: engineer,
    });
    expect(delMachine.status).toBe(409);
    expect(await srv.q('SELECT id FROM machines WHERE id = ?', [machineId])).toHaveLength(1);

    const empty = await (
      await srv.call('POST', '/api/v1/machines', {
        cookie: engineer,
        body: machineBody(areaId, 'Spare pump'),
      })
    ).json();
    await srv.call('POST', '/api/v1/points', {
      cookie: engineer,
      body: pointBody(empty.id, 'MFP-SPARE-H'),
    });
    expect(
      (await srv.call('DELETE', `/api/v1/machines/${empty.id}`, { cookie: engineer })).status,
    ).toBe(204);
    expect(await srv.q('SELECT id FROM points WHERE tag = ?', ['MFP-SPARE-H'])).toEqual([]);
    const [audit] = await srv.q(
      'SELECT action FROM audit_log WHERE entity = ? AND entity_id = ? ORDER BY id DESC',
      ['machine', String(empty.id)],
    );
    expect(audit!.action).toBe('machine.delete');
  });

  it('renaming a point to a tag in use at its site answers 409 and keeps the old tag', async () => {
    const [p] = await srv.q('SELECT id, machine_id FROM points WHERE tag = ?', ['MFP-P150-PDE-H']);
    const [other] = await srv.q(`${POINTS_OF_SITE} AND p.id <> ? ORDER BY p.id LIMIT 1`, [
      1,
      p!.id,
    ]);
    const res = await srv.call('PATCH', `/api/v1/points/${p!.id}`, {
      cookie: engineer,
      body: pointBody(Number(p!.machine_id), String(other!.tag)),
    });
    expect(res.status).toBe(409);
    expect(await srv.q('SELECT id FROM points WHERE tag = ?', ['MFP-P150-PDE-H'])).toHaveLength(1);
  });
});
