/**
 * Outgoing webhooks: alert transitions and finding changes reach a local HTTP receiver,
 * signed as the Standard Webhooks specification describes — checked with that
 * specification's own npm implementation (`standardwebhooks`), not with our signer — and
 * each event arrives exactly once: across a receiver that is down (connection refused)
 * and then up, across an error answer, and with two senders draining at once.
 */
import { createServer, type IncomingHttpHeaders, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { Webhook } from 'standardwebhooks';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createWebhookSender } from '../../apps/server/src/features/webhooks/webhook-sender.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { captureVelocities, gatewayKey } from '../support/alert-captures.ts';

interface Received {
  headers: IncomingHttpHeaders;
  body: string;
}

/** A receiver on `port` (0: any); `answer` is the status it replies with. */
function receiver(port = 0) {
  const got: Received[] = [];
  let answer = 204;
  const server: Server = createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => {
      got.push({ headers: req.headers, body: Buffer.concat(chunks).toString('utf8') });
      res.statusCode = answer;
      res.end();
    });
  });
  return new Promise<{
    port: number;
    got: Received[];
    setAnswer(s: number): void;
    close(): Promise<void>;
  }>((resolve) =>
    server.listen(port, '127.0.0.1', () =>
      resolve({
        port: (server.address() as AddressInfo).port,
        got,
        setAnswer: (s) => (answer = s),
        close: () =>
          new Promise<void>((r) => {
            server.close(() => r());
            server.closeAllConnections();
          }),
      }),
    ),
  );
}

let srv: TestServer;
let admin: string;
let planner: string;
let secret: string;
let hookId: number;
let rx: Awaited<ReturnType<typeof receiver>>;

beforeAll(async () => {
  srv = await startTestServer();
  admin = await srv.signIn('admin');
  planner = await srv.signIn('planner');
  rx = await receiver();
  const res = await srv.call('POST', '/api/v1/webhooks', {
    cookie: admin,
    body: {
      name: 'CMMS',
      url: `http://127.0.0.1:${rx.port}/turnstone`,
      events: ['alert.raised', 'alert.acknowledged', 'finding.created', 'finding.updated'],
    },
  });
  expect(res.status, await res.clone().text()).toBe(201);
  const body = await res.json();
  secret = body.secret;
  hookId = body.id;
});
afterAll(async () => {
  await rx?.close();
  await srv?.stop();
});

/** Verified with the specification's implementation; throws on a bad signature. */
function verified(r: Received) {
  const headers = Object.fromEntries(
    Object.entries(r.headers).map(([k, v]) => [k, String(v)]),
  ) as Record<string, string>;
  return new Webhook(secret).verify(r.body, headers) as {
    id: string;
    type: string;
    data: Record<string, unknown>;
  };
}

const events = (got: Received[]) => got.map(verified);

async function createFinding(title: string) {
  const res = await srv.call('POST', '/api/v1/findings', {
    cookie: planner,
    body: { pointId: 1, title },
  });
  expect(res.status).toBe(201);
  return (await res.json()) as { id: number };
}

