/**
 * Tiered retention of spectra and the raw-sample expiry it spares, on a real MariaDB with
 * captures stored by the real ingest and worker (taken at chosen past times).
 *
 * The tiers are the policy's defaults, which are common practice, no source: every spectrum
 * for 14 days, then the first capture per point per UTC hour until 90 days (moved back to
 * a UTC midnight), then the first per UTC day. The expectations below follow from that
 * definition, capture by capture.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { NOW, retentionServerForFile } from '../support/analysed-captures.ts';

const retention = retentionServerForFile();
const srv = retention.srv;
const TAG = 'MFP-P102-MDE-H';

describe('tiered thinning', () => {
  const T = {
    // whole tier (younger than 14 days)
    w1: '2026-09-29T10:05:00.000Z',
    w2: '2026-09-29T10:15:00.000Z',
    // hourly tier
    h1: '2026-09-01T10:05:00.000Z',
    h2: '2026-09-01T10:35:00.000Z',
    h3: '2026-09-01T10:55:00.000Z',
    h4: '2026-09-01T11:05:00.000Z',
    // hourly tier, finding created at 09:35 (±60 min keeps 08:40, not 08:20)
    f0: '2026-09-02T08:00:00.000Z',
    f1: '2026-09-02T08:20:00.000Z',
    f2: '2026-09-02T08:40:00.000Z',
    // NOW − 90 d is 07-03 12:00, moved back to 07-03 00:00: both are first of their hour in
    // the hourly tier (without the move, b2 would be the second of its day in the daily tier)
    b1: '2026-07-03T06:00:00.000Z',
    b2: '2026-07-03T07:20:00.000Z',
    // daily tier; upload at 12:00, alert event at 15:30
    d1: '2026-05-10T03:00:00.000Z',
    d2: '2026-05-10T09:00:00.000Z',
    up: '2026-05-10T12:00:00.000Z',
    al: '2026-05-10T15:00:00.000Z',
    d3: '2026-05-10T17:00:00.000Z',
    d4: '2026-05-10T21:00:00.000Z',
    // daily tier; a suspect quality notice on 05:00, an unusable one on 06:00
    e1: '2026-05-11T00:30:00.000Z',
    qn: '2026-05-11T05:00:00.000Z',
    e2: '2026-05-11T06:00:00.000Z',
    // daily tier; limits changed at 06:00
    l1: '2026-05-12T01:00:00.000Z',
    l2: '2026-05-12T07:00:00.000Z',
    l3: '2026-05-12T08:00:00.000Z',
    // daily tier; the second of its day is pinned by a person
    p1: '2026-05-13T01:00:00.000Z',
    pn: '2026-05-13T09:00:00.000Z',
  } as const;
  type Label = keyof typeof T;
  const keep: Label[] = ['w1', 'w2', 'h1', 'h4', 'f0', 'f2', 'b1', 'b2', 'd1', 'up', 'al', 'e1'];
  keep.push('qn', 'l1', 'l2', 'p1', 'pn');
  const thin: Label[] = ['h2', 'h3', 'f1', 'd2', 'd3', 'd4', 'e2', 'l3'];
  let ids: Map<string, number>;
  let pointId: number;
  const id = (l: Label) => ids.get(T[l])!;
  let before: Map<number, { v: number; bands: number }>;
  /** 1 when the capture still holds its raw waveform, else 0. */
  const hasSamples = async (l: Label) =>
    Number(
      (
        await srv.q(
          'SELECT s.samples IS NOT NULL AS has FROM snapshots s JOIN analyses a ON a.snapshot_id = s.id WHERE a.id = ?',
          [id(l)],
        )
      )[0]!.has,
    );

  beforeAll(async () => {
    pointId = await retention.pointId(TAG);
    ids = await retention.captures(TAG, Object.values(T));
    const [snap] = await srv.q('SELECT snapshot_id FROM analyses WHERE id = ?', [id('up')]);
    await srv.q("UPDATE snapshots SET source = 'upload', gateway_id = NULL WHERE id = ?", [
      snap!.snapshot_id,
    ]);
    const [user] = await srv.q("SELECT id FROM users WHERE email = 'admin@turnstone.local'");
    const [alert] = (await srv.ctx.dbHandle.pool.query(
      `INSERT INTO alerts (point_id, band_key, band_name, level, state, unit, limit_value,
         first_value, last_value, peak_value, first_at, last_at, peak_at)
       VALUES (?, 'overall-velocity', 'Overall velocity', 'alert', 'cleared', 'mm/s', 4.5,
         5, 5, 5, ?, ?, ?)`,
      [pointId, new Date(T.al), new Date(T.al), new Date(T.al)],
    )) as unknown as [{ insertId: number }];
    await srv.q(
      "INSERT INTO alert_events (alert_id, kind, level, value, at) VALUES (?, 'raised', 'alert', 5, ?)",
      [alert.insertId, new Date('2026-05-10T15:30:00.000Z')],
    );
    await srv.q(
      'INSERT INTO findings (point_id, title, created_by, created_at) VALUES (?, ?, ?, ?)',
      [pointId, 'Check coupling', user!.id, new Date('2026-09-02T09:35:00.000Z')],
    );
    await srv.q(
      "INSERT INTO quality_notices (point_id, analysis_id, verdict, findings, taken_at) VALUES (?, ?, 'suspect', '[]', ?)",
      [pointId, id('qn'), new Date(T.qn)],
    );
    // An unusable capture's notice does not keep it (a dead sensor would keep a year whole).
    await srv.q(
      "INSERT INTO quality_notices (point_id, analysis_id, verdict, findings, taken_at) VALUES (?, ?, 'unusable', '[]', ?)",
      [pointId, id('e2'), new Date(T.e2)],
    );
    await srv.q(
      "INSERT INTO audit_log (action, entity, entity_id, at) VALUES ('limits.update', 'point', ?, ?)",
      [String(pointId), new Date('2026-05-12T06:00:00.000Z')],
    );
    // A row written before the compact column: its float32 column goes too.
    await srv.q('UPDATE analyses SET spectra = NULL, accel_spectrum = ? WHERE id = ?', [
      Buffer.alloc(16),
      id('d4'),
    ]);
    const engineer = await srv.signIn('engineer');
    const pin = await srv.call('PUT', `/api/v1/analyses/${id('pn')}/pin`, {
      cookie: engineer,
      body: { note: 'Reference capture before the bearing change' },
    });
    expect(pin.status).toBe(200);
    expect((await pin.json()).note).toBe('Reference capture before the bearing change');
    before = new Map();
    for (const l of [...keep, ...thin]) {
      const [a] = await srv.q(
        `SELECT a.velocity_rms_mm_s AS v, (SELECT COUNT(*) FROM band_values b WHERE b.analysis_id = a.id) AS bands
           FROM analyses a WHERE a.id = ?`,
        [id(l)],
      );
      before.set(id(l), { v: Number(a!.v), bands: Number(a!.bands) });
    }
    const pass = await retention.thin({ batchSize: 3 });
    expect(pass.rows).toBe(thin.length);
  });

  it('keeps exactly the tier keepers and the protected captures whole', async () => {
    const kept = [];
    for (const l of [...keep, ...thin]) if (await retention.spectraWhole(id(l))) kept.push(l);
    expect(kept.sort()).toEqual([...keep].sort());
    for (const l of thin) {
      const [r] = await srv.q(
        `SELECT spectra, accel_spectrum, velocity_spectrum, envelope_spectrum, order_spectrum,
                spectra_thinned_at FROM analyses WHERE id = ?`,
        [id(l)],
      );
      expect(r).toMatchObject({
        spectra: null,
        accel_spectrum: null,
        velocity_spectrum: null,
        envelope_spectrum: null,
        order_spectrum: null,
      });
      expect((r!.spectra_thinned_at as Date).getTime()).toBe(NOW.getTime());
    }
  });

  it('drops the raw waveform of thinned captures and keeps that of whole ones', async () => {
    for (const l of thin) expect([l, await hasSamples(l)]).toEqual([l, 0]);
    for (const l of keep) expect([l, await hasSamples(l)]).toEqual([l, 1]);
    const res = await srv.call('GET', `/api/v1/analyses/${id('h3')}/waveform`, {
      cookie: srv.cookies.admin,
    });
    expect(res.status).toBeGreaterThanOrEqual(400);
  });

  it('raw-waveform expiry spares the captures kept whole (pinned, uploads, alert and finding windows, limit changes, suspect)', async () => {
    // 20 days: every capture here except w1/w2 is older (received time set to taken time).
    await srv.q(
      'UPDATE snapshots s JOIN analyses a ON a.snapshot_id = s.id SET s.received_at = a.taken_at WHERE a.point_id = ?',
      [pointId],
    );
    await retention.expire(20, { batchSize: 4, keepWindowMinutes: 60 });
    const spared: Label[] = ['w1', 'w2', 'f2', 'up', 'al', 'qn', 'l2', 'pn'];
    const expired: Label[] = ['h1', 'h4', 'f0', 'b1', 'b2', 'd1', 'e1', 'l1', 'p1'];
    for (const l of spared) expect([l, await hasSamples(l)]).toEqual([l, 1]);
    for (const l of expired) expect([l, await hasSamples(l)]).toEqual([l, 0]);
  });

  it('lists who pinned a capture; unpinning is audited and a second unpin is 404', async () => {
    const engineer = await srv.signIn('engineer');
    const list = await srv.call('GET', `/api/v1/points/${pointId}/analyses?limit=200`, {
      cookie: engineer,
    });
    const items = (await list.json()).items as { id: number; pinned: { note: string } | null }[];
    expect(items.find((i) => i.id === id('pn'))!.pinned!.note).toBe(
      'Reference capture before the bearing change',
    );
    expect(items.find((i) => i.id === id('p1'))!.pinned).toBeNull();
    const operator = await srv.signIn('operator');
    const denied = await srv.call('DELETE', `/api/v1/analyses/${id('pn')}/pin`, {
      cookie: operator,
    });
    expect(denied.status).toBe(403);
    const bad = await srv.call('PUT', `/api/v1/analyses/${id('p1')}/pin`, {
      cookie: engineer,
      body: { note: 'x'.repeat(201) },
    });
    expect(bad.status).toBe(400);
    const un = await srv.call('DELETE', `/api/v1/analyses/${id('pn')}/pin`, { cookie: engineer });
    expect(un.status).toBe(204);
    const again = await srv.call('DELETE', `/api/v1/analyses/${id('pn')}/pin`, {
      cookie: engineer,
    });
    expect(again.status).toBe(404);
    const audit = await srv.q(
      "SELECT action FROM audit_log WHERE action IN ('capture.pin', 'capture.unpin') ORDER BY id",
    );
    expect(audit.map((a) => a.action)).toEqual(['capture.pin', 'capture.unpin']);
  });

  it('keeps the scalars, band values, summary and diagnosis of thinned captures', async () => {
    for (const l of thin) {
      const [a] = await srv.q(
        `SELECT a.velocity_rms_mm_s AS v, a.summary IS NOT NULL AS s,
                (SELECT COUNT(*) FROM band_values b WHERE b.analysis_id = a.id) AS bands
           FROM analyses a WHERE a.id = ?`,
        [id(l)],
      );
      const b = before.get(id(l))!;
      expect(Number(a!.v)).toBe(b.v);
      expect(Number(a!.bands)).toBe(b.bands);
      expect(b.bands).toBeGreaterThan(0);
      expect(Number(a!.s)).toBe(1);
    }
  });

  it('the spectrum of a thinned capture answers 410 naming the nearest whole capture', async () => {
    const res = await srv.call('GET', `/api/v1/analyses/${id('h3')}/spectrum?kind=velocity`, {
      cookie: srv.cookies.admin,
    });
    expect(res.status).toBe(410);
    const body = await res.json();
    expect(body.error.code).toBe('spectrum_thinned');
    expect(body.error.message).toMatch(/retention/);
    // h3 (10:55): h1 is 50 min before, h4 10 min after.
    expect(body.error.details.nearest).toEqual({ analysisId: id('h4'), takenAt: T.h4 });
    const ok = await srv.call('GET', `/api/v1/analyses/${id('h4')}/spectrum?kind=velocity`, {
      cookie: srv.cookies.admin,
    });
    expect(ok.status).toBe(200);
  });

  it('the analyses list marks which captures had their spectra thinned', async () => {
    const res = await srv.call('GET', `/api/v1/points/${pointId}/analyses?limit=200`, {
      cookie: srv.cookies.admin,
    });
    expect(res.status).toBe(200);
    const flags = new Map(
      (await res.json()).items.map((i: { id: number; spectraThinned: boolean }) => [
        i.id,
        i.spectraThinned,
      ]),
    );
    for (const l of thin) expect(flags.get(id(l))).toBe(true);
    for (const l of keep) expect(flags.get(id(l))).toBe(false);
  });

  it('the waterfall skips thinned captures', async () => {
    const res = await srv.call('GET', `/api/v1/points/${pointId}/waterfall?limit=50`, {
      cookie: srv.cookies.admin,
    });
    expect(res.status).toBe(200);
    const shown = new Set(
      (await res.json()).items.map((i: { analysisId: number }) => i.analysisId),
    );
    for (const l of thin) expect(shown.has(id(l))).toBe(false);
    for (const l of ['w1', 'h1', 'd1'] as Label[]) expect(shown.has(id(l))).toBe(true);
  });
});
