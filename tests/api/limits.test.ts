/**
 * Limits API against the real server and MariaDB: the engineer's audited save, replay of a
 * proposed set over history that came in through ingest, ISO defaults, baseline
 * suggestions, templates.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { loadLimitSet } from '../../apps/server/src/features/limits/limit-set-repository.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { postVelocities } from '../support/alert-captures.ts';
import { overallVelocity } from '@turnstone/condition/test-bands';

let srv: TestServer;
let key: string;
const cookies = new Map<string, string>();
const t0 = Date.now() - 72 * 3600_000;
let seq = 0;
const TAG = 'MFP-P102-MDE-H';
let pointId: number;

const q = (sqlText: string, params: unknown[] = []) => srv.q(sqlText, params);

async function capture(tag: string, velocities: number[]) {
  seq = await postVelocities(srv, key, tag, velocities, { t0, from: seq, uidPrefix: 'l' });
  await createWorker(srv.ctx, { owner: 'limits-test' }).drain();
}

const velocityBand = (alertLevel: number, dangerLevel: number, persistence = 1) => ({
  ...overallVelocity(alertLevel, dangerLevel),
  persistence,
  hysteresis: 0.9,
});

beforeAll(async () => {
  srv = await startTestServer();
  for (const role of ['admin', 'engineer', 'planner', 'operator'])
    cookies.set(role, await srv.signIn(role));
  key = (
    await (
      await srv.call('POST', '/api/v1/gateways', {
        cookie: cookies.get('admin'),
        body: { siteId: 1, name: 'gw' },
      })
    ).json()
  ).apiKey;
  const [p] = await q('SELECT id FROM points WHERE tag = ?', [TAG]);
  pointId = Number(p!.id);
  // History: 1.5, 1.5, 3.5, 3.5, 1.0, 1.0, 3.5, 3.5, 6, 1.0 mm/s RMS at 1×.
  await capture(TAG, [1.5, 1.5, 3.5, 3.5, 1.0, 1.0, 3.5, 3.5, 6, 1.0]);
});
afterAll(async () => {
  await srv?.stop();
});

describe('limit set of a point', () => {
  it('reads the template-made set with the machine it belongs to', async () => {
    const res = await srv.call('GET', `/api/v1/points/${pointId}/limits`, {
      cookie: cookies.get('operator'),
    });
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.version).toBe(1);
    expect(body.machine).toMatchObject({ type: 'pump', isoGroup: 2, foundation: 'rigid' });
    expect(body.bands.map((b: { key: string }) => b.key)).toContain('overall-velocity');
  });

  it('a planner may not change limits (403) and nothing is written', async () => {
    const res = await srv.call('PUT', `/api/v1/points/${pointId}/limits`, {
      cookie: cookies.get('planner'),
      body: { bands: [velocityBand(3, 5)], reason: 'planner tries' },
    });
    expect(res.status).toBe(403);
    const audit = await q("SELECT COUNT(*) AS n FROM audit_log WHERE action LIKE 'limits.%'");
    expect(Number(audit[0]!.n)).toBe(0);
  });

  it('a band whose danger level is not above its alert level is refused with its field path', async () => {
    const res = await srv.call('PUT', `/api/v1/points/${pointId}/limits`, {
      cookie: cookies.get('engineer'),
      body: { bands: [velocityBand(5, 3)], reason: 'wrong way round' },
    });
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.details).toEqual([
      { path: 'bands.0.dangerLevel', message: 'danger level must be above the alert level' },
    ]);
  });

  it('replay counts the alerts the proposed levels would have raised, and when', async () => {
    // Persistence 1, alert 3.0, danger 5.0, hysteresis 0.9 (clear below 2.7) over
    // 1.5 1.5 3.5 3.5 1.0 1.0 3.5 3.5 6 1.0: raised at #3, cleared #5, raised #7,
    // escalated #9, cleared #10 → 2 alerts, 1 reached danger (worked by hand).
    const res = await srv.call('POST', `/api/v1/points/${pointId}/limits/replay`, {
      cookie: cookies.get('engineer'),
      body: { bands: [velocityBand(3, 5)] },
    });
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.snapshots).toBe(10);
    expect(body.totals).toEqual({ alerts: 2, reachedDanger: 1 });
    const band = body.bands[0];
    expect(band.byLevel).toEqual({ alert: 2, danger: 1 });
    expect(band.values.length).toBe(10);
    expect(band.alerts.map((a: { raisedAt: string }) => a.raisedAt)).toEqual([
      band.values[2].t,
      band.values[6].t,
    ]);
    expect(band.alerts[1].escalatedAt).toBe(band.values[8].t);

    // Persistence 2: #4 raises, #5 clears, #8 raises, the single 6 mm/s does not escalate.
    const p2 = await (
      await srv.call('POST', `/api/v1/points/${pointId}/limits/replay`, {
        cookie: cookies.get('engineer'),
        body: { bands: [velocityBand(3, 5, 2)] },
      })
    ).json();
    expect(p2.totals).toEqual({ alerts: 2, reachedDanger: 0 });
    // Levels above every value raise nothing.
    const high = await (
      await srv.call('POST', `/api/v1/points/${pointId}/limits/replay`, {
        cookie: cookies.get('engineer'),
        body: { bands: [velocityBand(8, 12)] },
      })
    ).json();
    expect(high.totals).toEqual({ alerts: 0, reachedDanger: 0 });
  });

  it('replay is for engineers only', async () => {
    const res = await srv.call('POST', `/api/v1/points/${pointId}/limits/replay`, {
      cookie: cookies.get('operator'),
      body: { bands: [velocityBand(3, 5)] },
    });
    expect(res.status).toBe(403);
  });

  it('an engineer saves a set: new version, audit row with before, after and reason, listed in history', async () => {
    const before = await loadLimitSet(srv.ctx.db, pointId);
    const res = await srv.call('PUT', `/api/v1/points/${pointId}/limits`, {
      cookie: cookies.get('engineer'),
      body: {
        bands: [velocityBand(3, 5), ...before!.bands.filter((b) => b.key === 'order-1x')],
        reason: 'Pump re-based after the impeller change',
      },
    });
    expect(res.status).toBe(200);
    expect((await res.json()).version).toBe(2);
    const [audit] = await q("SELECT * FROM audit_log WHERE action = 'limits.update'");
    expect(audit).toBeDefined();
    expect(audit!.reason).toBe('Pump re-based after the impeller change');
    const parse = (v: unknown) => (typeof v === 'string' ? JSON.parse(v) : v);
    expect(parse(audit!.before).length).toBe(before!.bands.length);
    expect(parse(audit!.after).length).toBe(2);
    const history = await (
      await srv.call('GET', `/api/v1/points/${pointId}/limits/history`, {
        cookie: cookies.get('engineer'),
      })
    ).json();
    expect(history.items[0]).toMatchObject({
      action: 'limits.update',
      actor: 'Erin Engineer',
      reason: 'Pump re-based after the impeller change',
      changed: ['overall-velocity'],
    });
    expect(history.items[0].removed).toContain('bpfo');
    const read = await (
      await srv.call('GET', `/api/v1/points/${pointId}/limits`, { cookie: cookies.get('engineer') })
    ).json();
    expect(read).toMatchObject({ version: 2, updatedBy: 'Erin Engineer' });
  });

  it('removing a band with an open alert clears that alert, noting why', async () => {
    // The template's order-1x band (levels 0.8 × ISO) saw 6 mm/s; make sure one is open.
    await capture(TAG, [4, 4]);
    const [open] = await q(
      "SELECT id FROM alerts WHERE point_id = ? AND band_key = 'order-1x' AND state <> 'cleared'",
      [pointId],
    );
    expect(open).toBeDefined();
    const res = await srv.call('PUT', `/api/v1/points/${pointId}/limits`, {
      cookie: cookies.get('engineer'),
      body: { bands: [velocityBand(3, 5)], reason: 'drop the 1x band' },
    });
    expect(res.status).toBe(200);
    expect((await res.json()).clearedAlertIds).toContain(open!.id);
    const [row] = await q('SELECT state FROM alerts WHERE id = ?', [open!.id]);
    expect(row!.state).toBe('cleared');
    const [ev] = await q("SELECT note FROM alert_events WHERE alert_id = ? AND kind = 'cleared'", [
      open!.id,
    ]);
    expect(ev!.note).toBe('band removed from the limit set');
  });

  it('ISO 20816 defaults follow the machine group and foundation', async () => {
    const body = await (
      await srv.call('GET', `/api/v1/points/${pointId}/limits/iso-defaults`, {
        cookie: cookies.get('engineer'),
      })
    ).json();
    // ISO 20816-3 group 2, rigid: B/C 2.8, C/D 4.5 mm/s RMS (from memory, as the condition
    // package's iso-zones.ts states).
    expect(body).toMatchObject({
      isoGroup: 2,
      foundation: 'rigid',
      alertLevel: 2.8,
      dangerLevel: 4.5,
    });
  });

  it('refuses a statistical level from a baseline too small to mean anything, with a clear message', async () => {
    // minimum baseline 30 values over 7 days: common practice, no source
    const res = await srv.call(
      'GET',
      `/api/v1/points/${pointId}/limits/suggest?band=overall-velocity&count=4&kAlert=3&kDanger=6`,
      { cookie: cookies.get('engineer') },
    );
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(JSON.stringify(body.error)).toMatch(/at least 30 usable values over at least 7 days/);

    const put = await srv.call('PUT', `/api/v1/points/${pointId}/limits`, {
      cookie: cookies.get('engineer'),
      body: {
        bands: [
          {
            ...velocityBand(3, 5),
            statistical: { kAlert: 3, baseline: { from: 'first-n', count: 2 } },
          },
        ],
        reason: 'two values are enough?',
      },
    });
    expect(put.status).toBe(400);
    const refused = await put.json();
    expect(refused.error.details).toEqual([
      {
        path: 'bands.0.statistical.baseline.count',
        message: expect.stringMatching(/at least 30 usable values over at least 7 days; 2 value/),
      },
    ]);

    const none = await (
      await srv.call('GET', `/api/v1/points/${pointId}/limits/suggest?band=nothing-here`, {
        cookie: cookies.get('engineer'),
      })
    ).json();
    expect(none.baseline).toBeNull();
    expect(none.message).toMatch(/0 stored value/);
  });
});

describe('machine-type templates', () => {
  it('a stored pump template is used for a pump point measured for the first time', async () => {
    const put = await srv.call('PUT', '/api/v1/limit-templates/pump', {
      cookie: cookies.get('engineer'),
      body: { bands: [velocityBand(2.5, 4)], reason: 'site standard for pumps' },
    });
    expect(put.status).toBe(200);
    expect((await put.json()).source).toBe('stored');
    const got = await (
      await srv.call('GET', '/api/v1/limit-templates/pump', { cookie: cookies.get('engineer') })
    ).json();
    expect(got.bands).toEqual([velocityBand(2.5, 4)]);
    await capture('MFP-P201-MDE-H', [1.0]);
    const [p] = await q("SELECT id FROM points WHERE tag = 'MFP-P201-MDE-H'");
    const set = await loadLimitSet(srv.ctx.db, Number(p!.id));
    expect(set!.bands.map((b) => [b.key, b.alertLevel, b.dangerLevel])).toEqual([
      ['overall-velocity', 2.5, 4],
    ]);
    const planner = await srv.call('PUT', '/api/v1/limit-templates/pump', {
      cookie: cookies.get('planner'),
      body: { bands: [velocityBand(2.5, 4)], reason: 'no' },
    });
    expect(planner.status).toBe(403);
  });
});
