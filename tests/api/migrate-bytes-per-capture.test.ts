/**
 * The bytes-per-capture migration on a populated older database (made by the migrations up
 * to 0019): a thinned analysis loses the detail its summary held for its spectra (axes,
 * peaks, fault frequencies, quality metrics — what retention already cleared the spectra
 * of) and keeps everything else; an analysis that still has its spectra keeps its summary
 * whole and reads its detail from it through the server's one read path; the per-capture
 * JSON columns are stored compressed; the review's covering index of band values, which
 * band_day_sums replaced, is gone, and every band value is still there.
 */
import { describe, expect, it } from 'vitest';
import type { RowDataPacket } from 'mysql2/promise';
import { drizzle } from 'drizzle-orm/mysql2';
import { migrate } from 'drizzle-orm/mysql2/migrator';
import { decodeSpectra, encodeSpectra } from '@turnstone/db/spectra-codec';
import {
  readStoredDetail,
  readStoredSummary,
} from '../../apps/server/src/features/points/stored-summary.ts';
import { databaseForBlock, migrationsUpTo, upgradeByStarting } from '../support/old-migrations.ts';

// A summary as analyses stored it before the split (shape of stored-summary.ts then).
const kept = {
  schemaVersion: 1,
  sampleRateHz: 10240,
  sampleCount: 16384,
  durationS: 1.6,
  fmaxHz: 4000,
  isoBand: '10-1000',
  isoBandHz: [10, 1000],
  accelBandHz: [10, 4000],
  snrDb: 41.5,
  speed: { rpm: 1480, hz: 24.7, source: 'rpm' },
};
const detail = {
  qualityMetrics: { clippedFraction: 0, dcOffsetG: 0.001 },
  spectra: {
    acceleration: { unit: 'g', scale: 'rms', dfHz: 2.5, lines: 3, window: 'hann' },
    velocity: { unit: 'mm/s', scale: 'rms', dfHz: 2.5, lines: 3, lowCutoffHz: 10 },
    envelope: null,
    order: null,
  },
  peaks: [{ hz: 24.7, order: 1, amplitude: 0.012 }],
  faultFrequencies: [{ name: 'BPFO', kind: 'bpfo', hz: 88.1, order: 3.57 }],
};

describe('migration 0021: bytes per capture', () => {
  const db = databaseForBlock();
  const q = async (text: string, params: unknown[] = []) =>
    (await db.pool.query<RowDataPacket[]>(text, params))[0];

  it('trims thinned summaries only, compresses the JSON columns, drops the covered index', async () => {
    await migrate(drizzle(db.pool), { migrationsFolder: migrationsUpTo('0020_band-value-hours') });
    const old = JSON.stringify({ ...kept, ...detail });
    const spectra = encodeSpectra({ acceleration: [0.5, 0.25, 0], velocity: [1, 2, 3] });
    const insert = (id: number, blob: Buffer | null, thinnedAt: string | null) =>
      q(
        `INSERT INTO analyses (id, snapshot_id, point_id, taken_at, accel_rms_g, accel_peak_g,
           velocity_rms_mm_s, displacement_pkpk_um, crest_factor, kurtosis, speed_rpm, speed_source,
           iso_zone, quality_verdict, bits_used, quality_findings, summary, spectra,
           spectra_thinned_at, diagnosis, shaft_vectors)
         VALUES (?, ?, 1, '2025-03-04 05:06:07.890', 0.3, 0.45, 2.5, 40, 1.5, 3, 1480, 'rpm', 'A',
           'ok', 11, '[]', ?, ?, ?, ?, ?)`,
        [
          id,
          id,
          old,
          blob,
          thinnedAt,
          JSON.stringify({ hints: [], notes: ['n'], severityMmS: 2.5 }),
          JSON.stringify([{ order: 1, amplitude: 0.2, phaseDeg: 12 }]),
        ],
      );
    await insert(1, null, '2025-04-01 00:00:00');
    await insert(2, spectra, null);
    for (const [i, key] of ['overall-velocity', 'bpfo'].entries())
      await q(
        `INSERT INTO band_values (analysis_id, point_id, band_key, taken_at, value, quality_verdict)
         VALUES (1, 1, ?, '2025-03-04 05:06:07.890', ?, 'ok'), (2, 1, ?, '2025-03-04 05:06:07.890', ?, 'ok')`,
        [key, i + 0.5, key, i + 1.5],
      );

    await upgradeByStarting(db.url, 'bytes-upgrade-');

    const rows = await q('SELECT id, summary, spectra, diagnosis, shaft_vectors FROM analyses');
    const byId = new Map(rows.map((r) => [Number(r.id), r]));
    const parse = (v: unknown) => (typeof v === 'string' ? JSON.parse(v) : v);
    // The thinned capture keeps exactly what every capture keeps; it had no spectra to show.
    expect(parse(byId.get(1)!.summary)).toEqual(kept);
    expect(readStoredSummary(parse(byId.get(1)!.summary)).isoBandHz).toEqual([10, 1000]);
    // The whole capture (a BLOB written without a detail) reads its detail from its summary.
    const whole = byId.get(2)!;
    expect(parse(whole.summary)).toEqual({ ...kept, ...detail });
    expect(readStoredDetail({ summary: parse(whole.summary), spectra: whole.spectra })).toEqual(
      detail,
    );
    expect(decodeSpectra(whole.spectra).velocity![2]).toBe(3);
    // Diagnosis and shaft vectors unchanged, now stored compressed.
    expect(parse(whole.diagnosis)).toEqual({ hints: [], notes: ['n'], severityMmS: 2.5 });
    expect(parse(byId.get(1)!.shaft_vectors)).toEqual([{ order: 1, amplitude: 0.2, phaseDeg: 12 }]);
    const [create] = await q('SHOW CREATE TABLE analyses');
    const ddl = String(create!['Create Table']);
    for (const col of ['summary', 'diagnosis', 'shaft_vectors'])
      expect(ddl).toMatch(new RegExp('`' + col + '` longtext [^\\n]*COMPRESSED'));
    const [snapDdl] = await q('SHOW CREATE TABLE snapshots');
    expect(String(snapDdl!['Create Table'])).toMatch(/`tach` longtext [^\n]*COMPRESSED/);
    const indexes = await q(
      `SELECT DISTINCT INDEX_NAME AS name FROM information_schema.STATISTICS
        WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME = 'band_values' ORDER BY 1`,
    );
    expect(indexes.map((r) => r.name)).toEqual([
      'band_values_analysis_band_uq',
      'band_values_trend_idx',
      'PRIMARY',
    ]);
    const values = await q('SELECT analysis_id, band_key, value FROM band_values ORDER BY 1, 2');
    expect(values.map((v) => [Number(v.analysis_id), v.band_key, Number(v.value)])).toEqual([
      [1, 'bpfo', 1.5],
      [1, 'overall-velocity', 0.5],
      [2, 'bpfo', 2.5],
      [2, 'overall-velocity', 1.5],
    ]);
  }, 120_000);
});
