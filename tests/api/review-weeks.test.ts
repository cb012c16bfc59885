/**
 * The weekly review in a site's own time zone, its noise threshold and the review of quality
 * notices, against the real server and MariaDB (captures ingested through the gateway API,
 * analysed by the real worker).
 *
 * Site TRB keeps Europe/Berlin time. The week reviewed ends Sunday 2026-10-25, the day Berlin's
 * clocks go back (CEST → CET): "this week" is 19–25 October local, 169 hours long. Which week
 * each capture falls in is decided by Python's zoneinfo (the IANA tz database) run live.
 */
import { execFileSync } from 'node:child_process';
import { beforeAll, describe, expect, it } from 'vitest';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { testServerForFile } from '../support/api-suite.ts';
import { snapshotBody } from '../support/signals.ts';

const srv = testServerForFile({ signIn: ['planner'], gateway: 2 });
const WEEK_ENDING = '2026-10-25';
const RPM = 1485;
const HZ = RPM / 60;
const SENSOR = { sensitivityMvPerG: 1000, fullScaleV: 0.5 } as const;
/** Peak acceleration (g) of a tone of `vRms` mm/s RMS at `hz` (a = v·√2·2πf; 9806.65 mm/s² per g). */
const peakG = (vRms: number) => (vRms * Math.SQRT2 * 2 * Math.PI * HZ) / 9806.65;

/** Awkward instants at the week's edges (UTC) and ordinary ones inside the weeks. */
const EDGE = [
  '2026-10-11T22:30:00Z', // Mon 12 Oct 00:30 CEST: last week's first local day
  '2026-10-18T21:30:00Z', // Sun 18 Oct 23:30 CEST: last week, though 18 Oct UTC too
  '2026-10-18T22:30:00Z', // Mon 19 Oct 00:30 CEST: this week (UTC still says 18 Oct)
  '2026-10-25T00:30:00Z', // Sun 25 Oct 02:30 CEST, the hour before the clocks go back
  '2026-10-25T01:30:00Z', // Sun 25 Oct 02:30 CET, the repeated hour
  '2026-10-25T22:30:00Z', // Sun 25 Oct 23:30 CET: this week
  '2026-10-25T23:30:00Z', // Mon 26 Oct 00:30 CET: next week (UTC still says 25 Oct)
];
const INSIDE = ['2026-10-14T12:00:00Z', '2026-10-16T12:00:00Z', '2026-10-21T12:00:00Z'];

let rising: string; // TRB-P120 motor DE: 1.0 mm/s until 18 Oct 22:00Z, 2.0 after
let slight: string; // another point: 1.00 then 1.04 mm/s (+4 %, under the 5 % threshold)
let sparse: string; // 1.0 then 2.0 mm/s, only two values this week (under 3 values)

async function ingest(tag: string, uid: string, at: string, vRms: number, extra = {}) {
  const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
    body: snapshotBody(tag, uid, {
      takenAt: at,
      tones: [{ hz: HZ, peakG: peakG(vRms) }],
      noiseG: 0.0002,
      speedRpm: RPM,
      seed: uid.length,
      ...SENSOR,
      ...extra,
    }),
    headers: { authorization: `Bearer ${srv.key}` },
  });
  expect(res.status, await res.clone().text()).toBe(201);
}
const pid = async (tag: string) =>
  Number((await srv.q('SELECT id FROM points WHERE tag = ?', [tag]))[0]!.id);

function python(code: string): string {
  return execFileSync('python3', ['-c', code], { encoding: 'utf8' }).trim();
}

beforeAll(async () => {
  const tags = (
    await srv.q(
      `SELECT p.tag FROM points p JOIN machines m ON m.id = p.machine_id JOIN areas a ON a.id = m.area_id
        WHERE a.site_id = 2 AND m.nominal_rpm = ? ORDER BY p.id`,
      [RPM],
    )
  ).map((r) => String(r.tag));
  expect(tags.length).toBeGreaterThanOrEqual(3);
  [rising, slight, sparse] = tags as [string, string, string];
  const boundary = Date.parse('2026-10-18T22:00:00Z'); // Mon 19 Oct 00:00 CEST
  let n = 0;
  for (const at of [...EDGE, ...INSIDE]) {
    const later = Date.parse(at) >= boundary;
    await ingest(rising, `r-${n++}`, at, later ? 2.0 : 1.0);
    await ingest(slight, `s-${n++}`, at, later ? 1.04 : 1.0);
  }
  for (const at of ['2026-10-13T12:00:00Z', '2026-10-14T12:00:00Z', '2026-10-15T12:00:00Z'])
    await ingest(sparse, `p-${n++}`, at, 1.0);
  for (const at of ['2026-10-21T12:00:00Z', '2026-10-22T12:00:00Z'])
    await ingest(sparse, `p-${n++}`, at, 2.0);
  await createWorker(srv.ctx).drain();
}, 180_000);

