/** Captures through the real ingest API and worker, for tests that need analyses, alerts or history. */
import { expect } from 'vitest';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import type { TestServer } from './test-server.ts';
import { snapshotBody, type ToneOptions } from './signals.ts';

/**
 * Peak acceleration (g) of a 24.7 Hz tone of `mmS` mm/s RMS: a = v·√2·2πf / 9806.65
 * (v = a/2πf for a sine, RMS = peak/√2; calculus of a sinusoid, textbook). 24.7 Hz is 1× of the demo pumps.
 */
export const peakGFor = (mmS: number) => (mmS * Math.SQRT2 * 2 * Math.PI * 24.7) / 9806.65;

/** Posts one snapshot body with a gateway's key; the answer must be 201. Its snapshot id. */
export async function postSnapshot(srv: TestServer, key: string, body: unknown): Promise<number> {
  const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
    body,
    headers: { authorization: `Bearer ${key}` },
  });
  expect(res.status).toBe(201);
  return (await res.json()).snapshotId as number;
}

/** Posts each snapshot body with a gateway's key (each answer 201), then drains the worker once. */
export async function postAndAnalyse(
  srv: TestServer,
  key: string,
  bodies: unknown[],
  owner = 'test-captures',
): Promise<void> {
  for (const body of bodies) await postSnapshot(srv, key, body);
  await createWorker(srv.ctx, { owner }).drain();
}

/**
 * Snapshot bodies of `tag`, one a day for `days` days, the last an hour before now: capture i
 * (uid `${uidPrefix}-${i}`, noise seed i) has 8192 samples of `tones(i)` at 1482 r/min.
 */
export function dailyBodies(
  tag: string,
  uidPrefix: string,
  days: number,
  tones: (i: number) => ToneOptions['tones'],
) {
  const now = Date.now();
  return Array.from({ length: days }, (_, i) =>
    snapshotBody(tag, `${uidPrefix}-${i}`, {
      n: 8192,
      takenAt: new Date(now - (days - 1 - i) * 86_400_000 - 3600_000).toISOString(),
      tones: tones(i),
      speedRpm: 1482,
      seed: i,
    }),
  );
}

/** The point of a tag and its machine. */
export async function pointOfTag(
  srv: TestServer,
  tag: string,
): Promise<{ pointId: number; machineId: number }> {
  const [p] = await srv.q('SELECT id, machine_id FROM points WHERE tag = ?', [tag]);
  return { pointId: Number(p!.id), machineId: Number(p!.machine_id) };
}

/** The id of the analysis made of a snapshot. */
export async function analysisOfSnapshot(srv: TestServer, snapshotId: number): Promise<number> {
  const [a] = await srv.q('SELECT id FROM analyses WHERE snapshot_id = ?', [snapshotId]);
  return Number(a!.id);
}

/**
 * Marks every queued or running job failed: earlier tests on the same server leave retried
 * jobs behind, and a test that counts what its own drains run starts from a quiet queue.
 */
export async function quietQueue(srv: TestServer): Promise<void> {
  await srv.q(
    "UPDATE jobs SET state = 'failed', lease_owner = NULL WHERE state IN ('queued', 'running')",
  );
}

/** A gateway API key for a site, created by the admin. */
export async function gatewayKey(srv: TestServer, siteId: number): Promise<string> {
  const admin = await srv.signIn('admin');
  const res = await srv.call('POST', '/api/v1/gateways', {
    cookie: admin,
    body: { siteId, name: `test-gw-${siteId}-${Date.now()}` },
  });
  return (await res.json()).apiKey as string;
}

/** One capture per velocity (mm/s RMS at 1×), an hour apart from `t0`, then a worker drain. */
export async function captureVelocities(
  srv: TestServer,
  key: string,
  tag: string,
  velocities: number[],
  t0 = Date.now() - (velocities.length + 1) * 3600_000,
): Promise<void> {
  let i = 0;
  for (const v of velocities) {
    i += 1;
    const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
      body: snapshotBody(tag, `${tag}-${t0}-${i}`, {
        tones: [{ hz: 24.7, peakG: peakGFor(v) }],
        noiseG: 0.001,
        seed: i,
        takenAt: new Date(t0 + i * 3600_000).toISOString(),
      }),
      headers: { authorization: `Bearer ${key}` },
    });
    if (res.status !== 201) throw new Error(`ingest answered ${res.status}: ${await res.text()}`);
  }
  await createWorker(srv.ctx, { owner: 'test-captures' }).drain();
}

/**
 * Posts one capture per velocity (mm/s RMS at 1×) on a test's own running count: capture n
 * (counting on from `from`) has uid `${uidPrefix}-${n}`, noise seed n and is taken n hours
 * after `t0` (with the shaft speed `speedRpm` when given). Every answer must be 201. Returns the count after the last capture.
 */
export async function postVelocities(
  srv: TestServer,
  key: string,
  tag: string,
  velocities: number[],
  o: { t0: number; from: number; uidPrefix: string; speedRpm?: number },
): Promise<number> {
  let seq = o.from;
  for (const v of velocities) {
    seq += 1;
    const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
      body: snapshotBody(tag, `${o.uidPrefix}-${seq}`, {
        tones: [{ hz: 24.7, peakG: peakGFor(v) }],
        noiseG: 0.001,
        seed: seq,
        speedRpm: o.speedRpm,
        takenAt: new Date(o.t0 + seq * 3600_000).toISOString(),
      }),
      headers: { authorization: `Bearer ${key}` },
    });
    expect(res.status).toBe(201);
  }
  return seq;
}

/**
 * Acknowledges the point's overall-velocity alert with a note (as `engineer`) and opens a
 * finding on that band (as `planner`); both must be accepted. The alert's id.
 */
export async function acknowledgeAndOpenFinding(
  srv: TestServer,
  pointId: number,
  o: { engineer: string; planner: string; note: string; title: string },
): Promise<number> {
  const [alert] = await srv.q<{ id: number }>(
    "SELECT id FROM alerts WHERE point_id = ? AND band_key = 'overall-velocity'",
    [pointId],
  );
  const ack = await srv.call('POST', `/api/v1/alerts/${alert!.id}/acknowledge`, {
    cookie: o.engineer,
    body: { note: o.note },
  });
  expect(ack.status).toBe(200);
  const made = await srv.call('POST', '/api/v1/findings', {
    cookie: o.planner,
    body: { pointId, bandKey: 'overall-velocity', title: o.title },
  });
  expect(made.status).toBe(201);
  return Number(alert!.id);
}
