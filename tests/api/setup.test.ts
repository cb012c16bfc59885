import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { snapshotBody } from '../support/signals.ts';

let srv: TestServer;
let admin: string;
let engineer: string;
let planner: string;
let operator: string;

const q = (sqlText: string, params: unknown[] = []) => srv.q(sqlText, params);

/** A medium pump on a rigid foundation (ISO 20816-3 group 2); bearing 6309 from memory. */
const machineBody = (areaId: number, name: string) => ({
  areaId,
  name,
  type: 'pump',
  nominalRpm: 2960,
  isoGroup: 2,
  foundation: 'rigid',
  criticality: 'high',
  powerKw: 75,
  bladeCount: null,
  vaneCount: 6,
  bearings: [
    {
      name: 'Pump DE',
      designation: '6309',
      rollingElements: 8,
      ballDiameterMm: 17.46,
      pitchDiameterMm: 72.5,
      contactAngleDeg: 0,
      speedRatio: 1,
    },
  ],
  gears: [],
});
const pointBody = (machineId: number, tag: string, bearingId: number | null = null) => ({
  machineId,
  tag,
  name: 'Pump DE, horizontal',
  location: 'Pump DE',
  direction: 'H',
  sensitivityMvPerG: 100,
  bearingId,
  fmaxHz: 1000,
  lines: 1600,
});

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
    const rows = await q(
      'SELECT action, actor_user_id FROM audit_log WHERE entity = ? AND entity_id = ? ORDER BY id',
      ['site', String(site.id)],
    );
    expect(rows.map((r) => r.action)).toEqual(['site.create', 'site.update']);
    const [s] = await q('SELECT name, time_zone FROM sites WHERE id = ?', [site.id]);
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
    expect(await q('SELECT id FROM sites WHERE code = ?', ['NOW'])).toEqual([]);
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

/** Points with their site, through machine and area (the tag's site as the user sees it). */
const POINTS_OF_SITE = `SELECT p.id, p.tag, p.machine_id FROM points p
  JOIN machines m ON m.id = p.machine_id JOIN areas a ON a.id = m.area_id WHERE a.site_id = ?`;