async function review(query = '') {
  const res = await srv.call('GET', `/api/v1/review?weekEnding=${WEEK_ENDING}&siteId=2${query}`, {
    cookie: srv.cookies.planner,
  });
  expect(res.status).toBe(200);
  return res.json();
}
const moverOf = (body: { movers: { pointTag: string; bandKey: string }[] }, tag: string) =>
  body.movers.find((m) => m.pointTag === tag && m.bandKey === 'order-1x') as
    Record<string, number> | undefined;

describe('weeks in the site’s time zone', () => {
  it('the week runs from local midnight to local midnight across the clock change (zoneinfo, run live)', async () => {
    const body = await review();
    const [from, to, lastFrom] = python(`
from datetime import datetime, timezone
from zoneinfo import ZoneInfo
z = ZoneInfo('Europe/Berlin')
f = lambda *a: datetime(*a, tzinfo=z).astimezone(timezone.utc).strftime('%Y-%m-%dT%H:%M:%S.000Z')
print(f(2026,10,19), f(2026,10,26), f(2026,10,12))`).split(' ');
    expect(body.siteWeeks).toEqual([
      {
        siteId: 2,
        siteCode: 'TRB',
        timeZone: 'Europe/Berlin',
        thisWeek: { from, to },
        lastWeek: { from: lastFrom, to: from },
      },
    ]);
    expect(body.period.timeZone).toBe('Europe/Berlin');
    expect(Date.parse(to!) - Date.parse(from!)).toBe(169 * 3_600_000); // the 25-hour Sunday
  });

  it('counts each capture in the week of its local day, and the means are those of its stored values', async () => {
    const body = await review('&minChangePercent=0&minValues=1');
    const m = moverOf(body, rising);
    expect(m).toBeDefined();
    // The local date of every capture, by zoneinfo: which week it belongs to.
    const all = [...EDGE, ...INSIDE];
    const days = python(`
from datetime import datetime
from zoneinfo import ZoneInfo
for t in ${JSON.stringify(all)}:
    print(datetime.fromisoformat(t.replace('Z', '+00:00')).astimezone(ZoneInfo('Europe/Berlin')).date())`).split(
      '\n',
    );
    const week = (d: string) =>
      d >= '2026-10-19' && d <= '2026-10-25'
        ? 'this'
        : d >= '2026-10-12' && d <= '2026-10-18'
          ? 'last'
          : null;
    const rows = await srv.q(
      `SELECT taken_at, value FROM band_values WHERE point_id = ? AND band_key = 'order-1x'`,
      [await pid(rising)],
    );
    const valueAt = new Map(rows.map((r) => [(r.taken_at as Date).toISOString(), Number(r.value)]));
    const pick = (w: string) =>
      all
        .filter((_, i) => week(days[i]!) === w)
        .map((t) => valueAt.get(new Date(t).toISOString())!);
    const thisWeek = pick('this');
    const lastWeek = pick('last');
    expect(thisWeek.length).toBe(5); // 19 Oct 00:30, both 02:30s, 25 Oct 23:30, 21 Oct
    expect(lastWeek.length).toBe(4);
    expect(m!.thisWeekCount).toBe(thisWeek.length);
    expect(m!.lastWeekCount).toBe(lastWeek.length);
    const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
    expect(m!.thisWeekMean).toBeCloseTo(mean(thisWeek), 9);
    expect(m!.lastWeekMean).toBeCloseTo(mean(lastWeek), 9);
    // The tone doubled at local midnight, so the rise is +100 % within band leakage (by hand).
    expect(m!.changePercent).toBeGreaterThan(95);
    expect(m!.changePercent).toBeLessThan(105);
  });
});

