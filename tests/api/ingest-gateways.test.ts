/**
 * Gateways and their keys as ingest meets them: a key shown once, missing, wrong, revoked
 * and rotated keys, and what one site's gateway may learn of another site (uids, tags,
 * snapshot ids). Storing captures: ingest.test.ts.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { testServerForFile } from '../support/api-suite.ts';
import { snapshotBody } from '../support/signals.ts';

const srv = testServerForFile({ env: { INGEST_MAX_PER_MIN: '100000' }, signIn: ['admin'] });
let keyMfp: string;
let keyTrb: string;
const TAG = 'MFP-P101-MDE-H';

beforeAll(async () => {
  keyMfp = await srv.gatewayKey(1, 'MFP gateway A');
  keyTrb = await srv.gatewayKey(2, 'TRB gateway A');
});

describe('gateways', () => {
  it('shows the key once: the list carries only its prefix', async () => {
    const list = await (
      await srv.call('GET', '/api/v1/gateways', { cookie: srv.cookies.admin })
    ).json();
    // The demo seed's two gateways (one per site) and the two made here.
    expect(list.items.map((g: { name: string }) => g.name).sort()).toEqual([
      'Demo gateway MFP',
      'Demo gateway TRB',
      'MFP gateway A',
      'TRB gateway A',
    ]);
    expect(JSON.stringify(list)).not.toContain(keyMfp);
    expect(
      keyMfp.startsWith(
        `tsg_${list.items.find((g: { name: string }) => g.name === 'MFP gateway A').keyPrefix}_`,
      ),
    ).toBe(true);
    const [rows] = await srv.ctx.dbHandle.pool.query('SELECT key_hash FROM gateways');
    expect(JSON.stringify(rows)).not.toContain(keyMfp);
  });

  it('a non-admin cannot create a gateway', async () => {
    const engineer = await srv.signIn('engineer');
    const res = await srv.call('POST', '/api/v1/gateways', {
      cookie: engineer,
      body: { siteId: 1, name: 'x' },
    });
    expect(res.status).toBe(403);
  });
});

describe('ingest across sites and keys', () => {
  it("one site's gateway cannot take another's uid, nor learn its snapshot ids", async () => {
    // common practice, no source: idempotency keys are scoped to their sender.
    // Gateway of site MFP posts first, with a uid site TRB's gateway is about to use.
    const mfpBody = snapshotBody(TAG, 'shared-uid-1', { seed: 3 });
    const trbBody = snapshotBody('TRB-P120-MDE-H', 'shared-uid-1', { seed: 4 });
    const first = await srv.ingest(keyMfp, mfpBody);
    expect(first.status).toBe(201);
    const mfpId = (await first.json()).snapshotId;
    const trb = await srv.ingest(keyTrb, trbBody);
    expect(trb.status).toBe(201);
    const trbId = (await trb.json()).snapshotId;
    expect(trbId).not.toBe(mfpId);
    // In a batch too: the answer names only the sender's own snapshots.
    const batch = await srv.ingest(keyTrb, {
      snapshots: [trbBody],
    });
    const text = await batch.text();
    expect(JSON.parse(text).results[0].status).toBe('duplicate');
    expect(JSON.parse(text).results[0].snapshotId).toBe(trbId);
    expect(text).not.toContain(`"snapshotId":${mfpId}`);
    // Each gateway's repeat is still recognised as its own.
    expect((await srv.ingest(keyMfp, mfpBody)).status).toBe(200);
  });

  it("answers an unknown tag and another site's tag the same way (no tag discovery)", async () => {
    const unknown = await srv.ingest(keyMfp, snapshotBody('NO-SUCH-TAG', 'ing-5'));
    const foreign = await srv.ingest(keyTrb, snapshotBody(TAG, 'ing-6'));
    expect(unknown.status).toBe(404);
    expect(foreign.status).toBe(404);
    const a = (await unknown.json()).error;
    const b = (await foreign.json()).error;
    expect(b.code).toBe(a.code);
    expect(b.message.replace(TAG, 'X')).toBe(a.message.replace('NO-SUCH-TAG', 'X'));
  });

  it("in a batch too, another site's tag gets exactly the answer of a tag no site has", async () => {
    // Site TRB's gateway; TRB-NOWHERE-H exists at no site, MFP-P101-MDE-V only at MFP.
    const res = await srv.ingest(keyTrb, {
      snapshots: [
        snapshotBody('MFP-P101-MDE-V', 'ing-b-foreign'),
        snapshotBody('TRB-NOWHERE-H', 'ing-b-nowhere'),
      ],
    });
    expect(res.status).toBe(200);
    const [foreign, nowhere] = (await res.json()).results;
    const same = (r: object, tag: string, uid: string) =>
      JSON.parse(JSON.stringify(r).replaceAll(tag, 'TAG').replaceAll(uid, 'UID'));
    expect(same(foreign, 'MFP-P101-MDE-V', 'ing-b-foreign')).toEqual(
      same(nowhere, 'TRB-NOWHERE-H', 'ing-b-nowhere'),
    );
    expect(nowhere).toMatchObject({ status: 'unknown_point', httpStatus: 404 });
    // The single post's answer is the batch item's error, with the same status.
    const single = await srv.ingest(keyTrb, snapshotBody('MFP-P101-MDE-V', 'ing-b-foreign-1'));
    expect(single.status).toBe(404);
    expect((await single.json()).error).toEqual(foreign.error);
  });

  it('two sites may use the same tag: each gateway stores to the point of its own site', async () => {
    const engineer = await srv.signIn('engineer');
    const [rows] = await srv.ctx.dbHandle.pool.query(
      `SELECT p.tag, p.id, (SELECT m2.id FROM machines m2 JOIN areas a2 ON a2.id = m2.area_id
                             WHERE a2.site_id = 2 ORDER BY m2.id LIMIT 1) AS trbMachine
         FROM points p JOIN machines m ON m.id = p.machine_id JOIN areas a ON a.id = m.area_id
        WHERE a.site_id = 1 AND p.tag = 'MFP-P101-MNDE-H'`,
    );
    const mfp = (rows as { tag: string; id: number; trbMachine: number }[])[0]!;
    // Site TRB gets a point with the tag MFP already uses (set-up allows it: unique per site).
    const created = await srv.call('POST', '/api/v1/points', {
      cookie: engineer,
      body: {
        machineId: mfp.trbMachine,
        tag: mfp.tag,
        name: 'Shared-tag point',
        location: 'Motor NDE',
        direction: 'H',
        sensitivityMvPerG: 100,
        bearingId: null,
        fmaxHz: 1000,
        lines: 1600,
      },
    });
    expect(created.status).toBe(201);
    const trbPointId = (await created.json()).id as number;
    expect(trbPointId).not.toBe(mfp.id);

    const toMfp = await srv.ingest(keyMfp, snapshotBody(mfp.tag, 'shared-tag-mfp'));
    const toTrb = await srv.ingest(keyTrb, snapshotBody(mfp.tag, 'shared-tag-trb', { seed: 9 }));
    expect([toMfp.status, toTrb.status]).toEqual([201, 201]);
    const pointOf = async (snapshotId: number) => {
      const [r] = await srv.ctx.dbHandle.pool.query('SELECT point_id FROM snapshots WHERE id = ?', [
        snapshotId,
      ]);
      return Number((r as { point_id: number }[])[0]!.point_id);
    };
    expect(await pointOf((await toMfp.json()).snapshotId)).toBe(mfp.id);
    expect(await pointOf((await toTrb.json()).snapshotId)).toBe(trbPointId);
  });

  it('answers 401 for a missing, wrong or revoked key', async () => {
    expect(
      (await srv.call('POST', '/api/ingest/v1/snapshots', { body: snapshotBody(TAG, 'k1') }))
        .status,
    ).toBe(401);
    expect(
      (await srv.ingest('tsg_000000000000_' + 'A'.repeat(32), snapshotBody(TAG, 'k2'))).status,
    ).toBe(401);
    const created = await (
      await srv.call('POST', '/api/v1/gateways', {
        cookie: srv.cookies.admin,
        body: { siteId: 1, name: 'to revoke' },
      })
    ).json();
    expect((await srv.ingest(created.apiKey, snapshotBody(TAG, 'k3'))).status).toBe(201);
    expect(
      (
        await srv.call('POST', `/api/v1/gateways/${created.id}/revoke`, {
          cookie: srv.cookies.admin,
        })
      ).status,
    ).toBe(200);
    const res = await srv.ingest(created.apiKey, snapshotBody(TAG, 'k4'));
    expect(res.status).toBe(401);
    expect((await res.json()).error.code).toBe('revoked_api_key');
  });

  it('a rotated key replaces the old one at once', async () => {
    const created = await (
      await srv.call('POST', '/api/v1/gateways', {
        cookie: srv.cookies.admin,
        body: { siteId: 1, name: 'to rotate' },
      })
    ).json();
    const rotated = await (
      await srv.call('POST', `/api/v1/gateways/${created.id}/rotate`, { cookie: srv.cookies.admin })
    ).json();
    expect((await srv.ingest(created.apiKey, snapshotBody(TAG, 'r1'))).status).toBe(401);
    expect((await srv.ingest(rotated.apiKey, snapshotBody(TAG, 'r2'))).status).toBe(201);
  });
});
