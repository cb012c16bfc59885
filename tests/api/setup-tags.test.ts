/**
 * Point tags are unique per site, not across the installation: creating, renaming and moving
 * machines between sites through the set-up API. Sites, areas, machines and points:
 * setup.test.ts.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { snapshotBody } from '../support/signals.ts';
import { machineBody, pointBody, POINTS_OF_SITE } from '../support/setup-bodies.ts';

let srv: TestServer;
let admin: string;
let engineer: string;

beforeAll(async () => {
  srv = await startTestServer();
  admin = await srv.signIn('admin');
  engineer = await srv.signIn('engineer');
});
afterAll(async () => {
  await srv?.stop();
});

describe('point tags are unique per site, not across the installation', () => {
  // The demo seed: site 1 is MFP, site 2 is TRB; the engineer works at both.
  const firstOf = async (sqlText: string, params: unknown[]) => (await srv.q(sqlText, params))[0]!;
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
    expect(await srv.q('SELECT id FROM points WHERE tag = ?', [trbTag])).toHaveLength(2);
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
    expect(await srv.q('SELECT id FROM points WHERE tag = ?', [trbTag])).toHaveLength(2);
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
    expect(await srv.q('SELECT tag FROM points WHERE id = ?', [id])).toEqual([{ tag: trbTag }]);
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
    const [stayed] = await srv.q('SELECT area_id FROM machines WHERE id = ?', [machine.id]);
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
          await srv.q('SELECT point_id FROM snapshots WHERE id = ?', [
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
    expect(await srv.q('SELECT site_id FROM points WHERE id = ?', [point.id])).toEqual([
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
