/**
 * The events a band's trend carries for its markers: alerts raised and acknowledged (who and
 * the note), findings with their state, limit changes of that band (who, why, levels before
 * and after, from the audit record) and captures that came from a file upload (a portable
 * instrument's recording), with their value in the trend.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { trendResponseSchema } from '@turnstone/contracts/trend';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { testServerForFile } from '../support/api-suite.ts';
import { routeRecordingForm } from '../support/signals.ts';
import { acknowledgeAndOpenFinding, postVelocities } from '../support/alert-captures.ts';

const srv = testServerForFile({ signIn: ['engineer', 'planner'], gateway: true });
let pointId: number;
const TAG = 'MFP-P101-MDE-H';
const HOUR = 3600_000;
const t0 = Date.now() - 10 * 86_400_000;
let seq = 0;

async function capture(velocities: number[]) {
  const o = { t0, from: seq, uidPrefix: 'te', speedRpm: 1482 };
  seq = await postVelocities(srv, srv.key, TAG, velocities, o);
  await createWorker(srv.ctx, { owner: 'trend-events-test' }).drain();
}

async function trend(band: string, cookie = srv.cookies.engineer) {
  const res = await srv.call(
    'GET',
    `/api/v1/points/${pointId}/trend?band=${band}&from=${new Date(t0).toISOString()}`,
    { cookie },
  );
  expect(res.status).toBe(200);
  return trendResponseSchema.parse(await res.json());
}

beforeAll(async () => {
  const [p] = await srv.q('SELECT id FROM points WHERE tag = ?', [TAG]);
  pointId = Number(p!.id);
  // P-101 is ISO 20816-3 group 2, rigid: template alert 2.8 mm/s, danger 4.5 mm/s,
  // persistence 2 (condition package's template defaults, common practice, no source).
  // Two quiet captures, then three above the alert level: raised at the fourth.
  await capture([1.0, 1.0, 3.5, 3.5, 3.5]);
}, 120_000);

describe('trend events', () => {
  it('an acknowledged alert names who and the note; a finding carries its title and state', async () => {
    const alertId = await acknowledgeAndOpenFinding(srv, pointId, {
      engineer: srv.cookies.engineer,
      planner: srv.cookies.planner,
      note: 'Coupling guard checked, alignment booked',
      title: 'Realign motor to pump',
    });

    const body = await trend('overall-velocity');
    expect(body.events.map((e) => e.kind)).toEqual(['raised', 'acknowledged']);
    expect(body.events[1]).toMatchObject({
      alertId,
      note: 'Coupling guard checked, alignment booked',
    });
    expect(body.events[1]!.by).toMatch(/\S/);
    expect(body.findings).toEqual([
      expect.objectContaining({ title: 'Realign motor to pump', state: 'open' }),
    ]);
  });

  it('a limit change of the band shows who, why and the levels before and after; other bands are untouched', async () => {
    const current = await (
      await srv.call('GET', `/api/v1/points/${pointId}/limits`, { cookie: srv.cookies.engineer })
    ).json();
    const bands = current.bands as { key: string; alertLevel: number; dangerLevel: number }[];
    const before = bands.find((b) => b.key === 'overall-velocity')!;
    const put = await srv.call('PUT', `/api/v1/points/${pointId}/limits`, {
      cookie: srv.cookies.engineer,
      body: {
        bands: bands.map((b) =>
          b.key === 'overall-velocity' ? { ...b, alertLevel: 3.2, dangerLevel: 5.1 } : b,
        ),
        reason: 'levels from the pump maker after realignment',
      },
    });
    expect(put.status).toBe(200);
    const [who] = await srv.q<{ name: string }>(
      "SELECT u.name FROM audit_log a JOIN users u ON u.id = a.actor_user_id WHERE a.action = 'limits.update'",
    );

    const body = await trend('overall-velocity');
    expect(body.limitChanges).toHaveLength(1);
    expect(body.limitChanges[0]).toMatchObject({
      kind: 'changed',
      by: who!.name,
      reason: 'levels from the pump maker after realignment',
      before: { alert: before.alertLevel, danger: before.dangerLevel, source: 'fixed' },
      after: { alert: 3.2, danger: 5.1, source: 'fixed' },
    });
    const other = bands.find((b) => b.key !== 'overall-velocity')!;
    expect((await trend(other.key)).limitChanges).toEqual([]);
  });

  it('a capture uploaded from a file is marked with who uploaded it, the file and its value', async () => {
    // 0.5 g peak at 100 Hz: velocity peak a/(2πf) = 0.5·9806.65/(2π·100) = 7.804 mm/s, RMS
    // 7.804/√2 = 5.518 mm/s (calculus of a sinusoid, textbook); ISO band 10–1000 Hz holds it.
    const takenAt = new Date(t0 + 2.5 * HOUR).toISOString();
    const form = routeRecordingForm({
      tones: [{ hz: 100, peakG: 0.5 }],
      seed: 7,
      speedRpm: 1480,
      takenAt,
      fileName: 'route-p101-de.wav',
    });
    const res = await srv.call('POST', `/api/v1/points/${pointId}/uploads`, {
      cookie: srv.cookies.engineer,
      raw: form,
    });
    expect(res.status).toBe(201);
    await createWorker(srv.ctx, { owner: 'trend-events-test' }).drain();

    const body = await trend('overall-velocity');
    expect(body.uploads).toHaveLength(1);
    const u = body.uploads[0]!;
    expect(u).toMatchObject({ t: takenAt, fileName: 'route-p101-de.wav', q: 'ok' });
    expect(u.by).toMatch(/\S/);
    expect(u.v).toBeGreaterThan(5.518 * 0.97);
    expect(u.v).toBeLessThan(5.518 * 1.03);
    // the uploaded capture is one of the trend's own values, in time order
    const item = body.items.find((i) => i.analysisId === u.analysisId);
    expect(item).toMatchObject({ t: u.t, v: u.v });
    const times = body.items.map((i) => Date.parse(i.t));
    expect(times).toEqual([...times].sort((a, b) => a - b));
    // gateway captures are not uploads
    expect(body.items.length).toBe(6);
  });

  it('a srv.cookies.planner reads the same events; a band the point lacks is 404', async () => {
    const body = await trend('overall-velocity', srv.cookies.planner);
    expect(body.uploads).toHaveLength(1);
    expect(body.limitChanges).toHaveLength(1);
    const res = await srv.call('GET', `/api/v1/points/${pointId}/trend?band=no-such-band`, {
      cookie: srv.cookies.planner,
    });
    expect(res.status).toBe(404);
  });
});
