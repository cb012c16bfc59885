import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterEach, describe, expect, it } from 'vitest';
import type { SnapshotIn } from '@turnstone/contracts/ingest';
import { newTally, sendBatch } from './ingest-client.ts';

type Handler = (req: IncomingMessage, body: string, res: ServerResponse) => void;
let close: (() => Promise<void>) | null = null;

/** A real HTTP server on loopback that answers by script, recording what it received. */
async function scripted(handlers: Handler[]) {
  const bodies: string[] = [];
  const server = createServer((req, res) => {
    let body = '';
    req.on('data', (c: Buffer) => (body += c.toString()));
    req.on('end', () => {
      bodies.push(body);
      handlers[Math.min(bodies.length - 1, handlers.length - 1)]!(req, body, res);
    });
  });
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
  close = () => new Promise((r) => server.close(() => r()));
  return { url: `http://127.0.0.1:${(server.address() as AddressInfo).port}`, bodies };
}
afterEach(async () => {
  await close?.();
  close = null;
});

const item = (uid: string) => ({ uid, pointTag: 'X' }) as unknown as SnapshotIn;
const json = (
  res: ServerResponse,
  status: number,
  body: unknown,
  headers: Record<string, string> = {},
) => {
  res.writeHead(status, { 'content-type': 'application/json', ...headers });
  res.end(JSON.stringify(body));
};

describe('sendBatch', () => {
  it('on 503 with Retry-After: 1, waits at least a second and resends the same uid', async () => {
    const s = await scripted([
      (_q, _b, res) => json(res, 503, { error: { code: 'unavailable' } }, { 'retry-after': '1' }),
      (_q, _b, res) => json(res, 201, { uid: 'a', status: 'created' }),
    ]);
    const tally = newTally();
    const t0 = Date.now();
    await sendBatch([item('a')], { url: s.url, key: 'k', maxRetries: 3, baseDelayMs: 1 }, tally);
    expect(Date.now() - t0).toBeGreaterThanOrEqual(990);
    expect(tally).toMatchObject({ sent: 1, accepted: 1, retries: 1, failures: 0 });
    expect(s.bodies.map((b) => JSON.parse(b).uid)).toEqual(['a', 'a']);
  });

  it('counts a batch answer item by item: created, duplicate, conflict; retries only the 5xx item', async () => {
    const s = await scripted([
      (_q, _b, res) =>
        json(res, 200, {
          results: [
            { uid: 'a', status: 'created', httpStatus: 201 },
            { uid: 'b', status: 'duplicate', httpStatus: 200 },
            {
              uid: 'c',
              status: 'conflict',
              httpStatus: 409,
              error: { code: 'uid_conflict', message: 'other content' },
            },
            { uid: 'd', status: 'error', httpStatus: 503 },
          ],
        }),
      (_q, _b, res) => json(res, 201, { uid: 'd', status: 'created' }),
    ]);
    const tally = newTally();
    await sendBatch(
      [item('a'), item('b'), item('c'), item('d')],
      { url: s.url, key: 'k', maxRetries: 3, baseDelayMs: 1 },
      tally,
    );
    expect(tally).toMatchObject({ sent: 4, accepted: 2, duplicates: 1, failures: 1, retries: 1 });
    expect([...tally.failed.keys()]).toEqual(['c']);
    expect(JSON.parse(s.bodies[1]!).uid).toBe('d');
  });

  it('does not retry a 400; gives up on a dead server after maxRetries and reports the capture', async () => {
    const s = await scripted([
      (_q, _b, res) => json(res, 400, { error: { code: 'validation_failed', message: 'bad' } }),
    ]);
    const tally = newTally();
    await sendBatch([item('a')], { url: s.url, key: 'k', maxRetries: 3, baseDelayMs: 1 }, tally);
    expect(s.bodies.length).toBe(1);
    expect(tally).toMatchObject({ failures: 1, retries: 0 });
    await close!();
    close = null;
    const dead = newTally();
    await sendBatch([item('z')], { url: s.url, key: 'k', maxRetries: 2, baseDelayMs: 1 }, dead);
    expect(dead).toMatchObject({ sent: 1, accepted: 0, retries: 2, failures: 1 });
    expect(dead.failed.get('z')).toMatch(/gave up after 2 retries/);
  });
});
