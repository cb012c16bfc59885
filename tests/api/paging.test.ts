/**
 * Cursor paging and `since` on the lists an integrator pulls: alerts and findings walk page
 * by page (limit 1 and 2) to exactly the unpaged list, in (time, id) order — alerts by last
 * activity, findings by last change (updatedAt) — without a
 * duplicate while new rows arrive mid-walk; `since` keeps the rows at or after it; a cursor
 * that is not one the server issued (garbage, overlong, 400 digits) is a 400, never a 500.
 * The audit log's cursor answers the same way.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { snapshotBody } from '../support/signals.ts';

let srv: TestServer;
const cookies = new Map<string, string>();
/** Peak acceleration (g) of a 24.7 Hz tone of `mmS` mm/s RMS (calculus of a sinusoid, textbook). */
const peakGFor = (mmS: number) => (mmS * Math.SQRT2 * 2 * Math.PI * 24.7) / 9806.65;

beforeAll(async () => {
  srv = await startTestServer();
  for (const role of ['admin', 'planner', 'engineer']) cookies.set(role, await srv.signIn(role));
  const gw = await srv.call('POST', '/api/v1/gateways', {
    cookie: cookies.get('admin'),
    body: { siteId: 1, name: 'paging gw' },
  });
  const key = ((await gw.json()) as { apiKey: string }).apiKey;
  // Two captures at 3.5 mm/s over P-101/P-102's 2.8 mm/s alert level, persistence 2
  // (condition package's template defaults, common practice, no source): one alert each.
  const t0 = Date.now() - 5 * 24 * 3600_000;
  let seq = 0;
  for (const tag of ['MFP-P101-MDE-H', 'MFP-P101-MNDE-H', 'MFP-P102-MDE-H']) {
    for (let i = 0; i < 2; i++) {
      seq++;
      const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
        body: snapshotBody(tag, `paging-${seq}`, {
          tones: [{ hz: 24.7, peakG: peakGFor(3.5) }],
          noiseG: 0.001,
          seed: seq,
          takenAt: new Date(t0 + seq * 3600_000).toISOString(),
        }),
        headers: { authorization: `Bearer ${key}` },
      });
      expect(res.status, tag).toBe(201);
    }
  }
  await createWorker(srv.ctx, { owner: 'paging-test' }).drain();
  for (let i = 1; i <= 5; i++) {
    const res = await srv.call('POST', '/api/v1/findings', {
      cookie: cookies.get('planner'),
      body: { pointId: 1, title: `Paging finding ${i}` },
    });
    expect(res.status).toBe(201);
  }
});
afterAll(async () => {
  await srv?.stop();
});

// eslint-disable-next-line @typescript-eslint/no-explicit-any
async function get(path: string): Promise<{ status: number; body: any }> {
  const res = await srv.call('GET', path, { cookie: cookies.get('planner') });
  return { status: res.status, body: await res.json() };
}

/** Follows nextCursor to the end; `between` runs after the first page. */
async function walk(base: string, between?: () => Promise<void>) {
  const ids: number[] = [];
  let cursor: string | null = null;
  let pages = 0;
  do {
    const sep = base.includes('?') ? '&' : '?';
    const { status, body } = await get(
      cursor ? `${base}${sep}cursor=${encodeURIComponent(cursor)}` : base,
    );
    expect(status).toBe(200);
    ids.push(...body.items.map((x: { id: number }) => x.id));
    cursor = body.nextCursor;
    if (cursor !== null) expect(cursor.length).toBeLessThanOrEqual(64);
    if (pages++ === 0 && between) await between();
  } while (cursor !== null && pages < 100);
  return ids;
}

describe('alerts', () => {
  it('pages walk to exactly the whole list, newest activity first', async () => {
    const all = await get('/api/v1/alerts');
    expect(all.body.items.length).toBeGreaterThanOrEqual(3);
    expect(all.body.nextCursor).toBeNull();
    const order = all.body.items.map((a: { lastAt: string; id: number }) => [a.lastAt, a.id]);
    const sorted = [...order].sort((x, y) => (x[0] === y[0] ? y[1] - x[1] : x[0] < y[0] ? 1 : -1));
    expect(order).toEqual(sorted);
    const ids = all.body.items.map((a: { id: number }) => a.id);
    expect(await walk('/api/v1/alerts?limit=1')).toEqual(ids);
    expect(await walk('/api/v1/alerts?limit=2')).toEqual(ids);
  });

  it('since keeps alerts whose last activity is at or after it', async () => {
    const all = (await get('/api/v1/alerts')).body.items as { id: number; lastAt: string }[];
    const pivot = all[1]!.lastAt;
    const since = await get(`/api/v1/alerts?since=${encodeURIComponent(pivot)}`);
    expect(since.status).toBe(200);
    expect(since.body.items.map((a: { id: number }) => a.id)).toEqual(
      all.filter((a) => a.lastAt >= pivot).map((a) => a.id),
    );
    const bad = await get('/api/v1/alerts?since=yesterday');
    expect(bad.status).toBe(400);
    expect(bad.body.error.code).toBe('validation_failed');
  });
});

