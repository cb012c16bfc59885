/**
 * Why a machine is red: GET /machines/:id/attention names its open alerts and the findings not
 * done on its points, by point and band; the machine detail names each point's governing band
 * with its recent values and the ISO 20816-3 zone boundaries of the machine's class.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { machineAttentionSchema } from '@turnstone/contracts/machine-attention';
import { machineDetailSchema } from '@turnstone/contracts/points';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { testServerForFile } from '../support/api-suite.ts';
import { postVelocities } from '../support/alert-captures.ts';

const srv = testServerForFile({ signIn: ['engineer', 'planner'], gateway: true });
let machineId: number;
let pointId: number;
const TAG = 'MFP-P101-MDE-H';
const t0 = Date.now() - 10 * 86_400_000;
let seq = 0;

async function capture(velocities: number[]) {
  const o = { t0, from: seq, uidPrefix: 'ma', speedRpm: 1482 };
  seq = await postVelocities(srv, srv.key, TAG, velocities, o);
  await createWorker(srv.ctx, { owner: 'attention-test' }).drain();
}

async function attention(cookie = srv.cookies.engineer) {
  const res = await srv.call('GET', `/api/v1/machines/${machineId}/attention`, { cookie });
  expect(res.status).toBe(200);
  return machineAttentionSchema.parse(await res.json());
}

beforeAll(async () => {
  const [p] = await srv.q('SELECT id, machine_id FROM points WHERE tag = ?', [TAG]);
  pointId = Number(p!.id);
  machineId = Number(p!.machine_id);
}, 120_000);

describe('machine attention', () => {
  it('a quiet machine has nothing to say; an unknown machine is 404', async () => {
    expect(await attention()).toEqual({ alerts: [], findings: [] });
    const res = await srv.call('GET', '/api/v1/machines/999999/attention', {
      cookie: srv.cookies.engineer,
    });
    expect(res.status).toBe(404);
  });

  it('names the danger alert and the open finding with their point and band; a done finding goes', async () => {
    // P-101 is ISO 20816-3 group 2 on a rigid foundation: template alert 2.8 mm/s, danger
    // 4.5 mm/s, persistence 2 (condition package's template defaults, common practice).
    await capture([1.5, 3.5, 3.5, 5.2, 5.2]);
    const a = await attention();
    // The overall velocity and the 1× band (the tone is at 1× of 1482 r/min) both reach
    // danger; nothing else is open on the machine.
    expect(a.alerts.map((x) => x.bandKey).sort()).toEqual(['order-1x', 'overall-velocity']);
    const overall = a.alerts.find((x) => x.bandKey === 'overall-velocity')!;
    expect(overall).toMatchObject({ level: 'danger', pointId, pointTag: TAG, machineId });
    expect(a.alerts.every((x) => x.level === 'danger' && x.pointId === pointId)).toBe(true);
    // The tone is 5.2 mm/s RMS at 24.7 Hz, inside the ISO band (10–1000 Hz): the overall
    // value is that within the noise (0.001 g) and the window's leakage.
    expect(overall.value).toBeCloseTo(5.2, 1);

    const created = await srv.call('POST', '/api/v1/findings', {
      cookie: srv.cookies.planner,
      body: {
        pointId,
        alertId: a.alerts[0]!.id,
        bandKey: 'overall-velocity',
        title: 'Check coupling alignment',
      },
    });
    expect(created.status).toBe(201);
    const finding = await created.json();
    const b = await attention();
    expect(b.findings.map((f) => [f.id, f.pointId, f.bandKey])).toEqual([
      [finding.id, pointId, 'overall-velocity'],
    ]);
    const done = await srv.call('PATCH', `/api/v1/findings/${finding.id}`, {
      cookie: srv.cookies.planner,
      body: { state: 'done' },
    });
    expect(done.status).toBe(200);
    expect((await attention()).findings).toEqual([]);
  });

  it('the machine detail names the governing band of the point in alert with its values, and the zone boundaries', async () => {
    const res = await srv.call('GET', `/api/v1/machines/${machineId}`, {
      cookie: srv.cookies.engineer,
    });
    expect(res.status).toBe(200);
    const m = machineDetailSchema.parse(await res.json());
    const p = m.points.find((x) => x.id === pointId)!;
    // Both alerts are danger: the one furthest over its level (value ÷ level) governs.
    const open = (await attention()).alerts;
    const ratio = (x: { value: number; limit: number }) => x.value / x.limit;
    const worst = open.reduce((w, x) => (ratio(x) > ratio(w) ? x : w));
    expect(p.governing).toMatchObject({
      key: worst.bandKey,
      name: worst.bandName,
      level: 'danger',
    });
    // Oldest first, one value per capture; the newest is the alert's latest value.
    expect(p.governing.values).toHaveLength(5);
    expect(p.governing.values.at(-1)!.v).toBeCloseTo(worst.value, 9);
    // The overall velocity values as made above (mm/s RMS of each tone).
    expect(p.recentVelocity.map((v) => Number(v.v.toFixed(1)))).toEqual([1.5, 3.5, 3.5, 5.2, 5.2]);
    const quiet = m.points.find((x) => x.id !== pointId)!;
    expect(quiet.governing).toMatchObject({ key: 'overall-velocity', level: null, values: [] });
    // ISO 20816-3 zone boundaries for group 2 (medium machines, 15–300 kW), rigid foundation:
    // A/B 1.4, B/C 2.8, C/D 4.5 mm/s RMS — the ISO 10816-3 / 20816-3 group 2 table as kept in
    // packages/condition, values from memory (the purchased standard is not at hand).
    expect(m.isoGroup).toBe(2);
    expect(m.foundation).toBe('rigid');
    expect(m.isoBoundaries).toEqual({ ab: 1.4, bc: 2.8, cd: 4.5 });
  });

  it('the trend names who acknowledged an alert and the note they wrote', async () => {
    const open = (await attention()).alerts.find((a) => a.bandKey === 'overall-velocity')!;
    const ack = await srv.call('POST', `/api/v1/alerts/${open.id}/acknowledge`, {
      cookie: srv.cookies.engineer,
      body: { note: 'Guard off, alignment booked' },
    });
    expect(ack.status).toBe(200);
    const res = await srv.call(
      'GET',
      `/api/v1/points/${pointId}/trend?band=overall-velocity&from=${new Date(t0).toISOString()}`,
      { cookie: srv.cookies.engineer },
    );
    expect(res.status).toBe(200);
    const body = await res.json();
    const acked = body.events.find((e: { kind: string }) => e.kind === 'acknowledged');
    expect(acked).toMatchObject({ alertId: open.id, note: 'Guard off, alignment booked' });
    expect(acked.by).toMatch(/\S/);
    const raised = body.events.find((e: { kind: string }) => e.kind === 'raised');
    expect(raised).toMatchObject({ by: null });
  });
});
