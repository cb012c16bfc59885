/**
 * Alerts end to end: captures go in through the ingest API, the real worker analyses them
 * and applies the condition step, and the alerts API shows and acknowledges what it raised.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { snapshotBody } from '../support/signals.ts';

let srv: TestServer;
const keys = new Map<number, string>();
const cookies = new Map<string, string>();
// 30 days back, so a capture after the 5-day clear off-delay is not in the future
const t0 = Date.now() - 30 * 24 * 3600_000;
let seq = 0;

/**
 * Peak acceleration (g) of a 24.7 Hz tone whose velocity is `mmS` mm/s RMS:
 * a = v·√2·2πf / 9806.65 (v = a/2πf for a sine, RMS = peak/√2; calculus of a sinusoid, textbook).
 * 24.7 Hz is 1× of the demo pumps (1480–1485 r/min).
 */
const peakGFor = (mmS: number) => (mmS * Math.SQRT2 * 2 * Math.PI * 24.7) / 9806.65;

const q = (sqlText: string, params: unknown[] = []) => srv.q(sqlText, params);

/** One capture per value (mm/s RMS at 1×), an hour apart, then the worker drains. */
async function capture(siteId: number, tag: string, velocities: number[], extra = {}) {
  for (const v of velocities) {
    seq += 1;
    const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
      body: snapshotBody(tag, `a-${seq}`, {
        tones: [{ hz: 24.7, peakG: peakGFor(v) }],
        noiseG: 0.001,
        seed: seq,
        takenAt: new Date(t0 + seq * 3600_000).toISOString(),
        ...extra,
      }),
      headers: { authorization: `Bearer ${keys.get(siteId)}` },
    });
    expect(res.status).toBe(201);
  }
  await createWorker(srv.ctx, { owner: 'alerts-test' }).drain();
}

async function alertsOf(role: string, query = '') {
  const res = await srv.call('GET', `/api/v1/alerts${query}`, { cookie: cookies.get(role) });
  expect(res.status).toBe(200);
  return (await res.json()).items as Record<string, unknown>[];
}

beforeAll(async () => {
  srv = await startTestServer();
  for (const role of ['admin', 'engineer', 'planner', 'operator'])
    cookies.set(role, await srv.signIn(role));
  for (const siteId of [1, 2]) {
    const res = await srv.call('POST', '/api/v1/gateways', {
      cookie: cookies.get('admin'),
      body: { siteId, name: `gw-${siteId}` },
    });
    keys.set(siteId, (await res.json()).apiKey);
  }
});
afterAll(async () => {
  await srv?.stop();
});

