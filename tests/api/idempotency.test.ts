/**
 * `Idempotency-Key` on creating POSTs (IETF draft-ietf-httpapi-idempotency-key-header):
 * a retried creation is answered the first answer, not created twice.
 */
import { describe, expect, it } from 'vitest';
import { testServerForFile } from '../support/api-suite.ts';

const srv = testServerForFile({ signIn: ['planner', 'engineer'] });

const post = (
  key: string | null,
  body: unknown,
  cookie = srv.cookies.planner,
  path = '/api/v1/findings',
) =>
  srv.call('POST', path, {
    cookie,
    body,
    headers: key === null ? {} : { 'Idempotency-Key': key },
  });
const countTitled = async (title: string) =>
  Number(
    (await srv.q<{ n: number }>('SELECT COUNT(*) AS n FROM findings WHERE title = ?', [title]))[0]!
      .n,
  );

describe('Idempotency-Key on POST /findings', () => {
  it('the same key and body is answered the first answer again; one finding exists', async () => {
    const body = { pointId: 1, title: 'Idem one', workOrderRef: 'WO 2026:0042' };
    const first = await post('idem-1', body);
    expect(first.status, await first.clone().text()).toBe(201);
    const again = await post('idem-1', body);
    expect(again.status).toBe(201);
    expect(again.headers.get('idempotent-replayed')).toBe('true');
    expect(await again.json()).toEqual(await first.json());
    expect(await countTitled('Idem one')).toBe(1);
  });

  it('the same key with another body is a 422; without a key every POST creates', async () => {
    await post('idem-2', { pointId: 1, title: 'Idem two' });
    const other = await post('idem-2', { pointId: 1, title: 'Idem two, changed' });
    expect(other.status).toBe(422);
    expect((await other.json()).error.code).toBe('idempotency_key_reused');
    expect(await countTitled('Idem two, changed')).toBe(0);
    await post(null, { pointId: 1, title: 'No key' });
    await post(null, { pointId: 1, title: 'No key' });
    expect(await countTitled('No key')).toBe(2);
  });

  it('a refused request frees its key for the corrected retry', async () => {
    const bad = await post('idem-3', { pointId: 1, title: 'Bad\u0007bell' });
    expect(bad.status).toBe(400);
    const good = await post('idem-3', { pointId: 1, title: 'Good after bad' });
    expect(good.status).toBe(201);
    expect(await countTitled('Good after bad')).toBe(1);
  });

  it('keys are per account; a key past its expiry is free again', async () => {
    const body = { pointId: 1, title: 'Per account' };
    expect((await post('shared-key', body, srv.cookies.planner)).status).toBe(201);
    expect((await post('shared-key', body, srv.cookies.engineer)).status).toBe(201);
    expect(await countTitled('Per account')).toBe(2);
    await srv.q(
      "UPDATE idempotency_keys SET expires_at = NOW(3) - INTERVAL 1 SECOND WHERE idem_key = 'shared-key'",
    );
    const fresh = await post(
      'shared-key',
      { pointId: 1, title: 'After expiry' },
      srv.cookies.planner,
    );
    expect(fresh.status).toBe(201);
    expect(fresh.headers.get('idempotent-replayed')).toBeNull();
  });

  it('ten concurrent sends of one key create one finding; the others replay it or wait', async () => {
    const body = { pointId: 1, title: 'Concurrent' };
    const answers = await Promise.all(Array.from({ length: 10 }, () => post('race', body)));
    const statuses = answers.map((a) => a.status).sort();
    expect(
      statuses.every((s) => s === 201 || s === 409),
      statuses.join(),
    ).toBe(true);
    expect(statuses).toContain(201);
    for (const a of answers.filter((x) => x.status === 409))
      expect(a.headers.get('retry-after')).toBe('1');
    expect(await countTitled('Concurrent')).toBe(1);
    const ids = new Set(
      await Promise.all(
        answers.filter((a) => a.status === 201).map(async (a) => (await a.json()).id),
      ),
    );
    expect(ids.size).toBe(1);
  });

  it('a malformed key is a 400; other creating POSTs take keys, secret-holding ones refuse them', async () => {
    const admin = await srv.signIn('admin');
    expect((await post('x'.repeat(256), { pointId: 1, title: 't' })).status).toBe(400);
    const site = { code: 'IDM', name: 'Idempotent works', timeZone: 'Europe/Berlin' };
    const a = await post('site-1', site, admin, '/api/v1/sites');
    expect(a.status, await a.clone().text()).toBe(201);
    const b = await post('site-1', site, admin, '/api/v1/sites');
    expect(b.status).toBe(201);
    expect((await b.json()).id).toBe((await a.json()).id);
    const gw = await post('gw-1', { siteId: 1, name: 'gw' }, admin, '/api/v1/gateways');
    expect(gw.status).toBe(400);
    expect((await gw.json()).error.code).toBe('idempotency_not_supported');
  });
});
