/**
 * Captures stored through the real gateway API at chosen past times and analysed by the real
 * worker, and what the retention passes leave of them: for the retention tests.
 */
import { expect } from 'vitest';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import {
  expireRawSamplesPass,
  thinSpectra,
} from '../../apps/server/src/features/worker/retention.ts';
import { testServerForFile } from './api-suite.ts';
import { snapshotBody } from './signals.ts';
import type { TestServer } from './test-server.ts';

/** The fixed "now" of every retention pass in the tests. */
export const NOW = new Date('2026-10-01T12:00:00.000Z');
/** The policy's defaults (common practice, no source), as the passes are given them. */
export const POLICY = { spectraWholeDays: 14, spectraHourlyDays: 90, keepWindowMinutes: 60 };

/** Ingests one capture per time through the gateway API and analyses it; returns analysis ids. */
export async function analysedCaptures(
  srv: TestServer,
  key: string,
  tag: string,
  times: string[],
): Promise<Map<string, number>> {
  const out = new Map<string, number>();
  for (const [i, t] of times.entries()) {
    const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
      body: snapshotBody(tag, `${tag}-${t}`, {
        takenAt: t,
        tones: [{ hz: 24.7, peakG: 0.02 + 0.0005 * i }],
        seed: i,
      }),
      headers: { authorization: `Bearer ${key}` },
    });
    expect(res.status).toBe(201);
    const snapshotId = (await res.json()).snapshotId as number;
    await createWorker(srv.ctx, { owner: 'retention-test' }).drain();
    const [a] = await srv.q('SELECT id FROM analyses WHERE snapshot_id = ?', [snapshotId]);
    out.set(t, Number(a!.id));
  }
  return out;
}

export async function pointIdOf(srv: TestServer, tag: string): Promise<number> {
  const [p] = await srv.q('SELECT id FROM points WHERE tag = ?', [tag]);
  return Number(p!.id);
}

/** Whether an analysis still holds all its spectra (not thinned by retention). */
export async function spectraWhole(srv: TestServer, analysisId: number): Promise<boolean> {
  const [r] = await srv.q(
    'SELECT spectra IS NOT NULL AS kept, spectra_thinned_at FROM analyses WHERE id = ?',
    [analysisId],
  );
  return Number(r!.kept) === 1 && r!.spectra_thinned_at === null;
}

/** One thinning pass at NOW under the default policy (POLICY), in the batches `options` set. */
export function thinAtNow(srv: TestServer, options: Parameters<typeof thinSpectra>[3]) {
  return thinSpectra(srv.ctx.db, POLICY, NOW, options);
}

/** One raw-sample expiry pass at NOW (waveforms older than `days`), as `options` set it. */
export function expireAtNow(
  srv: TestServer,
  days: number,
  options: Parameters<typeof expireRawSamplesPass>[3],
) {
  return expireRawSamplesPass(srv.ctx.db, days, NOW, options);
}

/**
 * The retention tests' file server (the administrator signed in, a gateway of site 1) with
 * the helpers above bound to it.
 */
export function retentionServerForFile() {
  const srv = testServerForFile({ signIn: ['admin'], gateway: true });
  return {
    srv,
    /** Captures of `tag` at these times, analysed: analysis id by time. */
    captures: (tag: string, times: string[]) => analysedCaptures(srv, srv.key, tag, times),
    pointId: (tag: string) => pointIdOf(srv, tag),
    spectraWhole: (analysisId: number) => spectraWhole(srv, analysisId),
    thin: (options: Parameters<typeof thinSpectra>[3]) => thinAtNow(srv, options),
    expire: (days: number, options: Parameters<typeof expireRawSamplesPass>[3]) =>
      expireAtNow(srv, days, options),
  };
}
