/**
 * The retention policy (defaults, what the administrator sees) and the bounded batches the
 * thinning and raw-sample expiry passes run in, on a real MariaDB with captures stored by
 * the real ingest and worker (taken at chosen past times). The tiers themselves, capture by
 * capture: retention-thinning.test.ts. The defaults are common practice, no source.
 */
import { describe, expect, it } from 'vitest';
import { retentionPolicy } from '../../apps/server/src/features/worker/retention.ts';
import { loadConfig } from '../../apps/server/src/config.ts';
import { NOW, retentionServerForFile } from '../support/analysed-captures.ts';

const retention = retentionServerForFile();
const srv = retention.srv;
const TAG_BATCH = 'MFP-P102-MDE-V';
/** The policy's defaults: common practice, no source. */
const DEFAULTS = {
  rawSamplesDays: 90,
  spectraWholeDays: 14,
  spectraHourlyDays: 90,
  captureMonths: 0,
  keepWindowMinutes: 60,
  batchSize: 500,
  batchPauseMs: 200,
};

describe('retention policy', () => {
  it('has the documented defaults and refuses an hourly tier shorter than the whole one', () => {
    const p = retentionPolicy(loadConfig({}));
    expect(p).toEqual(DEFAULTS);
    expect(() => loadConfig({ SPECTRA_WHOLE_DAYS: '30', SPECTRA_HOURLY_DAYS: '7' })).toThrow(
      /SPECTRA_HOURLY_DAYS: must be at least SPECTRA_WHOLE_DAYS/,
    );
    // Captures are dropped only past the last tier: 3 months (84 days at least) do not cover
    // the hourly tier's 90 days, 4 do.
    expect(() => loadConfig({ CAPTURE_RETENTION_MONTHS: '3' })).toThrow(
      /CAPTURE_RETENTION_MONTHS: must cover the spectra tiers/,
    );
    expect(retentionPolicy(loadConfig({ CAPTURE_RETENTION_MONTHS: '4' })).captureMonths).toBe(4);
  });
});

describe('the policy for the administrator', () => {
  it('GET /retention shows the policy in force to administrators only', async () => {
    const res = await srv.call('GET', '/api/v1/retention', { cookie: srv.cookies.admin });
    expect(res.status).toBe(200);
    // The test server runs on the defaults.
    expect(await res.json()).toEqual({ ...DEFAULTS, schedule: '45 2 * * *' });
    const engineer = await srv.signIn('engineer');
    expect((await srv.call('GET', '/api/v1/retention', { cookie: engineer })).status).toBe(403);
  });
});

describe('bounded batches', () => {
  it('a thinning pass with batch size 2 over 5 candidates takes 3 batches', async () => {
    // Six captures of one point on one day 200 days back: the first stays, five are thinned.
    const day = ['01:00', '03:00', '05:00', '07:00', '09:00', '11:00'].map(
      (h) => `2026-03-15T${h}:00.000Z`,
    );
    const ids = await retention.captures(TAG_BATCH, day);
    const pass = await retention.thin({ batchSize: 2 });
    expect(pass).toEqual({ rows: 5, batches: 3 });
    expect(await retention.spectraWhole(ids.get(day[0]!)!)).toBe(true);
    for (const t of day.slice(1)) expect(await retention.spectraWhole(ids.get(t)!)).toBe(false);
    // A second pass finds nothing left to do.
    expect(await retention.thin({ batchSize: 2 })).toEqual({
      rows: 0,
      batches: 0,
    });
  });

  it('raw-sample expiry runs in bounded batches too', async () => {
    const pointId = await retention.pointId(TAG_BATCH);
    // The thinning pass above dropped the waveforms of the five captures it thinned.
    const [gone] = await srv.q(
      'SELECT COUNT(*) AS n FROM snapshots WHERE point_id = ? AND samples IS NULL',
      [pointId],
    );
    expect(Number(gone!.n)).toBe(5);
    // Five more captures in the whole tier, then all received 100 days back. Captures near
    // an alert event, or where captures turned suspect, keep their waveform (tested below):
    // this point's alerts and quality notices go first.
    await srv.q(
      'DELETE e FROM alert_events e JOIN alerts al ON al.id = e.alert_id WHERE al.point_id = ?',
      [pointId],
    );
    await srv.q('DELETE FROM alerts WHERE point_id = ?', [pointId]);
    await srv.q('DELETE FROM quality_notices WHERE point_id = ?', [pointId]);
    await retention.captures(
      TAG_BATCH,
      ['01:00', '02:00', '03:00', '04:00', '05:00'].map((h) => `2026-09-28T${h}:00.000Z`),
    );
    await srv.q(
      'UPDATE snapshots SET received_at = ? - INTERVAL 100 DAY WHERE point_id = ? AND samples IS NOT NULL',
      [NOW, pointId],
    );
    const pass = await retention.expire(90, { batchSize: 4 });
    // Six snapshots (the day's kept one and the five new) in batches of at most 4: 4 + 2.
    expect(pass).toEqual({ rows: 6, batches: 2 });
    const [r] = await srv.q(
      'SELECT COUNT(*) AS n FROM snapshots WHERE point_id = ? AND samples IS NULL AND samples_expired_at IS NOT NULL',
      [pointId],
    );
    expect(Number(r!.n)).toBe(11);
  });
});