describe('machines and points', () => {
  let areaId: number;
  let machineId: number;
  let bearingId: number;

  beforeAll(async () => {
    const [a] = await q('SELECT id FROM areas WHERE site_id = 1 ORDER BY id LIMIT 1');
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
    const [audit] = await q('SELECT action FROM audit_log WHERE entity = ? AND entity_id = ?', [
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
    expect(await q('SELECT id FROM points WHERE tag = ?', ['MFP-P150-PDE-H'])).toHaveLength(1);
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
    const bearings = await q(
      'SELECT id, designation FROM bearings WHERE machine_id = ? ORDER BY id',
      [machineId],
    );
    expect(bearings.map((b) => b.designation)).toEqual(['6309-C3', '6308']);
    expect(Number(bearings[0]!.id)).toBe(bearingId);
    const [p] = await q('SELECT bearing_id FROM points WHERE tag = ?', ['MFP-P150-PDE-H']);
    expect(Number(p!.bearing_id)).toBe(bearingId);
    // Sending an empty list removes them all.
    await srv.call('PATCH', `/api/v1/machines/${machineId}`, {
      cookie: engineer,
      body: { ...body, bearings: [], gears: [] },
    });
    expect(await q('SELECT id FROM bearings WHERE machine_id = ?', [machineId])).toEqual([]);
    expect(await q('SELECT id FROM gears WHERE machine_id = ?', [machineId])).toEqual([]);
  });

  it('a bearing of another machine is refused with 400 on the bearingId field', async () => {
    const [other] = await q('SELECT id FROM bearings WHERE machine_id <> ? LIMIT 1', [machineId]);
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
    const [p] = await q('SELECT id FROM points WHERE tag = ?', ['MFP-P150-PDE-H']);
    const delPoint = await srv.call('DELETE', `/api/v1/points/${p!.id}`, { cookie: engineer });
    expect(delPoint.status).toBe(409);
    expect((await delPoint.json()).error.message).toMatch(/Rename it instead/);
    const delMachine = await srv.call('DELETE', `/api/v1/machines/${machineId}`, {
      cookie: engineer,
    });
    expect(delMachine.status).toBe(409);
    expect(await q('SELECT id FROM machines WHERE id = ?', [machineId])).toHaveLength(1);

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
    expect(await q('SELECT id FROM points WHERE tag = ?', ['MFP-SPARE-H'])).toEqual([]);
    const [audit] = await q(
      'SELECT action FROM audit_log WHERE entity = ? AND entity_id = ? ORDER BY id DESC',
      ['machine', String(empty.id)],
    );
    expect(audit!.action).toBe('machine.delete');
  });

  it('renaming a point to a tag in use at its site answers 409 and keeps the old tag', async () => {
    const [p] = await q('SELECT id, machine_id FROM points WHERE tag = ?', ['MFP-P150-PDE-H']);
    const [other] = await q(`${POINTS_OF_SITE} AND p.id <> ? ORDER BY p.id LIMIT 1`, [1, p!.id]);
    const res = await srv.call('PATCH', `/api/v1/points/${p!.id}`, {
      cookie: engineer,
      body: pointBody(Number(p!.machine_id), String(other!.tag)),
    });
    expect(res.status).toBe(409);
    expect(await q('SELECT id FROM points WHERE tag = ?', ['MFP-P150-PDE-H'])).toHaveLength(1);
  });
});

describe('point tags are unique per site, not across the installation', () => {
  // The demo seed: site 1 is MFP, site 2 is TRB; the engineer works at both.
  const firstOf = async (sqlText: string, params: unknown[]) => (await q(sqlText, params))[0]!;
  let mfpMachine: number;
  let mfpArea: number;
  let trbArea: number;

  beforeAll(async () => {
    const m = await firstOf(
      'SELECT m.id, m.area_id FROM machines m JOIN areas a ON a.id = m.area_id WHERE a.site_id = ? ORDER BY m.id LIMIT 1',
      [1],
    );
    mfpMachine = Number(m.id);
    mfpArea = Number(m.area_id);
    trbArea = Number(
      (await firstOf('SELECT id FROM areas WHERE site_id = ? ORDER BY id LIMIT 1', [2])).id,
    );
  });

  it('a point may take a tag another site uses (201); a second one at the same site answers 409', async () => {
    const trbTag = String((await firstOf(`${POINTS_OF_SITE} ORDER BY p.id LIMIT 1`, [2])).tag);
    const res = await srv.call('POST', '/api/v1/points', {
      cookie: engineer,
      body: pointBody(mfpMachine, trbTag),
    });
    expect(res.status).toBe(201);
    expect(await q('SELECT id FROM points WHERE tag = ?', [trbTag])).toHaveLength(2);
    const again = await srv.call('POST', '/api/v1/points', {
      cookie: engineer,
      body: pointBody(mfpMachine, trbTag),
    });
    expect(again.status).toBe(409);
    expect((await again.json()).error).toEqual({
      code: 'conflict',
      message: `Tag ${trbTag} is already used by another point of this site.`,
      details: [
        { path: 'tag', message: `Tag ${trbTag} is already used by another point of this site.` },
      ],
    });
    expect(await q('SELECT id FROM points WHERE tag = ?', [trbTag])).toHaveLength(2);
  });

  it('renaming a point to a tag only another site uses succeeds', async () => {
    const created = await srv.call('POST', '/api/v1/points', {
      cookie: engineer,
      body: pointBody(mfpMachine, 'MFP-RENAME-ME-H'),
    });
    expect(created.status).toBe(201);
    const { id } = await created.json();
    const trbTag = String(
      (await firstOf(`${POINTS_OF_SITE} ORDER BY p.id LIMIT 1 OFFSET 1`, [2])).tag,
    );
    const res = await srv.call('PATCH', `/api/v1/points/${id}`, {
      cookie: engineer,
      body: pointBody(mfpMachine, trbTag),
    });
    expect(res.status).toBe(200);
    expect(await q('SELECT tag FROM points WHERE id = ?', [id])).toEqual([{ tag: trbTag }]);
  });

  it("a machine moves to another site's area only when its points' tags are free there, and its points go along", async () => {
    const trbTag = String(
      (await firstOf(`${POINTS_OF_SITE} ORDER BY p.id LIMIT 1 OFFSET 2`, [2])).tag,
    );
    const machine = await (
      await srv.call('POST', '/api/v1/machines', {
        cookie: engineer,
        body: machineBody(mfpArea, 'Mover pump P-190'),
      })
    ).json();
    const point = await (
      await srv.call('POST', '/api/v1/points', {
        cookie: engineer,
        body: pointBody(machine.id, trbTag),
      })
    ).json();
    const move = () =>
      srv.call('PATCH', `/api/v1/machines/${machine.id}`, {
        cookie: engineer,
        body: machineBody(trbArea, 'Mover pump P-190'),
      });
    const refused = await move();
    expect(refused.status).toBe(409);
    const err = (await refused.json()).error;
    expect(err.message).toContain(trbTag);
    expect(err.details).toEqual([expect.objectContaining({ path: 'areaId' })]);
    const [stayed] = await q('SELECT area_id FROM machines WHERE id = ?', [machine.id]);
    expect(Number(stayed!.area_id)).not.toBe(trbArea);

    // Renamed, the point's tag is free at TRB: the machine moves, and from that moment a TRB
    // gateway reaches the point while an MFP gateway (which reached it just before) does not.
    const gatewayOf = async (siteId: number) =>
      (
        await (
          await srv.call('POST', '/api/v1/gateways', {
            cookie: admin,
            body: { siteId, name: `mover gw ${siteId}` },
          })
        ).json()
      ).apiKey as string;
    const [mfpKey, trbKey] = [await gatewayOf(1), await gatewayOf(2)];
    const ingest = (key: string, uid: string) =>
      srv.call('POST', '/api/ingest/v1/snapshots', {
        body: snapshotBody('MOVER-P190-H', uid, { seed: uid.length }),
        headers: { authorization: `Bearer ${key}` },
      });
    const pointOf = async (res: Response) =>
      Number(
        (
          await q('SELECT point_id FROM snapshots WHERE id = ?', [
            ((await res.json()) as { snapshotId: number }).snapshotId,
          ])
        )[0]!.point_id,
      );
    const notYet = await ingest(trbKey, 'mover-trb-0');
    expect(notYet.status).toBe(404);
    expect(
      (
        await srv.call('PATCH', `/api/v1/points/${point.id}`, {
          cookie: engineer,
          body: pointBody(machine.id, 'MOVER-P190-H'),
        })
      ).status,
    ).toBe(200);
    const beforeMove = await ingest(mfpKey, 'mover-mfp-1');
    expect(beforeMove.status).toBe(201);
    expect(await pointOf(beforeMove)).toBe(point.id);

    expect((await move()).status).toBe(200);
    expect(await q('SELECT site_id FROM points WHERE id = ?', [point.id])).toEqual([
      { site_id: 2 },
    ]);
    const atTrb = await ingest(trbKey, 'mover-trb-22');
    expect(atTrb.status).toBe(201);
    expect(await pointOf(atTrb)).toBe(point.id);
    const atMfp = await ingest(mfpKey, 'mover-mfp-222');
    expect(atMfp.status).toBe(404);
    expect((await atMfp.json()).error.code).toBe('unknown_point');
  });
});
