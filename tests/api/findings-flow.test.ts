/**
 * A finding's state flow (open → planned → done, reopen to open), its planning fields
 * (priority, owner, planned downtime) and the list's filters by state and due week, against
 * the real server and MariaDB. The ISO week of each due date is checked against Python's
 * datetime.isocalendar run live (ISO 8601 week numbering).
 */
import { execFileSync } from 'node:child_process';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/test-server.ts';

let srv: TestServer;
let planner: string;
let pid: number;

beforeAll(async () => {
  srv = await startTestServer();
  planner = await srv.signIn('planner');
  const [p] = await srv.q('SELECT id FROM points WHERE tag = ?', ['MFP-P102-MDE-H']);
  pid = Number(p!.id);
}, 120_000);
afterAll(async () => {
  await srv?.stop();
});

const patch = (id: number, body: unknown) =>
  srv.call('PATCH', `/api/v1/findings/${id}`, { cookie: planner, body });
async function create(body: Record<string, unknown>) {
  const res = await srv.call('POST', '/api/v1/findings', {
    cookie: planner,
    body: { pointId: pid, ...body },
  });
  expect(res.status).toBe(201);
  return res.json();
}
const stored = async (id: number) => (await srv.q('SELECT * FROM findings WHERE id = ?', [id]))[0]!;

describe('finding state flow', () => {
  it('keeps priority, owner and planned downtime; a work-order reference moves an open finding to planned', async () => {
    const f = await create({
      title: 'Balance fan impeller',
      priority: 'high',
      owner: 'Mechanical crew B',
      plannedDowntimeHours: 5.5,
    });
    expect(f).toMatchObject({
      state: 'open',
      priority: 'high',
      owner: 'Mechanical crew B',
      plannedDowntimeHours: 5.5,
    });
    const res = await patch(f.id, { workOrderRef: 'WO 2026:0815' });
    expect(res.status).toBe(200);
    expect(await res.json()).toMatchObject({ state: 'planned', workOrderRef: 'WO 2026:0815' });
    const audit = await srv.q(
      "SELECT action FROM audit_log WHERE entity = 'finding' AND entity_id = ? ORDER BY id",
      [String(f.id)],
    );
    expect(audit.map((a) => a.action)).toEqual(['finding.create', 'finding.planned']);

    // A planned finding keeps its reference: clearing it is refused and nothing changes.
    const cleared = await patch(f.id, { workOrderRef: '' });
    expect(cleared.status).toBe(400);
    expect((await cleared.json()).error.details[0].path).toEqual(['workOrderRef']);
    expect(await stored(f.id)).toMatchObject({ state: 'planned', work_order_ref: 'WO 2026:0815' });

    const done = await patch(f.id, { state: 'done' });
    expect((await done.json()).state).toBe('done');
    // Done goes back to open, not straight to planned.
    const replanned = await patch(f.id, { state: 'planned' });
    expect(replanned.status).toBe(400);
    expect((await stored(f.id)).state).toBe('done');
    const reopened = await patch(f.id, { state: 'open' });
    expect((await reopened.json()).state).toBe('open');
  });

  it('a finding created with a work order starts planned; an explicit state in the same request wins', async () => {
    const f = await create({ title: 'Relubricate NDE', workOrderRef: 'PM-17/3' });
    expect(f.state).toBe('planned');
    const g = await create({ title: 'Check soft foot', priority: 'low' });
    const res = await patch(g.id, { workOrderRef: 'WO-1', state: 'done' });
    expect((await res.json()).state).toBe('done');
  });

  it('rejects a negative downtime, an unknown priority and an empty owner of 101 characters; nothing stored', async () => {
    const before = await srv.q('SELECT COUNT(*) AS n FROM findings');
    for (const bad of [
      { plannedDowntimeHours: -1 },
      { priority: 'urgent' },
      { owner: 'x'.repeat(101) },
      { plannedDowntimeHours: 'six' },
    ]) {
      const res = await srv.call('POST', '/api/v1/findings', {
        cookie: planner,
        body: { pointId: pid, title: 'Bad', ...bad },
      });
      expect(res.status, JSON.stringify(bad)).toBe(400);
      expect((await res.json()).error.details[0].path).toBe(Object.keys(bad)[0]);
    }
    expect(await srv.q('SELECT COUNT(*) AS n FROM findings')).toEqual(before);
  });
});

