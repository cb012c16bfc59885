/**
 * API tokens of service accounts: issued by an administrator with a role and sites, shown
 * once, kept as a SHA-256 only, sent as `Authorization: Bearer`, independent of the
 * sessions of the person who issued them, revocable, with the last use shown.
 */
import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/test-server.ts';

let srv: TestServer;
let admin: string;
beforeAll(async () => {
  srv = await startTestServer();
  admin = await srv.signIn('admin');
});
afterAll(async () => {
  await srv?.stop();
});

const bearer = (token: string) => ({ authorization: `Bearer ${token}` });

async function issue(body: unknown, cookie = admin) {
  const res = await srv.call('POST', '/api/v1/api-tokens', { cookie, body });
  return { status: res.status, body: await res.json() };
}

describe('issuing', () => {
  it('shows the token once, keeps only its SHA-256, and lists it without the token', async () => {
    const { status, body } = await issue({ name: 'CMMS pull', role: 'planner', siteIds: [1] });
    expect(status, JSON.stringify(body)).toBe(201);
    expect(body.token).toMatch(/^tst_[A-Za-z0-9_-]{43}$/);
    expect(body.token.startsWith(body.tokenPrefix)).toBe(true);
    expect(body).toMatchObject({ name: 'CMMS pull', role: 'planner', siteIds: [1] });
    const [row] = await srv.q<{ token_hash: string }>(
      'SELECT token_hash FROM api_tokens WHERE id = ?',
      [body.id],
    );
    // FIPS 180-4 SHA-256, computed here by node:crypto.
    expect(row!.token_hash).toBe(createHash('sha256').update(body.token).digest('hex'));
    const dump = JSON.stringify(await srv.q('SELECT * FROM api_tokens'));
    expect(dump).not.toContain(body.token);
    const list = await (await srv.call('GET', '/api/v1/api-tokens', { cookie: admin })).json();
    const listed = list.items.find((t: { id: number }) => t.id === body.id);
    expect(listed).toMatchObject({ name: 'CMMS pull', lastUsedAt: null, revokedAt: null });
    expect(JSON.stringify(list)).not.toContain(body.token);
  });

  it('refuses a non-admin, an unknown site and a non-admin token without sites', async () => {
    const engineer = await srv.signIn('engineer');
    expect((await issue({ name: 'x', role: 'planner', siteIds: [1] }, engineer)).status).toBe(403);
    const unknown = await issue({ name: 'x', role: 'planner', siteIds: [999] });
    expect(unknown.status).toBe(400);
    expect(JSON.stringify(unknown.body.error.details)).toContain('999');
    expect((await issue({ name: 'x', role: 'operator', siteIds: [] })).status).toBe(400);
  });

  it('the service account is not among the people and cannot sign in with a password', async () => {
    const { body } = await issue({ name: 'Historian', role: 'operator', siteIds: [1] });
    const users = await (await srv.call('GET', '/api/v1/users', { cookie: admin })).json();
    expect(users.items.map((u: { id: number }) => u.id)).not.toContain(body.userId);
    const [acct] = await srv.q<{ email: string }>('SELECT email FROM users WHERE id = ?', [
      body.userId,
    ]);
    const res = await srv.call('POST', '/api/v1/auth/sign-in', {
      body: { email: acct!.email, password: 'anything-at-all' },
    });
    expect(res.status).toBe(401);
  });
});

describe('using a token', () => {
  it('acts with its role on its sites only', async () => {
    const { body } = await issue({ name: 'Site 1 planner', role: 'planner', siteIds: [1] });
    const me = await (await srv.call('GET', '/api/v1/me', { headers: bearer(body.token) })).json();
    expect(me).toMatchObject({ id: body.userId, role: 'planner', siteIds: [1] });
    const own = await srv.call('GET', '/api/v1/alerts?siteId=1', { headers: bearer(body.token) });
    expect(own.status).toBe(200);
    const other = await srv.call('GET', '/api/v1/findings?siteId=2', {
      headers: bearer(body.token),
    });
    expect(other.status).toBe(403);
    // Planners may not acknowledge alerts (role table), whatever the token.
    const ack = await srv.call('POST', '/api/v1/alerts/acknowledge', {
      headers: bearer(body.token),
      body: { ids: [1], note: 'seen' },
    });
    expect(ack.status).toBe(403);
    const created = await srv.call('POST', '/api/v1/findings', {
      headers: bearer(body.token),
      body: { pointId: 1, title: 'From the CMMS', workOrderRef: 'WO 2026:0042' },
    });
    expect(created.status, await created.clone().text()).toBe(201);
    expect((await created.json()).createdBy).toEqual({ id: body.userId, name: 'Site 1 planner' });
  });

  it('keeps working after the issuing person signs out; shows when it was last used', async () => {
    const own = await srv.signIn('admin');
    const { body } = await issue({ name: 'Outlives', role: 'engineer', siteIds: [1, 2] }, own);
    expect((await srv.call('POST', '/api/v1/auth/sign-out', { cookie: own })).status).toBe(204);
    expect((await srv.call('GET', '/api/v1/me', { cookie: own })).status).toBe(401);
    const res = await srv.call('GET', '/api/v1/alerts', { headers: bearer(body.token) });
    expect(res.status).toBe(200);
    // Signing out ended every session of the admin account, the suite's own cookie too.
    admin = await srv.signIn('admin');
    const list = await (await srv.call('GET', '/api/v1/api-tokens', { cookie: admin })).json();
    const listed = list.items.find((t: { id: number }) => t.id === body.id);
    expect(Date.parse(listed.lastUsedAt)).toBeGreaterThan(Date.parse(listed.createdAt) - 1000);
  });

  it('a revoked, unknown or malformed token is a 401 with WWW-Authenticate (RFC 6750)', async () => {
    const { body } = await issue({ name: 'Short-lived', role: 'operator', siteIds: [1] });
    const revoke = await srv.call('POST', `/api/v1/api-tokens/${body.id}/revoke`, {
      cookie: admin,
    });
    expect(revoke.status).toBe(200);
    expect((await revoke.json()).revokedAt).not.toBeNull();
    for (const token of [body.token, `${body.token.slice(0, -2)}xx`, 'not-a-token']) {
      const res = await srv.call('GET', '/api/v1/alerts', { headers: bearer(token) });
      expect(res.status).toBe(401);
      expect(res.headers.get('www-authenticate')).toMatch(/^Bearer .*error="invalid_token"/);
      expect((await res.json()).error.code).toBe('invalid_token');
    }
    const audit = await (
      await srv.call('GET', '/api/v1/audit?entity=api-token', { cookie: admin })
    ).json();
    expect(audit.items.map((e: { action: string }) => e.action)).toContain('api-token.revoke');
  });
});