describe('findings', () => {
  it('pages walk to the whole list; a finding created mid-walk appears once or not at all', async () => {
    const all = await get('/api/v1/findings');
    const ids = all.body.items.map((f: { id: number }) => f.id);
    expect(ids.length).toBe(5);
    expect(all.body.nextCursor).toBeNull();
    expect(await walk('/api/v1/findings?limit=2')).toEqual(ids);
    // A newer finding sorts before the cursor: the walk already begun does not repeat or
    // skip anything, and the new one is found by the next pull.
    const walked = await walk('/api/v1/findings?limit=1', async () => {
      const res = await srv.call('POST', '/api/v1/findings', {
        cookie: cookies.get('planner'),
        body: { pointId: 1, title: 'Arrived mid-walk' },
      });
      expect(res.status).toBe(201);
    });
    expect(walked).toEqual(ids);
    const now = (await get('/api/v1/findings')).body.items;
    expect(now.length).toBe(6);
    expect(now[0].title).toBe('Arrived mid-walk');
  });

  it('since keeps findings changed at or after it; a change moves a finding first', async () => {
    type F = { id: number; createdAt: string; updatedAt: string; title: string };
    const all = (await get('/api/v1/findings')).body.items as F[];
    for (const f of all) expect(f.updatedAt >= f.createdAt).toBe(true);
    const pivot = all[2]!.updatedAt;
    const since = await get(`/api/v1/findings?since=${encodeURIComponent(pivot)}&limit=1000`);
    expect(since.body.items.map((f: { id: number }) => f.id)).toEqual(
      all.filter((f) => f.updatedAt >= pivot).map((f) => f.id),
    );
    // The oldest finding is changed: it is now first, and a pull since just before the
    // change answers it alone — how an integrator picks up changes, not only new rows.
    const oldest = all[all.length - 1]!;
    const before = new Date(Date.parse(all[0]!.updatedAt) + 1).toISOString();
    await new Promise((r) => setTimeout(r, 5));
    const patched = await srv.call('PATCH', `/api/v1/findings/${oldest.id}`, {
      cookie: cookies.get('planner'),
      body: { state: 'planned', workOrderRef: 'WO 2026:0042' },
    });
    expect(patched.status).toBe(200);
    const changed = (await patched.json()) as F;
    expect(changed.updatedAt > oldest.updatedAt).toBe(true);
    expect(changed.createdAt).toBe(oldest.createdAt);
    const after = (await get('/api/v1/findings')).body.items as F[];
    expect(after[0]!.id).toBe(oldest.id);
    const pulled = await get(`/api/v1/findings?since=${encodeURIComponent(before)}`);
    expect(pulled.body.items.map((f: F) => f.id)).toEqual([oldest.id]);
  });
});

describe('cursors the server did not issue', () => {
  const cases: [string, string][] = [
    ['garbage', 'not-a-cursor'],
    ['400 digits', '9'.repeat(400)],
    ['too long', 'A'.repeat(65)],
    ['not base64url', 'a+b/c='],
    ['base64url of a huge number', Buffer.from(`${'9'.repeat(30)}.1`).toString('base64url')],
  ];
  for (const list of ['alerts', 'findings', 'audit']) {
    it(`${list}: 400, never 500`, async () => {
      for (const [what, cursor] of cases) {
        const res = await srv.call('GET', `/api/v1/${list}?cursor=${encodeURIComponent(cursor)}`, {
          cookie: cookies.get('engineer'),
        });
        expect(res.status, `${list} ${what}`).toBe(400);
        const body = await res.json();
        expect(['validation_failed', 'invalid_cursor'], `${list} ${what}`).toContain(
          body.error.code,
        );
      }
    });
  }
});