describe('webhooks', () => {
  it('the secret is shown once; the list tells it not', async () => {
    expect(secret).toMatch(/^whsec_[A-Za-z0-9+/]{43}=$/);
    const list = await (await srv.call('GET', '/api/v1/webhooks', { cookie: admin })).json();
    expect(JSON.stringify(list)).not.toContain(secret.slice(6));
    const planners = await srv.call('GET', '/api/v1/webhooks', { cookie: planner });
    expect(planners.status).toBe(403);
  });

  it('a finding created and changed reaches the receiver, signed, once each', async () => {
    const f = await createFinding('Webhook finding');
    await srv.call('PATCH', `/api/v1/findings/${f.id}`, {
      cookie: planner,
      body: { workOrderRef: 'WO 2026:0042' },
    });
    await srv.webhooks.drain();
    await srv.webhooks.drain();
    const mine = events(rx.got).filter((e) => e.data.id === f.id);
    expect(mine.map((e) => e.type)).toEqual(['finding.created', 'finding.updated']);
    expect(mine[1]!.data).toMatchObject({ state: 'planned', workOrderRef: 'WO 2026:0042' });
    // A tampered body fails the specification's verification.
    const r = rx.got[rx.got.length - 1]!;
    expect(() => verified({ ...r, body: r.body.replace('planned', 'done') })).toThrow();
  });

  it('an alert raised and acknowledged is told as it is listed', async () => {
    const key = await gatewayKey(srv, 1);
    // 3.5 mm/s twice over P-101's 2.8 mm/s alert level, persistence 2 (condition package's
    // template defaults, common practice, no source): one alert raised.
    await captureVelocities(srv, key, 'MFP-P101-MDE-H', [3.5, 3.5]);
    await srv.webhooks.drain();
    const raised = events(rx.got).filter((e) => e.type === 'alert.raised');
    // One event per alert raised (its bands over their levels), none twice.
    const inDb = await srv.q<{ id: number }>('SELECT id FROM alerts ORDER BY id');
    expect(inDb.length).toBeGreaterThan(0);
    expect(raised.map((e) => e.data.id as number).sort((x, y) => x - y)).toEqual(
      inDb.map((r) => r.id),
    );
    const alertId = raised[0]!.data.id as number;
    expect(raised[0]!.data).toMatchObject({ state: 'raised', pointTag: 'MFP-P101-MDE-H' });
    const engineer = await srv.signIn('engineer');
    const ack = await srv.call('POST', `/api/v1/alerts/${alertId}/acknowledge`, {
      cookie: engineer,
      body: { note: 'Checked on site' },
    });
    expect(ack.status).toBe(200);
    await srv.webhooks.drain();
    const acked = events(rx.got).filter((e) => e.type === 'alert.acknowledged');
    expect(acked).toHaveLength(1);
    expect(acked[0]!.data).toMatchObject({ id: alertId, state: 'acknowledged' });
    expect(Date.parse(acked[0]!.data.updatedAt as string)).toBeGreaterThanOrEqual(
      Date.parse(raised[0]!.data.updatedAt as string),
    );
  });

  it('across a receiver outage (down, then up) each event arrives exactly once', async () => {
    const port = rx.port;
    await rx.close();
    const before = rx.got.length;
    const f = await createFinding('During the outage');
    const down = await srv.webhooks.drain();
    expect(down.map((d) => d.result)).toEqual(['retry']);
    const [row] = await srv.q<{ attempts: number; last_error: string; sent_at: Date | null }>(
      'SELECT attempts, last_error, sent_at FROM webhook_deliveries WHERE id = ?',
      [down[0]!.id],
    );
    expect(row).toMatchObject({ attempts: 1, sent_at: null });
    expect(row!.last_error).toContain('ECONNREFUSED');
    rx = await receiver(port);
    // The back-off holds: nothing is due before its next attempt time…
    expect(await srv.webhooks.drain()).toEqual([]);
    // …which the test moves to now instead of waiting 30 s.
    await srv.q('UPDATE webhook_deliveries SET next_attempt_at = NOW(3) WHERE id = ?', [
      down[0]!.id,
    ]);
    // Two senders at once (two worker processes): the lease gives the row to one.
    const other = createWebhookSender(srv.ctx, { owner: 'second-sender' });
    const [a, b] = await Promise.all([srv.webhooks.drain(), other.drain()]);
    expect([...a, ...b].map((d) => d.result)).toEqual(['sent']);
    expect(await srv.webhooks.drain()).toEqual([]);
    const got = events(rx.got).filter((e) => e.data.id === f.id);
    expect(got.map((e) => e.type)).toEqual(['finding.created']);
    expect(before).toBeGreaterThan(0);
  });

  it('an error answer is retried; the repeat carries the same event id', async () => {
    rx.setAnswer(503);
    const f = await createFinding('Receiver busy');
    const first = await srv.webhooks.drain();
    expect(first.map((d) => d.result)).toEqual(['retry']);
    rx.setAnswer(200);
    await srv.q('UPDATE webhook_deliveries SET next_attempt_at = NOW(3) WHERE id = ?', [
      first[0]!.id,
    ]);
    expect((await srv.webhooks.drain()).map((d) => d.result)).toEqual(['sent']);
    const tries = rx.got.map(verified).filter((e) => e.data.id === f.id);
    // Both requests reached the receiver (it answered 503 to the first): one event id.
    expect(tries).toHaveLength(2);
    expect(new Set(tries.map((e) => e.id)).size).toBe(1);
    const deliveries = await (
      await srv.call('GET', `/api/v1/webhooks/${hookId}/deliveries`, { cookie: admin })
    ).json();
    const d = deliveries.items.find((x: { id: number }) => x.id === first[0]!.id);
    expect(d).toMatchObject({ outcome: 'sent', attempts: 2, lastStatus: 200 });
  });

  it('a send that started and never finished is not sent again (uncertain)', async () => {
    const f = await createFinding('Sender died');
    // As a sender that died mid-request leaves it: started, leased, lease now expired.
    await srv.q(
      `UPDATE webhook_deliveries SET sending_started_at = NOW(3), attempts = 1,
              lease_owner = 'dead', lease_expires_at = NOW(3) - INTERVAL 1 SECOND
        WHERE event_type = 'finding.created' AND body LIKE ?`,
      [`%"id":${f.id},%`],
    );
    expect((await srv.webhooks.drain()).map((d) => d.result)).toEqual(['uncertain']);
    expect(events(rx.got).filter((e) => e.data.id === f.id)).toEqual([]);
  });

  it('events of a webhook disabled before they went out wait until it is enabled again', async () => {
    const f = await createFinding('Queued, then disabled');
    await srv.call('PATCH', `/api/v1/webhooks/${hookId}`, {
      cookie: admin,
      body: { enabled: false },
    });
    expect(await srv.webhooks.drain()).toEqual([]);
    const g = await createFinding('While disabled');
    await srv.call('PATCH', `/api/v1/webhooks/${hookId}`, {
      cookie: admin,
      body: { enabled: true },
    });
    expect((await srv.webhooks.drain()).map((d) => d.result)).toEqual(['sent']);
    expect(events(rx.got).filter((e) => e.data.id === f.id)).toHaveLength(1);
    // A disabled webhook is not given new events at all.
    expect(events(rx.got).filter((e) => e.data.id === g.id)).toEqual([]);
  });
});
