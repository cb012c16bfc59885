/**
 * The weekly review and findings against the real server and MariaDB. The data is made
 * here: captures ingested through the gateway API at chosen takenAt times, analysed by the
 * real worker (`createWorker(ctx).drain()`).
 *
 * Scenario (site MFP, UTC):
 * - MFP-P102-MDE-H (pump, 1480 r/min, ISO 20816-3 group 2 rigid): one capture a day at
 *   12:00 from 2026-11-02 (day 0) to 2026-11-15 (day 13), a pure 1× tone whose velocity is
 *   v(d) = 1.00 + 0.05·d mm/s RMS. The week reviewed ends 2026-11-15: "this week" is days
 *   7–13, "last week" days 0–6.
 * - MFP-P101-MDE-H: two captures at 3.0 mm/s RMS on days 12 and 13 (persistence 2): the
 *   1× band (alert 0.8 × 2.8 = 2.24 mm/s) and the overall velocity (alert 2.8 mm/s) raise.
 * - MFP-P101-MNDE-H: one clipped capture on day 10: an unusable capture, a quality notice.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { buildWeeklyReview } from '../../apps/server/src/features/review/review-service.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { snapshotBody } from '../support/signals.ts';
import { strFromU8, unzipSync } from 'fflate';
import Papa from 'papaparse';

let srv: TestServer;
let key: string;
let planner: string;
const RISING = 'MFP-P102-MDE-H';
const ALERTING = 'MFP-P101-MDE-H';
const CLIPPED = 'MFP-P101-MNDE-H';
const DAY_MS = 86_400_000;
const DAY0 = Date.parse('2026-11-02T12:00:00Z');
const WEEK_ENDING = '2026-11-15';
const RPM = 1480;
const SHAFT_HZ = RPM / 60;
/** Sensor 1000 mV/g into a 0.5 V ADC: 1 count = 0.5/32768 g, so 1 mm/s at 1× uses ~11 bits. */
const SENSOR = { sensitivityMvPerG: 1000, fullScaleV: 0.5 } as const;

/** Peak acceleration (g) of a tone of `vRms` mm/s RMS at `hz`: a = v·√2·2πf (sine), ÷ 9806.65 mm/s² per g. */
const peakGOf = (vRms: number, hz: number) => (vRms * Math.SQRT2 * 2 * Math.PI * hz) / 9806.65;
const rising = (day: number) => 1.0 + 0.05 * day;

const q = (sqlText: string, params: unknown[] = []) => srv.q(sqlText, params);
async function ingest(tag: string, uid: string, day: number, peakG: number) {
  const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
    body: snapshotBody(tag, uid, {
      takenAt: new Date(DAY0 + day * DAY_MS).toISOString(),
      tones: [{ hz: SHAFT_HZ, peakG }],
      noiseG: 0.0002,
      speedRpm: RPM,
      seed: day + 1,
      ...SENSOR,
    }),
    headers: { authorization: `Bearer ${key}` },
  });
  expect(res.status).toBe(201);
}
async function pointId(tag: string) {
  const [p] = await q('SELECT id FROM points WHERE tag = ?', [tag]);
  return Number(p!.id);
}

beforeAll(async () => {
  srv = await startTestServer();
  key = await srv.gatewayKey();
  for (let d = 0; d <= 13; d++) await ingest(RISING, `rise-${d}`, d, peakGOf(rising(d), SHAFT_HZ));
  for (const d of [12, 13]) await ingest(ALERTING, `alert-${d}`, d, peakGOf(3.0, SHAFT_HZ));
  await ingest(CLIPPED, 'clip-10', 10, 0.8); // 0.8 g peak into a 0.5 g range: clipped
  expect(await createWorker(srv.ctx).drain()).toBe(17);
  planner = await srv.signIn('planner');
}, 120_000);
afterAll(async () => {
  await srv?.stop();
});

async function review(query = '', cookie = planner) {
  const res = await srv.call('GET', `/api/v1/review?weekEnding=${WEEK_ENDING}${query}`, { cookie });
  expect(res.status).toBe(200);
  return res.json();
}

