/**
 * The demo history (apps/server/src/features/demo/demo-history.ts) on a short run
 * (DEMO_HISTORY_WEEKS=2): captures from the gateway simulator's stories went through the
 * real ingest → worker → condition pipeline, and the people of the demo acted on alerts.
 * Also the gateway simulator's loop against the same server, twice.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseSimArgs } from '../../apps/gateway-sim/src/cli-args.ts';
import { runSimulator } from '../../apps/gateway-sim/src/run-simulator.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';

let srv: TestServer;
let engineer: string;

const q = (sqlText: string, params: unknown[] = []) => srv.q(sqlText, params);

beforeAll(async () => {
  srv = await startTestServer({ DEMO_HISTORY_WEEKS: '2' });
  engineer = await srv.signIn('engineer');
  // A capture per point every 4 hours: 3,655 captures through the pipeline (about 35 s of
  // CPU), far longer on a busy machine.
}, 600_000);
afterAll(async () => {
  await srv?.stop();
});

describe('demo history over 2 weeks', () => {
  it('every point has analysed captures, and every stored capture was analysed', async () => {
    const perPoint = await q(
      `SELECT p.tag, COUNT(a.id) AS n FROM points p LEFT JOIN analyses a ON a.point_id = p.id GROUP BY p.id`,
    );
    expect(perPoint.length).toBe(43); // points in packages/demo-scenario/src/demo-plant.ts
    for (const r of perPoint) expect(Number(r.n), String(r.tag)).toBeGreaterThan(10);
    const [s] = await q(`SELECT COUNT(*) AS n, SUM(status = 'done') AS done FROM snapshots`);
    expect(Number(s!.done)).toBe(Number(s!.n));
    // Every capture came with a tach, a speed, or a 1× the worker could estimate the speed from.
    const [noSpeed] = await q(`SELECT COUNT(*) AS n FROM analyses WHERE speed_source = 'none'`);
    expect(Number(noSpeed!.n)).toBe(0);
  });

  it('has alerts raised (one at danger), acknowledged by the operator, and cleared', async () => {
    const list = async (state: string) =>
      (await (await srv.call('GET', `/api/v1/alerts?state=${state}`, { cookie: engineer })).json())
        .items as { pointTag: string; level: string; bandName: string }[];
    const raised = await list('raised');
    const acknowledged = await list('acknowledged');
    const cleared = await list('cleared');
    expect(raised.length).toBeGreaterThan(0);
    expect(raised.some((a) => a.level === 'danger' && a.pointTag.startsWith('MFP-P201'))).toBe(
      true,
    );
    expect(acknowledged.some((a) => a.pointTag === 'MFP-P101-MDE-H')).toBe(true);
    expect(cleared.some((a) => a.pointTag.startsWith('MFP-B301'))).toBe(true);
    const [op] = await q(`SELECT id FROM users WHERE email = 'operator@turnstone.local'`);
    const acks = await q(
      `SELECT a.acknowledged_by, p.tag FROM alerts a JOIN points p ON p.id = a.point_id WHERE a.state = 'acknowledged' AND p.tag LIKE 'MFP-%'`,
    );
    expect(acks.length).toBeGreaterThan(0);
    for (const a of acks) expect(a.acknowledged_by).toBe(op!.id);
    const audit = await q(`SELECT COUNT(*) AS n FROM audit_log WHERE action = 'alert.acknowledge'`);
    expect(Number(audit[0]!.n)).toBeGreaterThanOrEqual(acks.length);
  });

  it('B-301 misalignment was corrected: a done finding, and its 2× alert cleared after it', async () => {
    const rows = await q(
      `SELECT f.state, f.work_order_ref, a.state AS alert_state FROM findings f JOIN alerts a ON a.id = f.alert_id
       JOIN points p ON p.id = f.point_id WHERE p.tag = 'MFP-B301-MDE-H'`,
    );
    expect(rows).toEqual([{ state: 'done', work_order_ref: 'WO-30977', alert_state: 'cleared' }]);
  });

  it('raises quality notices for the clipped and under-ranged channels; F-330, suspect for aliasing throughout, once', async () => {
    const notices = await q(
      `SELECT DISTINCT p.tag FROM quality_notices n JOIN points p ON p.id = n.point_id
        WHERE n.verdict = 'unusable' ORDER BY p.tag`,
    );
    expect(notices.map((r) => r.tag)).toEqual(['MFP-B302-MDE-V', 'MFP-P202-MDE-H']);
    const suspect = await q(
      `SELECT p.tag, COUNT(*) AS n FROM quality_notices n JOIN points p ON p.id = n.point_id
        WHERE n.verdict = 'suspect' GROUP BY p.tag ORDER BY p.tag`,
    );
    expect(suspect.map((r) => [r.tag, Number(r.n)])).toContainEqual(['TRB-F330-FDE-H', 1]);
    const f330 = await q(
      `SELECT a.quality_verdict, a.quality_findings FROM analyses a JOIN points p ON p.id = a.point_id WHERE p.tag = 'TRB-F330-FDE-H'`,
    );
    expect(f330.every((r) => r.quality_verdict === 'suspect')).toBe(true);
    expect(JSON.stringify(f330[0]!.quality_findings)).toContain('alias-risk');
  });

  it('P-101 MDE-H outer-race band rises and is projected to cross danger in the coming weeks', async () => {
    const [p] = await q(`SELECT id FROM points WHERE tag = 'MFP-P101-MDE-H'`);
    const values = await q(
      `SELECT value FROM band_values WHERE point_id = ? AND band_key = 'bpfo' ORDER BY taken_at`,
      [p!.id],
    );
    const mean = (xs: Record<string, unknown>[]) =>
      xs.reduce((s, r) => s + Number(r.value), 0) / xs.length;
    expect(mean(values.slice(-3))).toBeGreaterThan(2 * mean(values.slice(0, 3)));
    const res = await srv.call('GET', `/api/v1/points/${p!.id}/trend?band=bpfo`, {
      cookie: engineer,
    });
    expect(res.status).toBe(200);
    const trend = await res.json();
    expect(trend.projection.outcome).toBe('projected');
    expect(trend.projection.target.level).toBe('danger');
    expect(Date.parse(trend.projection.crossingAt)).toBeGreaterThan(Date.now());
  });
});

describe('gateway simulator against the server', () => {
  it('a bounded run is stored exactly; the same run again is all duplicates (200)', async () => {
    const admin = await srv.signIn('admin');
    const [site] = await q(`SELECT id FROM sites WHERE code = 'MFP'`);
    const created = await srv.call('POST', '/api/v1/gateways', {
      cookie: admin,
      body: { siteId: site!.id, name: 'sim test' },
    });
    const key = (await created.json()).apiKey as string;
    const options = parseSimArgs([
      '--url',
      srv.url,
      '--key',
      key,
      '--site',
      'MFP',
      '--count',
      '2',
      '--interval-s',
      '600',
      '--batch',
      '7',
      '--from',
      '2025-06-01T00:00:00Z',
      '--faults',
    ]);
    const first = await runSimulator(options);
    const mfpPoints = 24; // MFP points in packages/demo-scenario/src/demo-plant.ts
    expect(first).toMatchObject({
      rounds: 2,
      sent: 2 * mfpPoints,
      accepted: 2 * mfpPoints,
      duplicates: 0,
      failures: 0,
    });
    const [stored] = await q(`SELECT COUNT(*) AS n FROM snapshots WHERE taken_at < '2025-06-02'`);
    expect(Number(stored!.n)).toBe(first.accepted);
    const second = await runSimulator(options);
    expect(second).toMatchObject({
      sent: 2 * mfpPoints,
      accepted: 0,
      duplicates: 2 * mfpPoints,
      failures: 0,
    });
    const [again] = await q(`SELECT COUNT(*) AS n FROM snapshots WHERE taken_at < '2025-06-02'`);
    expect(Number(again!.n)).toBe(first.accepted);
  }, 60_000);
});