describe('alerts through ingest', () => {
  const TAG = 'MFP-P101-MDE-H';

  it('a rising overall velocity raises an alert, then escalates it to danger', async () => {
    // P-101: ISO 20816-3 group 2, rigid → template alert 2.8 mm/s (B/C), danger 4.5 (C/D),
    // persistence 2 (condition package's TEMPLATE_DEFAULTS, common practice, no source).
    await capture(1, TAG, [1.5, 1.5]);
    expect((await alertsOf('engineer', '?pointId=1')).length).toBe(0);
    await capture(1, TAG, [3.5]);
    // One value above the alert level is not enough with persistence 2.
    let items = await alertsOf('engineer');
    expect(items.filter((a) => a.bandKey === 'overall-velocity')).toEqual([]);
    await capture(1, TAG, [3.5]);
    items = await alertsOf('engineer');
    const raised = items.find((a) => a.pointTag === TAG && a.bandKey === 'overall-velocity');
    expect(raised).toMatchObject({ level: 'alert', state: 'raised', unit: 'mm/s', limit: 2.8 });
    expect(raised!.value as number).toBeGreaterThan(3.3);
    expect(raised!.value as number).toBeLessThan(3.7);
    expect(raised).toMatchObject({ machineName: 'Intake pump P-101', siteCode: 'MFP' });

    await capture(1, TAG, [6, 6]);
    items = await alertsOf('engineer', '?level=danger');
    const danger = items.find((a) => a.id === raised!.id);
    expect(danger).toMatchObject({ level: 'danger', state: 'raised', limit: 4.5 });
    expect(danger!.peakValue as number).toBeGreaterThan(5.6);

    const detail = await (
      await srv.call('GET', `/api/v1/alerts/${raised!.id}`, { cookie: cookies.get('planner') })
    ).json();
    expect(detail.history.map((h: { kind: string }) => h.kind)).toEqual(['raised', 'escalated']);
    // How it clears, from the point's limit set in force: clear level = hysteresis 0.9 ×
    // alert level 2.8 = 2.52 mm/s, 3 values in a row, off-delay 120 h (the template's rules,
    // TEMPLATE_DEFAULTS / NEW_BAND_RULES; common practice, no source).
    expect(detail.clearRule).toMatchObject({
      alertLevel: 2.8,
      dangerLevel: 4.5,
      clearPersistence: 3,
      clearAfterHours: 120,
    });
    expect(detail.clearRule.clearLevel).toBeCloseTo(0.9 * 2.8, 10);
  });

  it('captures turning suspect (under-range) give one notice per turn, not one per capture', async () => {
    // Peak 0.05 g on the ±50 g int16 channel: 655 counts per g (5 V full scale, 100 mV/g),
    // so ≈ 65 counts peak-to-peak, log2 ≈ 6 bits used: below UNDER_RANGE_SUSPECT_BITS (8),
    // above UNDER_RANGE_UNUSABLE_BITS (4). 0.5 g uses ≈ 9.4 bits: ok.
    const tag = 'MFP-P101-MNDE-H';
    const peaks = [0.5, 0.05, 0.05, 0.5, 0.05];
    for (const peakG of peaks) {
      seq += 1;
      const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
        body: snapshotBody(tag, `under-${seq}`, {
          tones: [{ hz: 24.7, peakG }],
          noiseG: 0.0005,
          seed: seq,
          takenAt: new Date(t0 + seq * 3600_000).toISOString(),
        }),
        headers: { authorization: `Bearer ${keys.get(1)}` },
      });
      expect(res.status).toBe(201);
    }
    await createWorker(srv.ctx, { owner: 'alerts-test' }).drain();
    const [p] = await q('SELECT id FROM points WHERE tag = ?', [tag]);
    const verdicts = await q(
      'SELECT quality_verdict FROM analyses WHERE point_id = ? ORDER BY taken_at',
      [p!.id],
    );
    expect(verdicts.map((v) => v.quality_verdict)).toEqual([
      'ok',
      'suspect',
      'suspect',
      'ok',
      'suspect',
    ]);
    const notices = await q(
      'SELECT verdict, findings FROM quality_notices WHERE point_id = ? ORDER BY taken_at',
      [p!.id],
    );
    expect(notices.map((n) => n.verdict)).toEqual(['suspect', 'suspect']);
    expect(JSON.stringify(notices[0]!.findings)).toContain('under-range');
  });

  it('an unusable (clipped) capture raises only a data-quality notice, never an alert', async () => {
    // 80 g peak on a ±50 g channel (5 V full scale / 100 mV/g) is cut at the rails.
    const before = await q('SELECT COUNT(*) AS n FROM alerts WHERE point_id = 2');
    seq += 1;
    for (let i = 0; i < 3; i++) {
      seq += 1;
      await srv.call('POST', '/api/ingest/v1/snapshots', {
        body: snapshotBody('MFP-P101-MDE-V', `clip-${seq}`, {
          tones: [{ hz: 24.7, peakG: 80 }],
          takenAt: new Date(t0 + seq * 3600_000).toISOString(),
        }),
        headers: { authorization: `Bearer ${keys.get(1)}` },
      });
    }
    await createWorker(srv.ctx, { owner: 'alerts-test' }).drain();
    const [p] = await q("SELECT id FROM points WHERE tag = 'MFP-P101-MDE-V'");
    const verdicts = await q('SELECT quality_verdict FROM analyses WHERE point_id = ?', [p!.id]);
    expect(verdicts.map((v) => v.quality_verdict)).toEqual(['unusable', 'unusable', 'unusable']);
    const notices = await q('SELECT verdict FROM quality_notices WHERE point_id = ?', [p!.id]);
    expect(notices.length).toBe(3);
    const after = await q('SELECT COUNT(*) AS n FROM alerts WHERE point_id = ?', [p!.id]);
    expect(Number(after[0]!.n)).toBe(0);
    expect(Number(before[0]!.n)).toBe(0);
  });

  it('an operator acknowledges a raised alert with a note, recorded in history, state and audit', async () => {
    const [raised] = await alertsOf('operator', '?state=raised&level=danger');
    expect(raised).toBeDefined();
    const res = await srv.call('POST', `/api/v1/alerts/${raised!.id}/acknowledge`, {
      cookie: cookies.get('operator'),
      body: { note: 'Heard it from the walkway; told the shift lead.' },
    });
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body).toMatchObject({
      state: 'acknowledged',
      acknowledgedBy: 'Oli Operator',
      acknowledgeNote: 'Heard it from the walkway; told the shift lead.',
    });
    expect(body.history.at(-1)).toMatchObject({ kind: 'acknowledged', userName: 'Oli Operator' });
    const audit = await q(
      "SELECT * FROM audit_log WHERE action = 'alert.acknowledge' AND entity_id = ?",
      [String(raised!.id)],
    );
    expect(audit.length).toBe(1);
    const [state] = await q('SELECT state FROM point_states WHERE point_id = ?', [raised!.pointId]);
    const track = (typeof state!.state === 'string' ? JSON.parse(state!.state) : state!.state)[
      raised!.bandKey as string
    ];
    expect(track.alert.state).toBe('acknowledged');
    expect(track.alert.acknowledgement.note).toBe(
      'Heard it from the walkway; told the shift lead.',
    );
  });

  it('acknowledging an alert that is already acknowledged answers 409 and changes nothing', async () => {
    const [acked] = await alertsOf('engineer', '?state=acknowledged');
    const res = await srv.call('POST', `/api/v1/alerts/${acked!.id}/acknowledge`, {
      cookie: cookies.get('engineer'),
      body: { note: 'again' },
    });
    expect(res.status).toBe(409);
    expect((await res.json()).error.code).toBe('alert_not_raised');
    const events = await q(
      "SELECT COUNT(*) AS n FROM alert_events WHERE alert_id = ? AND kind = 'acknowledged'",
      [acked!.id],
    );
    expect(Number(events[0]!.n)).toBe(1);
  });

  it('a planner may read alerts but not acknowledge them (403)', async () => {
    const [raised] = await alertsOf('planner', '?state=raised');
    expect(raised).toBeDefined();
    const res = await srv.call('POST', `/api/v1/alerts/${raised!.id}/acknowledge`, {
      cookie: cookies.get('planner'),
      body: { note: 'planner note' },
    });
    expect(res.status).toBe(403);
  });

  it('an empty note is refused with the field named', async () => {
    const [raised] = await alertsOf('engineer', '?state=raised');
    const res = await srv.call('POST', `/api/v1/alerts/${raised!.id}/acknowledge`, {
      cookie: cookies.get('engineer'),
      body: { note: ' ' },
    });
    expect(res.status).toBe(400);
    expect((await res.json()).error.details[0].path).toBe('note');
  });

  it("the operator of MFP neither sees nor acknowledges an alert of TRB's pump", async () => {
    // P-120 at Tessel Ridge: group 2 rigid as well, 6 mm/s twice → danger.
    await capture(2, 'TRB-P120-MDE-H', [6, 6]);
    const trb = (await alertsOf('engineer', '?siteId=2')).find(
      (a) => a.bandKey === 'overall-velocity',
    );
    expect(trb).toMatchObject({ siteCode: 'TRB', level: 'danger', state: 'raised' });
    const mine = await alertsOf('operator');
    expect(mine.some((a) => a.siteCode === 'TRB')).toBe(false);
    expect(mine.length).toBeGreaterThan(0);
    const read = await srv.call('GET', `/api/v1/alerts/${trb!.id}`, {
      cookie: cookies.get('operator'),
    });
    expect(read.status).toBe(403);
    const ack = await srv.call('POST', `/api/v1/alerts/${trb!.id}/acknowledge`, {
      cookie: cookies.get('operator'),
      body: { note: 'not my site' },
    });
    expect(ack.status).toBe(403);
    const [row] = await q('SELECT state FROM alerts WHERE id = ?', [trb!.id]);
    expect(row!.state).toBe('raised');
  });

  it('several alerts are acknowledged at once, all or nothing', async () => {
    const raised = await alertsOf('engineer', '?state=raised');
    expect(raised.length).toBeGreaterThanOrEqual(2);
    const acked = (await alertsOf('engineer', '?state=acknowledged'))[0]!;
    // One of the ids is already acknowledged: the whole request is refused.
    const refused = await srv.call('POST', '/api/v1/alerts/acknowledge', {
      cookie: cookies.get('engineer'),
      body: { ids: [raised[0]!.id, acked.id], note: 'batch' },
    });
    expect(refused.status).toBe(409);
    const [still] = await q('SELECT state FROM alerts WHERE id = ?', [raised[0]!.id]);
    expect(still!.state).toBe('raised');

    const ids = raised.map((a) => a.id as number);
    const res = await srv.call('POST', '/api/v1/alerts/acknowledge', {
      cookie: cookies.get('engineer'),
      body: { ids, note: 'Reviewed the trend; inspection booked.' },
    });
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.items.map((a: { state: string }) => a.state)).toEqual(
      ids.map(() => 'acknowledged'),
    );
    expect((await alertsOf('engineer', '?state=raised')).length).toBe(0);
  });

  it('a new exceedance after an alert cleared raises a new alert', async () => {
    // 1.0 mm/s three times is below 0.9 × 2.8 (hysteresis) for the template's clear
    // persistence of 3, taken after the template's 5-day off-delay with nothing above the
    // clear level in it (TEMPLATE_DEFAULTS, common practice, no source): every open P-101
    // alert clears.
    seq += 6 * 24;
    await capture(1, TAG, [1.0, 1.0, 1.0]);
    const vel = (await alertsOf('engineer', `?pointId=1`)).filter(
      (a) => a.bandKey === 'overall-velocity',
    );
    expect(vel.map((a) => a.state)).toEqual(['cleared']);
    await capture(1, TAG, [3.5, 3.5]);
    const again = (await alertsOf('engineer', '?pointId=1')).filter(
      (a) => a.bandKey === 'overall-velocity',
    );
    expect(again.map((a) => a.state)).toEqual(['raised', 'cleared']);
  });
});