describe('weekly review', () => {
  it('lists the rising 1× band as a mover with this week against last week, +30.4 %', async () => {
    const body = await review();
    const m = body.movers.find(
      (r: { pointTag: string; bandKey: string }) =>
        r.pointTag === RISING && r.bandKey === 'order-1x',
    );
    expect(m).toBeDefined();
    // By hand: last week mean of v(0..6) = 1 + 0.05·3 = 1.15 mm/s, this week v(7..13) = 1 +
    // 0.05·10 = 1.50 mm/s; change 0.35 mm/s = +30.43 %. The band value is proportional to
    // the tone's amplitude, so the percentage holds whatever the band's scale.
    expect(m.changePercent).toBeCloseTo(30.43, 0);
    expect(m.lastWeekCount).toBe(7);
    expect(m.thisWeekCount).toBe(7);
    expect(m.unit).toBe('mm/s');
    // Absolute values: v = a/(2πf) (calculus of a sinusoid, textbook), within 5 % for band RMS leakage.
    expect(m.lastWeekMean).toBeGreaterThan(1.15 * 0.95);
    expect(m.lastWeekMean).toBeLessThan(1.15 * 1.05);
    // The means are those of the stored trend values (the same rows the point view reads).
    const stored = await q(
      `SELECT AVG(CASE WHEN taken_at >= '2026-11-09' THEN value END) AS now_mean,
              AVG(CASE WHEN taken_at < '2026-11-09' THEN value END) AS before_mean
         FROM band_values WHERE point_id = ? AND band_key = 'order-1x'`,
      [await pointId(RISING)],
    );
    expect(m.thisWeekMean).toBeCloseTo(Number(stored[0]!.now_mean), 9);
    expect(m.lastWeekMean).toBeCloseTo(Number(stored[0]!.before_mean), 9);
    expect(m.change).toBeCloseTo(m.thisWeekMean - m.lastWeekMean, 12);
    // Sorted by percentage rise, largest first.
    const pcts = body.movers.map((r: { changePercent: number }) => r.changePercent);
    expect([...pcts].sort((a, b) => b - a)).toEqual(pcts);
    // The 2× band reads only the noise floor of a pure 1× tone (≈ 0.001 mm/s against its alert
    // level 0.5 × 2.8 = 1.4 mm/s): below 10 % of the alert level a rise is not listed.
    expect(
      body.movers.some(
        (r: { pointTag: string; bandKey: string }) =>
          r.pointTag === RISING && r.bandKey === 'order-2x',
      ),
    ).toBe(false);
    // The alerting point has values in this week only: not a mover.
    expect(body.movers.some((r: { pointTag: string }) => r.pointTag === ALERTING)).toBe(false);
  });

  it('projects the steadily rising 1× band to its alert level on the date a hand-made line fit gives', async () => {
    const body = await review('&weeksAhead=4');
    const f = body.forecasts.find(
      (r: { pointTag: string; bandKey: string }) =>
        r.pointTag === RISING && r.bandKey === 'order-1x',
    );
    expect(f).toBeDefined();
    expect(f.target).toEqual({ level: 'alert', value: 2.24 }); // 0.8 × ISO B/C 2.8 mm/s
    expect(f.levelSource).toBe('fixed');
    expect(f.model).toBe('linear');
    expect(f.points).toBe(14);
    // The hand-made least-squares line through the stored values (x in days from the first):
    // slope = Sxy/Sxx, intercept = ȳ − slope·x̄ (Montgomery & Runger ch. 11), crossing where
    // intercept + slope·x = 2.24 (the condition package's documented rule).
    const rows = await q(
      `SELECT taken_at, value FROM band_values WHERE point_id = ? AND band_key = 'order-1x' ORDER BY taken_at`,
      [await pointId(RISING)],
    );
    const xs = rows.map((r) => ((r.taken_at as Date).getTime() - DAY0) / DAY_MS);
    const ys = rows.map((r) => Number(r.value));
    const mx = xs.reduce((a, b) => a + b, 0) / xs.length;
    const my = ys.reduce((a, b) => a + b, 0) / ys.length;
    let sxx = 0;
    let sxy = 0;
    xs.forEach((x, i) => {
      sxx += (x - mx) ** 2;
      sxy += (x - mx) * (ys[i]! - my);
    });
    const slope = sxy / sxx;
    const intercept = my - slope * mx;
    const crossing = DAY0 + ((2.24 - intercept) / slope) * DAY_MS;
    expect(Math.abs(Date.parse(f.crossingAt) - crossing)).toBeLessThan(60_000);
    // And the physics: v(d) = 1 + 0.05·d reaches 2.24 at d = 24.8, 2026-11-27T07:12Z; the band
    // reads the tone within a few per cent, so within two days of that.
    expect(Math.abs(Date.parse(f.crossingAt) - Date.parse('2026-11-27T07:12:00Z'))).toBeLessThan(
      2 * DAY_MS,
    );
    expect(f.r2).toBeGreaterThan(0.99);
    expect(f.daysToCrossing).toBe(
      Math.round((Date.parse(f.crossingAt) - Date.parse('2026-11-16')) / DAY_MS),
    );
  });

  it('with a horizon of 2 weeks keeps the 1× crossing (~12 days) and drops the overall one (~23 days)', async () => {
    // Overall velocity ≈ the 1× tone: reaches 2.8 mm/s at d = 36, 23 days after day 13.
    const four = await review('&weeksAhead=4');
    const two = await review('&weeksAhead=2');
    const has = (b: { forecasts: { pointTag: string; bandKey: string }[] }, band: string) =>
      b.forecasts.some((r) => r.pointTag === RISING && r.bandKey === band);
    expect(has(four, 'overall-velocity')).toBe(true);
    expect(has(two, 'overall-velocity')).toBe(false);
    expect(has(two, 'order-1x')).toBe(true);
    expect(two.period.weeksAhead).toBe(2);
  });

  it('lists the open alerts oldest first with their age in days, and the week’s quality notice', async () => {
    const body = await review();
    const mine = body.openAlerts.filter((a: { pointTag: string }) => a.pointTag === ALERTING);
    expect(mine.map((a: { bandKey: string }) => a.bandKey).sort()).toEqual([
      'order-1x',
      'overall-velocity',
    ]);
    for (const a of mine) {
      expect(a.state).toBe('raised');
      expect(a.level).toBe('alert');
      // Raised by the second capture (persistence 2), day 13 at 12:00.
      expect(a.firstAt).toBe('2026-11-15T12:00:00.000Z');
      expect(a.ageDays).toBe(Math.floor((Date.now() - Date.parse(a.firstAt)) / DAY_MS));
    }
    expect(body.summary.openAlerts).toBe(2);
    expect(body.summary.unacknowledged).toBe(2);
    const notice = body.qualityNotices.find((n: { pointTag: string }) => n.pointTag === CLIPPED);
    expect(notice).toBeDefined();
    expect(notice.verdict).toBe('unusable');
    expect(notice.findings.some((f: { code: string }) => f.code === 'clipped')).toBe(true);
    expect(body.summary.qualityNotices).toBe(1);
    // A week later the notice is no longer "of the week".
    const later = await srv.call('GET', '/api/v1/review?weekEnding=2026-11-22', {
      cookie: planner,
    });
    expect((await later.json()).qualityNotices).toEqual([]);
  });

  it('answers 403 to the operator (JSON and ZIP); the engineer may read it', async () => {
    const operator = await srv.signIn('operator');
    const res = await srv.call('GET', `/api/v1/review?weekEnding=${WEEK_ENDING}`, {
      cookie: operator,
    });
    expect(res.status).toBe(403);
    const csv = await srv.call('GET', `/api/v1/review.zip?weekEnding=${WEEK_ENDING}`, {
      cookie: operator,
    });
    expect(csv.status).toBe(403);
    const engineer = await srv.signIn('engineer');
    expect((await srv.call('GET', '/api/v1/review', { cookie: engineer })).status).toBe(200);
  });

  it('rejects a malformed week with 400 and the field named', async () => {
    const res = await srv.call('GET', '/api/v1/review?weekEnding=15-11-2026', { cookie: planner });
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.code).toBe('validation_failed');
    expect(JSON.stringify(body.error.details)).toContain('weekEnding');
  });

  it('exports one CSV file per table in a ZIP, each with one plain header row', async () => {
    const res = await srv.call('GET', `/api/v1/review.zip?weekEnding=${WEEK_ENDING}&siteId=1`, {
      cookie: planner,
    });
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toContain('application/zip');
    expect(res.headers.get('content-disposition')).toBe(
      'attachment; filename="turnstone-review-MFP-2026-11-15.zip"',
    );
    const files = unzipSync(new Uint8Array(await res.arrayBuffer()));
    expect(Object.keys(files).sort()).toEqual([
      'findings-created-this-week.csv',
      'findings-due.csv',
      'forecasts.csv',
      'open-alerts.csv',
      'quality-notices.csv',
      'rising-bands.csv',
      'summary.csv',
    ]);
    const table = (name: string) =>
      Papa.parse<Record<string, string>>(strFromU8(files[name]!).replace(/^\uFEFF/, ''), {
        header: true,
        skipEmptyLines: true,
      });
    const rising = table('rising-bands.csv');
    expect(rising.errors).toEqual([]);
    expect(rising.meta.fields).toContain('values this week');
    const row = rising.data.find((r) => r.point === RISING && r.band === '1× running speed');
    expect(row).toBeDefined();
    expect(row!['time zone']).toBe('Europe/London');
    const json = await review('&siteId=1');
    const m = json.movers.find(
      (r: { pointTag: string; bandKey: string }) =>
        r.pointTag === RISING && r.bandKey === 'order-1x',
    );
    expect(Number(row!['change %'])).toBe(Number(m.changePercent.toPrecision(6)));
    const summary = table('summary.csv').data;
    expect(summary.find((r) => r.item === 'noise threshold: minimum rise %')?.value).toBe('5');
    // ISO 8601 instants in the files.
    for (const a of table('open-alerts.csv').data)
      expect(a['first at']).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z$/);
  });

  it('buildWeeklyReview gives the digest the same summary as the screen', async () => {
    const [u] = await q(`SELECT id FROM users WHERE email = 'planner@turnstone.local'`);
    const viaService = await buildWeeklyReview(
      srv.ctx,
      {
        id: Number(u!.id),
        email: 'planner@turnstone.local',
        name: 'Pat Planner',
        role: 'planner',
        siteIds: [1, 2],
        unitSystem: 'metric',
      },
      { weekEnding: WEEK_ENDING, weeksAhead: 4 },
    );
    const viaApi = await review('&weeksAhead=4');
    expect(viaService.summary).toEqual(viaApi.summary);
    expect(viaService.movers.length).toBeGreaterThan(0);
  });
});

