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

  it('every timestamp of the history follows the captures that caused it, and none lies ahead', async () => {
    // Causality of the story (common practice, no source): an alert is raised by a capture,
    // acknowledged and cleared after; its audit entry is the acknowledgement's own instant;
    // a finding about an alert is written after it; nothing before the first capture or
    // after the seed finished.
    const now = Date.now() + 1000;
    const [span] = await q(`SELECT MIN(taken_at) AS first FROM snapshots`);
    const first = (span!.first as Date).getTime();
    const ms = (v: unknown) => (v === null ? null : (v as Date).getTime());
    const inHistory = (t: number | null, what: string) => {
      if (t === null) return;
      expect.soft(t, `${what} before the history`).toBeGreaterThanOrEqual(first);
      expect.soft(t, `${what} in the future`).toBeLessThanOrEqual(now);
    };

    const alertRows = await q(
      `SELECT a.id, a.first_at, a.acknowledged_at, a.cleared_at, a.last_at,
              (SELECT COUNT(*) FROM snapshots s WHERE s.point_id = a.point_id AND s.taken_at = a.first_at) AS cause
         FROM alerts a`,
    );
    expect.soft(alertRows.length).toBeGreaterThan(0);
    for (const a of alertRows) {
      const raised = ms(a.first_at)!;
      inHistory(raised, `alert ${a.id} raised`);
      // The capture that raised it, at that very instant.
      expect.soft(Number(a.cause), `alert ${a.id}: no capture at its raise time`).toBe(1);
      for (const k of ['acknowledged_at', 'cleared_at', 'last_at']) {
        inHistory(ms(a[k]), `alert ${a.id} ${k}`);
        if (a[k] !== null)
          expect.soft(ms(a[k]), `alert ${a.id} ${k}`).toBeGreaterThanOrEqual(raised);
      }
    }
    const events = await q(
      `SELECT e.alert_id, e.kind, e.at, a.first_at FROM alert_events e JOIN alerts a ON a.id = e.alert_id`,
    );
    for (const e of events) {
      inHistory(ms(e.at), `alert ${e.alert_id} event ${e.kind}`);
      expect
        .soft(ms(e.at), `alert ${e.alert_id} ${e.kind}`)
        .toBeGreaterThanOrEqual(ms(e.first_at)!);
    }

    // The audit log tells the acknowledgements at the alert history's own instants.
    const acks = await q(
      `SELECT l.id, l.at,
              (SELECT COUNT(*) FROM alert_events e WHERE e.alert_id = l.entity_id
                 AND e.kind = 'acknowledged' AND e.at = l.at) AS same
         FROM audit_log l WHERE l.action = 'alert.acknowledge'`,
    );
    expect.soft(acks.length).toBeGreaterThan(0);
    for (const r of acks) {
      inHistory(ms(r.at), `audit ${r.id}`);
      expect.soft(Number(r.same), `audit ${r.id}: no acknowledgement at its time`).toBe(1);
    }

    // Findings, and their audit entries, dated in the story after their alert.
    const found = await q(
      `SELECT f.id, f.created_at, f.updated_at, a.first_at,
              (SELECT MIN(l.at) FROM audit_log l WHERE l.entity = 'finding' AND l.entity_id = f.id) AS audit_first,
              (SELECT MAX(l.at) FROM audit_log l WHERE l.entity = 'finding' AND l.entity_id = f.id) AS audit_last
         FROM findings f LEFT JOIN alerts a ON a.id = f.alert_id`,
    );
    expect.soft(found.length).toBeGreaterThan(0);
    for (const f of found) {
      inHistory(ms(f.created_at), `finding ${f.id} created`);
      if (f.first_at !== null)
        expect
          .soft(ms(f.created_at), `finding ${f.id} before its alert`)
          .toBeGreaterThanOrEqual(ms(f.first_at)!);
      expect.soft(ms(f.updated_at)).toBeGreaterThanOrEqual(ms(f.created_at)!);
      inHistory(ms(f.updated_at), `finding ${f.id} updated`);
      expect.soft(ms(f.audit_first), `finding ${f.id} audit`).toBe(ms(f.created_at));
      expect.soft(ms(f.audit_last), `finding ${f.id} audit`).toBe(ms(f.updated_at));
    }

    // Every audit entry and every mail of the seed lies within the history and the seed's run.
    for (const r of await q(`SELECT id, action, at FROM audit_log`))
      expect.soft(ms(r.at), `audit ${r.id} ${r.action} in the future`).toBeLessThanOrEqual(now);
    for (const r of await q(`SELECT id, created_at, sent_at FROM outbox`)) {
      inHistory(ms(r.created_at), `mail ${r.id} queued`);
      inHistory(ms(r.sent_at), `mail ${r.id} sent`);
    }
    for (const r of await q(`SELECT id, received_at FROM mail_messages`))
      inHistory(ms(r.received_at), `mail ${r.id} received`);
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