describe('noise threshold', () => {
  it('states the threshold and lists a rise only above its size and number of values', async () => {
    const body = await review();
    expect(body.noise).toEqual({ minChangePercent: 5, minValues: 3 });
    expect(moverOf(body, rising)).toBeDefined();
    // +4 % (1.00 → 1.04 mm/s by construction) is under 5 %; two values this week are under 3.
    expect(moverOf(body, slight)).toBeUndefined();
    expect(moverOf(body, sparse)).toBeUndefined();
    expect(body.summary.moversBelowThreshold).toBeGreaterThanOrEqual(2);
    for (const m of body.movers) {
      expect(m.changePercent === null || m.changePercent >= 5).toBe(true);
      expect(Math.min(m.thisWeekCount, m.lastWeekCount)).toBeGreaterThanOrEqual(3);
    }

    // The slight rise's own percentage, from the listing with no threshold: the boundary
    // is inclusive (≥), a tenth of a per cent more leaves it out.
    const open = moverOf(await review('&minChangePercent=0&minValues=1'), slight)!;
    expect(open.changePercent).toBeGreaterThan(3);
    expect(open.changePercent).toBeLessThan(5);
    const at = Math.floor(open.changePercent! * 100) / 100;
    expect(moverOf(await review(`&minChangePercent=${at}`), slight)).toBeDefined();
    expect(moverOf(await review(`&minChangePercent=${at + 0.1}`), slight)).toBeUndefined();
    // Two values this week: listed from minValues=2, not at 3.
    expect(moverOf(await review('&minValues=2'), sparse)?.thisWeekCount).toBe(2);
  });

  it('groups rises by machine, most critical machine first, worst band first within it', async () => {
    const body = await review('&minChangePercent=0&minValues=1');
    const rank = { high: 0, medium: 1, low: 2 } as const;
    const groups = body.machineGroups as {
      machineId: number;
      criticality: keyof typeof rank;
      worstChangePercent: number;
      movers: number;
    }[];
    expect(groups.length).toBeGreaterThan(0);
    for (let i = 1; i < groups.length; i++) {
      const a = groups[i - 1]!;
      const b = groups[i]!;
      expect(
        rank[a.criticality] < rank[b.criticality] ||
          (rank[a.criticality] === rank[b.criticality] &&
            a.worstChangePercent >= b.worstChangePercent),
      ).toBe(true);
    }
    // Movers follow the groups, each machine's rows together, worst first.
    const order = body.movers.map((m: { machineId: number }) => m.machineId);
    expect([...new Set(order)]).toEqual(groups.map((g) => g.machineId));
    for (const g of groups) {
      const rows = body.movers.filter((m: { machineId: number }) => m.machineId === g.machineId);
      expect(rows.length).toBe(g.movers);
      expect(rows[0].changePercent).toBe(g.worstChangePercent);
    }
  });
});