describe('editing a finding after creation', () => {
  it('changes priority, owner and planned downtime, audited with old and new values; bad input changes nothing', async () => {
    const f = await create({ title: 'Align motor to pump', priority: 'low' });
    const res = await patch(f.id, {
      priority: 'high',
      owner: 'Electrical crew',
      plannedDowntimeHours: 3.5,
    });
    expect(res.status).toBe(200);
    expect(await res.json()).toMatchObject({
      state: 'open',
      priority: 'high',
      owner: 'Electrical crew',
      plannedDowntimeHours: 3.5,
    });
    expect(await stored(f.id)).toMatchObject({ priority: 'high', owner: 'Electrical crew' });
    const [entry] = await srv.q(
      "SELECT action, `before`, `after` FROM audit_log WHERE entity = 'finding' AND entity_id = ? ORDER BY id DESC LIMIT 1",
      [String(f.id)],
    );
    const json = (v: unknown) => (typeof v === 'string' ? JSON.parse(v) : v);
    expect(entry!.action).toBe('finding.update');
    expect(json(entry!.before)).toMatchObject({
      priority: 'low',
      owner: null,
      plannedDowntimeHours: null,
    });
    expect(json(entry!.after)).toMatchObject({
      priority: 'high',
      owner: 'Electrical crew',
      plannedDowntimeHours: 3.5,
    });

    // Clearing the owner and the downtime (the form sends '' and null) is a change too.
    const cleared = await patch(f.id, { owner: '', plannedDowntimeHours: null });
    expect(await cleared.json()).toMatchObject({ owner: null, plannedDowntimeHours: null });

    // The same values again write nothing and log nothing.
    const auditCount = async () =>
      (
        await srv.q(
          "SELECT COUNT(*) AS n FROM audit_log WHERE entity = 'finding' AND entity_id = ?",
          [String(f.id)],
        )
      )[0]!.n;
    const logged = await auditCount();
    expect((await patch(f.id, { priority: 'high', owner: null })).status).toBe(200);
    expect(await auditCount()).toBe(logged);

    // Bad input: a clear error on its field, and what is stored stays (8760 h: a year, the
    // schema's bound; common practice, no source).
    const before = await stored(f.id);
    for (const bad of [
      { plannedDowntimeHours: 8761 },
      { plannedDowntimeHours: '4 h' },
      { priority: 'asap' },
      { owner: 'line one\nline two' },
    ]) {
      const r = await patch(f.id, { title: 'Changed title', ...bad });
      expect(r.status, JSON.stringify(bad)).toBe(400);
      const body = await r.json();
      expect(body.error.details[0].path).toBe(Object.keys(bad)[0]);
      expect(body.error.details[0].message.length).toBeGreaterThan(5);
    }
    expect(await stored(f.id)).toEqual(before);
  });
});

describe('findings list filters', () => {
  it('filters by state and by ISO due week (Monday to Sunday)', async () => {
    const dates = ['2026-11-29', '2026-11-30', '2026-12-06', '2026-12-07'];
    // ISO 8601 weeks, from Python's date.isocalendar run live.
    const weeks = execFileSync(
      'python3',
      [
        '-c',
        `from datetime import date\nprint(" ".join("%d-W%02d" % date.fromisoformat(d).isocalendar()[:2] for d in ${JSON.stringify(dates)}))`,
      ],
      { encoding: 'utf8' },
    )
      .trim()
      .split(' ');
    expect(weeks).toEqual(['2026-W48', '2026-W49', '2026-W49', '2026-W50']);
    const made = [];
    for (const d of dates) made.push(await create({ title: `Due ${d}`, dueDate: d }));
    await patch(made[2].id, { workOrderRef: 'WO-77' });

    const list = async (query: string) => {
      const res = await srv.call('GET', `/api/v1/findings?${query}`, { cookie: planner });
      expect(res.status).toBe(200);
      return (await res.json()).items.map((i: { title: string }) => i.title).sort();
    };
    expect(await list('dueWeek=2026-W49')).toEqual(['Due 2026-11-30', 'Due 2026-12-06']);
    expect(await list('dueWeek=2026-W49&state=open')).toEqual(['Due 2026-11-30']);
    expect(await list('dueWeek=2026-W49&state=planned')).toEqual(['Due 2026-12-06']);
    expect(await list('dueWeek=2026-W48')).toEqual(['Due 2026-11-29']);

    for (const bad of ['2026-W54', '2026-49', 'W49']) {
      const res = await srv.call('GET', `/api/v1/findings?dueWeek=${bad}`, { cookie: planner });
      expect(res.status, bad).toBe(400);
      expect((await res.json()).error.details[0].path).toBe('dueWeek');
    }
  });
});