describe('findings', () => {
  it('planner creates a finding from a forecast row and moves it to planned with a work order; each step is audited', async () => {
    const pid = await pointId(RISING);
    const created = await srv.call('POST', '/api/v1/findings', {
      cookie: planner,
      body: {
        pointId: pid,
        bandKey: 'order-1x',
        title: 'Check P-102 motor DE: 1× rising',
        workOrderRef: '',
        dueDate: '',
        note: 'Forecast reaches the alert level by late November.',
      },
    });
    expect(created.status).toBe(201);
    const f = await created.json();
    expect(f).toMatchObject({ state: 'open', pointTag: RISING, workOrderRef: null, dueDate: null });
    expect(f.createdBy.name).toBe('Pat Planner');

    // Planned needs a work-order reference.
    const bare = await srv.call('PATCH', `/api/v1/findings/${f.id}`, {
      cookie: planner,
      body: { state: 'planned' },
    });
    expect(bare.status).toBe(400);
    expect((await bare.json()).error.details[0].path).toEqual(['workOrderRef']);

    const planned = await srv.call('PATCH', `/api/v1/findings/${f.id}`, {
      cookie: planner,
      body: { state: 'planned', workOrderRef: 'WO-2026-1187', dueDate: '2026-11-20' },
    });
    expect(planned.status).toBe(200);
    expect(await planned.json()).toMatchObject({
      state: 'planned',
      workOrderRef: 'WO-2026-1187',
      dueDate: '2026-11-20',
    });

    const audit = await q(
      "SELECT action, actor_user_id, `before`, `after` FROM audit_log WHERE entity = 'finding' AND entity_id = ? ORDER BY id",
      [String(f.id)],
    );
    expect(audit.map((a) => a.action)).toEqual(['finding.create', 'finding.planned']);
    const parse = (v: unknown) => (typeof v === 'string' ? JSON.parse(v) : v);
    expect(parse(audit[1]!.before)).toMatchObject({ state: 'open', workOrderRef: null });
    expect(parse(audit[1]!.after)).toMatchObject({
      state: 'planned',
      workOrderRef: 'WO-2026-1187',
    });
    expect(Number(audit[1]!.actor_user_id)).toBe(f.createdBy.id);

    const list = await (
      await srv.call('GET', '/api/v1/findings?state=planned', { cookie: planner })
    ).json();
    expect(list.items.map((i: { id: number }) => i.id)).toContain(f.id);
    // Due 2026-11-20, within the coming week of the review, and before today: overdue.
    const body = await review();
    const due = body.findingsDue.find((d: { id: number }) => d.id === f.id);
    expect(due).toMatchObject({ state: 'planned', overdue: true });

    const done = await srv.call('PATCH', `/api/v1/findings/${f.id}`, {
      cookie: planner,
      body: { state: 'done' },
    });
    expect((await done.json()).state).toBe('done');
    expect((await review()).findingsDue.some((d: { id: number }) => d.id === f.id)).toBe(false);
  });

  it('the operator may read findings of their site but not create one (403)', async () => {
    const operator = await srv.signIn('operator');
    const res = await srv.call('POST', '/api/v1/findings', {
      cookie: operator,
      body: { pointId: await pointId(RISING), title: 'x' },
    });
    expect(res.status).toBe(403);
    const list = await srv.call('GET', '/api/v1/findings', { cookie: operator });
    expect(list.status).toBe(200);
    const trb = await srv.call('GET', '/api/v1/findings?siteId=2', { cookie: operator });
    expect(trb.status).toBe(403);
  });

  it('rejects a finding whose alert belongs to another point, and one without a title', async () => {
    const [a] = await q(`SELECT id FROM alerts LIMIT 1`);
    const res = await srv.call('POST', '/api/v1/findings', {
      cookie: planner,
      body: { pointId: await pointId(RISING), alertId: Number(a!.id), title: 'Wrong alert' },
    });
    expect(res.status).toBe(400);
    const blank = await srv.call('POST', '/api/v1/findings', {
      cookie: planner,
      body: { pointId: await pointId(RISING), title: '   ' },
    });
    expect(blank.status).toBe(400);
    expect(JSON.stringify((await blank.json()).error.details)).toContain('title');
  });
});