describe('quality notices reviewed, and the Data quality status', () => {
  const clip = { sensitivityMvPerG: 1000, fullScaleV: 0.5 }; // 0.8 g peak into 0.5 g: clipped
  async function statusOf(tag: string) {
    const [row] = await srv.q('SELECT machine_id FROM points WHERE tag = ?', [tag]);
    const res = await srv.call('GET', `/api/v1/machines/${row!.machine_id}`, {
      cookie: srv.cookies.planner,
    });
    const body = await res.json();
    return body.points.find((p: { tag: string }) => p.tag === tag).status as string;
  }
  async function clipped(tag: string, uid: string, at: number) {
    const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
      body: snapshotBody(tag, uid, {
        takenAt: new Date(at).toISOString(),
        tones: [{ hz: HZ, peakG: 0.8 }],
        speedRpm: RPM,
        ...clip,
      }),
      headers: { authorization: `Bearer ${srv.key}` },
    });
    expect(res.status).toBe(201);
  }

  it('clears when the notices are reviewed (by whom, when), or when the captures recover', async () => {
    const now = Date.now();
    const tags = (
      await srv.q(
        `SELECT p.tag FROM points p JOIN machines m ON m.id = p.machine_id JOIN areas a ON a.id = m.area_id
          WHERE a.site_id = 2 AND p.tag NOT IN (?, ?, ?) ORDER BY p.id LIMIT 2`,
        [rising, slight, sparse],
      )
    ).map((r) => String(r.tag));
    const [reviewed, recovered] = tags as [string, string];
    await clipped(reviewed, 'q-1', now - 3 * 3_600_000);
    await clipped(recovered, 'q-2', now - 3 * 3_600_000);
    await createWorker(srv.ctx).drain();
    expect(await statusOf(reviewed)).toBe('quality');
    expect(await statusOf(recovered)).toBe('quality');

    // A good capture afterwards: the captures recovered, the notice still unreviewed.
    await ingest(recovered, 'q-3', new Date(now - 2 * 3_600_000).toISOString(), 1.0);
    await createWorker(srv.ctx).drain();
    expect(await statusOf(recovered)).toBe('ok');
    const [open] = await srv.q(
      'SELECT COUNT(*) AS n FROM quality_notices WHERE point_id = ? AND reviewed_at IS NULL',
      [await pid(recovered)],
    );
    expect(Number(open!.n)).toBe(1);

    // The operator may not review; the planner may.
    const operator = await srv.signIn('operator');
    const denied = await srv.call('POST', '/api/v1/quality-notices/review', {
      cookie: operator,
      body: { pointId: await pid(reviewed) },
    });
    expect(denied.status).toBe(403);
    const res = await srv.call('POST', '/api/v1/quality-notices/review', {
      cookie: srv.cookies.planner,
      body: { pointId: await pid(reviewed) },
    });
    expect(res.status).toBe(200);
    const out = await res.json();
    expect(out).toMatchObject({ reviewed: 1, reviewedBy: { name: 'Pat Planner' } });
    const [n] = await srv.q(
      'SELECT n.reviewed_at, u.name FROM quality_notices n JOIN users u ON u.id = n.reviewed_by WHERE n.point_id = ?',
      [await pid(reviewed)],
    );
    expect(n!.name).toBe('Pat Planner');
    expect((n!.reviewed_at as Date).toISOString()).toBe(out.reviewedAt);
    // Who reviewed and when is read back with the notice.
    const reviewedId = await pid(reviewed);
    const notices = async (cookie: string, query = `pointId=${reviewedId}`) =>
      srv.call('GET', `/api/v1/quality-notices?${query}`, { cookie });
    const listed = await (await notices(srv.cookies.planner)).json();
    expect(listed.items).toHaveLength(1);
    expect(listed.items[0]).toMatchObject({
      verdict: 'unusable',
      reviewedBy: { name: 'Pat Planner' },
      reviewedAt: out.reviewedAt,
    });
    expect((await notices(srv.cookies.planner, 'pointId=x')).status).toBe(400);
    // The newest capture is still the clipped (unusable) one, but its notice is reviewed.
    const [v] = await srv.q('SELECT last_verdict FROM points WHERE tag = ?', [reviewed]);
    expect(v!.last_verdict).toBe('unusable');
    expect(await statusOf(reviewed)).toBe('ok');
    // A further bad capture writes a new notice: marked again.
    await clipped(reviewed, 'q-4', now - 1 * 3_600_000);
    await createWorker(srv.ctx).drain();
    expect(await statusOf(reviewed)).toBe('quality');
    // Reviewing again marks the new notice, then nothing more; a bad body is refused.
    const again = await srv.call('POST', '/api/v1/quality-notices/review', {
      cookie: srv.cookies.planner,
      body: { pointId: await pid(reviewed) },
    });
    expect((await again.json()).reviewed).toBe(1); // the new notice only
    const both = (await (await notices(srv.cookies.planner)).json()).items;
    expect(both).toHaveLength(2);
    // Newest capture first; each keeps its own reviewer and time.
    expect(Date.parse(both[0].takenAt)).toBeGreaterThan(Date.parse(both[1].takenAt));
    expect(both[1].reviewedAt).toBe(out.reviewedAt);
    expect(both[0].reviewedBy).toMatchObject({ name: 'Pat Planner' });
    const none = await srv.call('POST', '/api/v1/quality-notices/review', {
      cookie: srv.cookies.planner,
      body: { pointId: await pid(reviewed) },
    });
    expect((await none.json()).reviewed).toBe(0);
    const bad = await srv.call('POST', '/api/v1/quality-notices/review', {
      cookie: srv.cookies.planner,
      body: { pointId: 'x' },
    });
    expect(bad.status).toBe(400);
  });

  it('the review lists the findings created in the site’s current week', async () => {
    const f = await (
      await srv.call('POST', '/api/v1/findings', {
        cookie: srv.cookies.planner,
        body: { pointId: await pid(rising), title: 'Check P-120 motor DE after the rise' },
      })
    ).json();
    const res = await srv.call('GET', '/api/v1/review?siteId=2', { cookie: srv.cookies.planner });
    const body = await res.json();
    expect(body.findingsCreated.map((x: { id: number }) => x.id)).toContain(f.id);
    const old = await review();
    expect(old.findingsCreated).toEqual([]);
  });
});
