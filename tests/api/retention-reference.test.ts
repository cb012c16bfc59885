/**
 * The thinning and raw-sample passes against the policy written out plainly in JavaScript
 * (tests/support/retention-reference.ts; the policy is common practice, no source), on a
 * real MariaDB: two points with a few hundred captures each, seeded in SQL (their spectra and
 * waveforms are placeholder bytes: the passes look at whether they are there, not at what
 * they hold), across hour and day boundaries, the hourly/daily and whole-tier boundaries, two
 * captures taken at the same instant, captures stored out of time order (a late backfill),
 * limit changes (audit log and limit set), alert events with an acknowledgement note, an
 * alert's peak, findings, suspect and unusable notices, uploads and pins, at the edges of the
 * ±60 min windows. Small batches and scan spans make every batch boundary fall somewhere.
 * (A file of its own: retention-thinning.test.ts is at the 400-line limit's edge.)
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { lcg32 } from '@turnstone/dsp/seeded-random';
import { testServerForFile } from '../support/api-suite.ts';
import { expireAtNow, NOW, pointIdOf, POLICY, thinAtNow } from '../support/analysed-captures.ts';
import {
  keptSpectra,
  protectedIds,
  type RefCapture,
  type RefMarkers,
} from '../support/retention-reference.ts';

const srv = testServerForFile();

const MIN = 60_000;
const HOUR = 60 * MIN;
const DAY = 24 * HOUR;
const t = (iso: string) => new Date(iso).getTime();

describe('thinning against the policy written out in JavaScript', () => {
  const rnd = lcg32(18); // the Numerical Recipes 32-bit LCG: deterministic captures
  let A: number;
  let B: number;
  /** Capture times per point, in the order they are stored (ids ascending). */
  const planned: { point: 'A' | 'B'; at: number }[] = [];
  let captures: RefCapture[];
  let markers: RefMarkers;
  const samplesLeft = new Map<number, boolean>();
  /** Whether each analysis of the two points still has its snapshot's waveform. */
  const samplesHeld = async () =>
    (await srv.q(
      `SELECT a.id, s.samples IS NOT NULL AS has FROM analyses a
         JOIN snapshots s ON s.id = a.snapshot_id AND s.taken_at = a.taken_at
        WHERE a.point_id IN (?, ?)`,
      [A, B],
    )) as { id: number; has: number }[];

  // Awkward instants (NOW is 2026-10-01 12:00; whole tier from 09-17 12:00; hourly tier from
  // 07-03 00:00, 90 days back moved to midnight; daily before).
  const edges = [
    '2026-06-29T23:59:59.999Z', // last of its day, first of the next just after
    '2026-06-30T00:00:00.000Z',
    '2026-06-30T00:00:00.001Z',
    '2026-07-02T23:59:59.999Z', // daily tier's last day
    '2026-07-03T00:00:00.000Z', // hourly tier's first hour
    '2026-07-03T00:30:00.000Z',
    '2026-08-10T09:59:59.999Z',
    '2026-08-10T10:00:00.000Z',
    '2026-08-10T10:00:00.000Z', // same instant twice: the lower id is the first
    '2026-08-10T10:59:59.999Z',
    '2026-09-17T11:30:00.000Z',
    '2026-09-17T11:59:59.999Z', // last before the whole tier
    '2026-09-17T12:00:00.000Z', // whole tier
  ];
  // Marker times on point A, with captures exactly on and just past the ±60 min edges.
  const alertRaised = t('2026-07-20T08:10:00.000Z');
  const alertAck = t('2026-07-20T14:00:00.000Z');
  const alertCleared = t('2026-08-22T17:45:00.000Z');
  const alertPeak = t('2026-07-20T09:37:12.345Z');
  const findingAt = t('2026-06-15T06:00:00.000Z');
  const limitUpdate = t('2026-08-03T04:05:00.001Z');
  const limitBaseline = t('2026-08-10T10:00:00.000Z'); // on the two same-instant captures
  const limitSetB = t('2026-07-25T00:00:00.000Z');
  const markerEdges = [
    alertRaised - 60 * MIN, // inside (BETWEEN is inclusive)
    alertRaised - 60 * MIN - 1, // outside
    alertAck + 60 * MIN,
    alertAck + 60 * MIN + 1,
    alertCleared + 30 * MIN,
    alertPeak,
    findingAt - 60 * MIN,
    findingAt + 60 * MIN + 1,
    limitUpdate + 17 * MIN,
    limitUpdate + 19 * MIN,
  ];

  beforeAll(async () => {
    A = await pointIdOf(srv, 'MFP-P101-MDE-H');
    B = await pointIdOf(srv, 'MFP-P101-MDE-V');
    const [none] = await srv.q('SELECT COUNT(*) AS n FROM analyses WHERE point_id IN (?, ?)', [
      A,
      B,
    ]);
    expect(Number(none!.n)).toBe(0);
    // Irregular cadence from 06-01 to 09-30: a capture every 5–90 min on some days.
    const days: number[] = [];
    for (let d = t('2026-06-01T00:00:00Z'); d < t('2026-09-30T00:00:00Z'); d += DAY)
      if (rnd() < 0.3) days.push(d);
    for (const d of days) {
      for (let at = d + Math.floor(rnd() * 3 * HOUR); at < d + DAY;) {
        planned.push({ point: rnd() < 0.75 ? 'A' : 'B', at });
        at += 5 * MIN + Math.floor(rnd() * 85 * MIN) + Math.floor(rnd() * 1000);
      }
    }
    for (const iso of edges) planned.push({ point: 'A', at: t(iso) }, { point: 'B', at: t(iso) });
    for (const at of markerEdges) planned.push({ point: 'A', at }, { point: 'B', at });
    // Stored out of time order: a gateway backfilling a week late, then the rest shuffled.
    for (let i = planned.length - 1; i > 0; i--) {
      const j = Math.floor(rnd() * (i + 1));
      [planned[i], planned[j]] = [planned[j]!, planned[i]!];
    }
    const pool = srv.ctx.dbHandle.pool;
    const pointOf = (p: 'A' | 'B') => (p === 'A' ? A : B);
    const snaps = planned.map((c, i) => [
      `ref-${i}`,
      pointOf(c.point),
      'gateway',
      new Date(c.at),
      new Date(c.at),
      25600,
      4096,
      'int16',
      16,
      5,
      100,
      `ref-${i}`.padEnd(64, '0'),
      'done',
      Buffer.alloc(32, i % 251),
    ]);
    await pool.query(
      `INSERT INTO snapshots (uid, point_id, source, taken_at, received_at, sample_rate_hz,
         sample_count, encoding, adc_bits, full_scale_v, sensitivity_mv_per_g, content_hash,
         status, samples) VALUES ?`,
      [snaps],
    );
    const snapRows = (await srv.q("SELECT id, uid FROM snapshots WHERE uid LIKE 'ref-%'")) as {
      id: number;
      uid: string;
    }[];
    const snapId = new Map(snapRows.map((r) => [r.uid, Number(r.id)]));
    // Analyses stored in yet another order than their snapshots.
    const order = planned.map((_, i) => i).sort(() => rnd() - 0.5);
    await pool.query(
      `INSERT INTO analyses (snapshot_id, point_id, taken_at, accel_rms_g, accel_peak_g,
         velocity_rms_mm_s, displacement_pkpk_um, crest_factor, kurtosis, speed_source,
         quality_verdict, quality_findings, summary, spectra) VALUES ?`,
      [
        order.map((i) => [
          snapId.get(`ref-${i}`),
          pointOf(planned[i]!.point),
          new Date(planned[i]!.at),
          0.3,
          0.45,
          2,
          40,
          1.5,
          3,
          'none',
          'ok',
          '[]',
          '{}',
          Buffer.alloc(64, i % 251),
        ]),
      ],
    );
    const rows = (await srv.q(
      `SELECT a.id, a.point_id AS pointId, a.taken_at AS takenAt FROM analyses a
        JOIN snapshots s ON s.id = a.snapshot_id AND s.taken_at = a.taken_at
        WHERE s.uid LIKE 'ref-%' ORDER BY a.id`,
    )) as { id: number; pointId: number; takenAt: Date }[];
    expect(rows.length).toBe(planned.length);
    captures = rows.map((r) => ({
      id: Number(r.id),
      pointId: Number(r.pointId),
      takenAt: r.takenAt.getTime(),
      upload: false,
      pinned: false,
      suspect: false,
    }));
    const pick = (point: number) => {
      const of = captures.filter((c) => c.pointId === point);
      return of[Math.floor(rnd() * of.length)]!;
    };
    const [admin] = await srv.q("SELECT id FROM users WHERE email = 'admin@turnstone.local'");
    const userId = Number(admin!.id);
    for (const p of [A, A, B]) {
      const c = pick(p);
      c.upload = true;
      await srv.q(
        `UPDATE snapshots s JOIN analyses a ON a.snapshot_id = s.id AND a.taken_at = s.taken_at
            SET s.source = 'upload', s.gateway_id = NULL WHERE a.id = ?`,
        [c.id],
      );
    }
    for (const p of [A, B, B]) {
      const c = pick(p);
      c.pinned = true;
      await srv.q(
        'INSERT IGNORE INTO capture_pins (analysis_id, pinned_by, pinned_at, note) VALUES (?, ?, ?, ?)',
        [c.id, userId, NOW, 'reference'],
      );
    }
    for (const [p, verdict] of [
      [A, 'suspect'],
      [A, 'unusable'],
      [B, 'suspect'],
    ] as const) {
      const c = pick(p);
      if (verdict === 'suspect') c.suspect = true;
      await srv.q(
        "INSERT INTO quality_notices (point_id, analysis_id, verdict, findings, taken_at) VALUES (?, ?, ?, '[]', ?)",
        [p, c.id, verdict, new Date(c.takenAt)],
      );
    }
    const [alert] = (await pool.query(
      `INSERT INTO alerts (point_id, band_key, band_name, level, state, unit, limit_value,
         first_value, last_value, peak_value, first_at, last_at, peak_at, acknowledge_note)
       VALUES (?, 'overall-velocity', 'Overall velocity', 'alert', 'cleared', 'mm/s', 4.5,
         5, 5, 7, ?, ?, ?, 'Bearing noise heard on the round')`,
      [A, new Date(alertRaised), new Date(alertCleared), new Date(alertPeak)],
    )) as unknown as [{ insertId: number }];
    for (const [kind, at] of [
      ['raised', alertRaised],
      ['acknowledged', alertAck],
      ['cleared', alertCleared],
    ] as const)
      await srv.q(
        'INSERT INTO alert_events (alert_id, kind, level, value, note, at) VALUES (?, ?, ?, 5, ?, ?)',
        [
          alert.insertId,
          kind,
          'alert',
          kind === 'acknowledged' ? 'Bearing noise' : null,
          new Date(at),
        ],
      );
    await srv.q(
      'INSERT INTO findings (point_id, title, created_by, created_at) VALUES (?, ?, ?, ?)',
      [A, 'Soft foot on the motor', userId, new Date(findingAt)],
    );
    for (const [action, at] of [
      ['limits.update', limitUpdate],
      ['limits.baseline', limitBaseline],
    ] as const)
      await srv.q(
        "INSERT INTO audit_log (action, entity, entity_id, at) VALUES (?, 'point', ?, ?)",
        [action, String(A), new Date(at)],
      );
    // Neither a limit change nor of this point: must not keep anything.
    await srv.q(
      "INSERT INTO audit_log (action, entity, entity_id, at) VALUES ('limits.view', 'point', ?, ?)",
      [String(A), new Date(t('2026-07-10T10:10:00Z'))],
    );
    // Point B's own limit set changed; point A's set (if any) changed after NOW.
    await srv.q('UPDATE limit_sets SET updated_at = ? WHERE point_id = ?', [
      new Date(limitSetB),
      B,
    ]);
    await srv.q('UPDATE limit_sets SET updated_at = ? WHERE point_id = ?', [
      new Date(NOW.getTime() + DAY),
      A,
    ]);
    const [bSet] = await srv.q('SELECT COUNT(*) AS n FROM limit_sets WHERE point_id = ?', [B]);
    markers = {
      alertEvents: [alertRaised, alertAck, alertCleared].map((at) => ({ pointId: A, at })),
      alertPeaks: [{ pointId: A, at: alertPeak }],
      findings: [{ pointId: A, at: findingAt }],
      limitChanges: [
        { pointId: A, at: limitUpdate },
        { pointId: A, at: limitBaseline },
        ...(Number(bSet!.n) ? [{ pointId: B, at: limitSetB }] : []),
      ],
    };
  });

  it('keeps exactly the captures the policy keeps, in batches of any size', async () => {
    const expected = keptSpectra(captures, markers, POLICY, NOW.getTime());
    // The reference itself on a few of the awkward instants.
    const on = (iso: string) => captures.filter((c) => c.takenAt === t(iso) && c.pointId === A);
    const [tieLow, tieHigh] = on('2026-08-10T10:00:00.000Z').sort((a, b) => a.id - b.id);
    expect(expected.has(tieLow!.id)).toBe(true);
    expect(expected.has(on('2026-09-17T12:00:00.000Z')[0]!.id)).toBe(true);
    expect(expected.has(on('2026-06-30T00:00:00.000Z')[0]!.id)).toBe(true);
    expect(expected.has(on('2026-06-30T00:00:00.001Z')[0]!.id)).toBe(false);
    expect(expected.size).toBeGreaterThan(captures.length / 5);
    expect(expected.size).toBeLessThan((captures.length * 4) / 5);
    expect(expected.has(tieHigh!.id)).toBe(false);

    const pass = await thinAtNow(srv, { batchSize: 7, scanSpan: 40 });
    expect(pass.rows).toBe(captures.length - expected.size);
    const rows = (await srv.q(
      `SELECT id, spectra IS NOT NULL AS whole, spectra_thinned_at FROM analyses
        WHERE point_id IN (?, ?)`,
      [A, B],
    )) as { id: number; whole: number; spectra_thinned_at: Date | null }[];
    const kept = rows.filter((r) => Number(r.whole) === 1).map((r) => Number(r.id));
    const wrong = (ids: Iterable<number>) =>
      [...ids].map((id) => {
        const c = captures.find((x) => x.id === id)!;
        return `${c.pointId === A ? 'A' : 'B'} ${new Date(c.takenAt).toISOString()} #${id}`;
      });
    expect(wrong(kept.filter((id) => !expected.has(id)))).toEqual([]);
    expect(wrong([...expected].filter((id) => !kept.includes(id)))).toEqual([]);
    for (const r of rows) expect(r.spectra_thinned_at === null).toBe(expected.has(Number(r.id)));
    // Thinned captures lost their waveforms too.
    const snaps = await samplesHeld();
    for (const s of snaps) {
      expect([s.id, Number(s.has)]).toEqual([s.id, expected.has(Number(s.id)) ? 1 : 0]);
      samplesLeft.set(Number(s.id), Number(s.has) === 1);
    }
  });

  it('a second pass, in one large batch, finds nothing left to thin', async () => {
    const again = await thinAtNow(srv, { batchSize: 10_000 });
    expect(again).toEqual({ rows: 0, batches: 0 });
  });

  it('raw-waveform expiry keeps the protected captures and the young ones', async () => {
    const days = 20;
    await expireAtNow(srv, days, {
      batchSize: 5,
      scanSpan: 30,
      keepWindowMinutes: 60,
    });
    const shielded = protectedIds(captures, markers, 60);
    const young = NOW.getTime() - days * DAY;
    const snaps = await samplesHeld();
    let spared = 0;
    for (const s of snaps) {
      const c = captures.find((x) => x.id === Number(s.id))!;
      const want = samplesLeft.get(c.id)! && (shielded.has(c.id) || c.takenAt >= young);
      if (want && c.takenAt < young) spared++;
      expect([c.id, Number(s.has)]).toEqual([c.id, want ? 1 : 0]);
    }
    expect(spared).toBeGreaterThan(5);
  });
});
