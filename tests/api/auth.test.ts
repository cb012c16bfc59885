import { describe, expect, it } from 'vitest';
import jwt from 'jsonwebtoken';
import { testServerForFile } from '../support/api-suite.ts';

const srv = testServerForFile();

describe('sign-in', () => {
  it.each(['admin', 'engineer', 'planner', 'operator'])(
    'when %s signs in with the demo password, /me returns that role',
    async (role) => {
      const cookie = await srv.signIn(role);
      expect(cookie).toMatch(/^turnstone_session=/);
      const me = await srv.call('GET', '/api/v1/me', { cookie });
      expect(me.status).toBe(200);
      const body = await me.json();
      expect(body).toMatchObject({ email: `${role}@turnstone.local`, role });
      expect(Array.isArray(body.siteIds)).toBe(true);
    },
  );

  it('names the time zone of screens not tied to a site: the sites’ one zone, else UTC', async () => {
    // The rule stated in contracts/auth.ts (meSchema.timeZone); common practice, no source.
    const zones: Record<string, string> = {};
    for (const role of ['admin', 'engineer', 'planner', 'operator']) {
      const me = await (
        await srv.call('GET', '/api/v1/me', { cookie: await srv.signIn(role) })
      ).json();
      const rows = me.siteIds.length
        ? await srv.q(
            `SELECT DISTINCT time_zone FROM sites WHERE id IN (${me.siteIds.map(() => '?').join(',')})`,
            me.siteIds,
          )
        : [];
      const distinct = rows.map((r) => String(r.time_zone));
      expect(me.timeZone, role).toBe(distinct.length === 1 ? distinct[0] : 'UTC');
      zones[role] = me.timeZone;
    }
    // The demo plant has sites in two zones: both answers occur.
    expect(new Set(Object.values(zones)).size).toBeGreaterThan(1);
    const session = await (
      await srv.call('GET', '/api/v1/auth/session', { cookie: await srv.signIn('operator') })
    ).json();
    expect(session.user.timeZone).toBe(zones.operator);
  });

  it('sets an httpOnly, SameSite=Lax cookie', async () => {
    const res = await srv.call('POST', '/api/v1/auth/sign-in', {
      body: { email: 'planner@turnstone.local', password: 'turnstone-demo' },
    });
    const setCookie = res.headers.get('set-cookie') ?? '';
    expect(setCookie).toMatch(/HttpOnly/i);
    expect(setCookie).toMatch(/SameSite=Lax/i);
  });

  it('when the password is wrong, answers 401 with the same message as for an unknown address', async () => {
    const wrong = await srv.call('POST', '/api/v1/auth/sign-in', {
      body: { email: 'engineer@turnstone.local', password: 'not-the-password' },
    });
    const unknown = await srv.call('POST', '/api/v1/auth/sign-in', {
      body: { email: 'nobody@turnstone.local', password: 'not-the-password' },
    });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    const a = await wrong.json();
    const b = await unknown.json();
    expect(a.error.code).toBe('invalid_credentials');
    expect(a.error.message).toBe(b.error.message);
  });

  it('after too many wrong attempts on one account, answers 429 with Retry-After', async () => {
    const body = { email: 'limit-test@turnstone.local', password: 'wrong-password' };
    const statuses: number[] = [];
    for (let i = 0; i < 7; i++)
      statuses.push((await srv.call('POST', '/api/v1/auth/sign-in', { body })).status);
    expect(statuses.slice(0, 5)).toEqual([401, 401, 401, 401, 401]);
    const limited = await srv.call('POST', '/api/v1/auth/sign-in', { body });
    expect(limited.status).toBe(429);
    expect(Number(limited.headers.get('retry-after'))).toBeGreaterThan(0);
    expect((await limited.json()).error.code).toBe('rate_limited');
  });

  it('when the body is malformed JSON, answers 400 with a clear message', async () => {
    const res = await srv.call('POST', '/api/v1/auth/sign-in', {
      raw: '{"email": "x',
      headers: { 'content-type': 'application/json' },
    });
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error).toMatchObject({ code: 'invalid_json' });
    expect(body.error.message).toMatch(/not valid JSON/);
  });

  it('when fields are missing, answers 400 naming the field', async () => {
    const res = await srv.call('POST', '/api/v1/auth/sign-in', {
      body: { email: 'engineer@turnstone.local' },
    });
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.code).toBe('validation_failed');
    expect(body.error.details.some((d: { path: string }) => d.path === 'password')).toBe(true);
  });
});

describe('sessions', () => {
  it('the session probe answers 200 with the user, or null without a session or after sign-out', async () => {
    const probe = async (cookie?: string) => {
      const res = await srv.call('GET', '/api/v1/auth/session', { cookie });
      expect(res.status).toBe(200);
      expect(res.headers.get('cache-control')).toBe('no-store');
      return (await res.json()).user;
    };
    expect(await probe()).toBeNull();
    expect(await probe('turnstone_session=not-a-token')).toBeNull();
    const cookie = await srv.signIn('planner');
    expect(await probe(cookie)).toMatchObject({
      email: 'planner@turnstone.local',
      role: 'planner',
    });
    await srv.call('POST', '/api/v1/auth/sign-out', { cookie });
    expect(await probe(cookie)).toBeNull();
  });

  it('sign-out really ends the session: the old cookie no longer works', async () => {
    const cookie = await srv.signIn('operator');
    expect((await srv.call('GET', '/api/v1/me', { cookie })).status).toBe(200);
    const out = await srv.call('POST', '/api/v1/auth/sign-out', { cookie });
    expect(out.status).toBe(204);
    const after = await srv.call('GET', '/api/v1/me', { cookie });
    expect(after.status).toBe(401);
    expect((await after.json()).error.code).toBe('unauthenticated');
  });

  it('refuses a token signed with alg none, a tampered token and an expired one', async () => {
    const cookie = await srv.signIn('engineer');
    const token = cookie.split('=')[1]!;
    const [h, p] = token.split('.');
    const payload = JSON.parse(Buffer.from(p!, 'base64url').toString());
    const none = `${Buffer.from(JSON.stringify({ alg: 'none', typ: 'JWT' })).toString('base64url')}.${p}.`;
    const tampered = `${h}.${Buffer.from(JSON.stringify({ ...payload, sub: '1' })).toString('base64url')}.${token.split('.')[2]}`;
    const expired = jwt.sign({ ver: payload.ver }, 'some-other-secret-that-is-long-enough-123', {
      algorithm: 'HS256',
      subject: payload.sub,
      expiresIn: -10,
    });
    for (const t of [none, tampered, expired]) {
      const res = await srv.call('GET', '/api/v1/me', { cookie: `turnstone_session=${t}` });
      expect(res.status).toBe(401);
    }
  });

  it('without a session, a dashboard route answers 401', async () => {
    const res = await srv.call('GET', '/api/v1/fleet');
    expect(res.status).toBe(401);
  });

  it('refuses a cookie-authenticated write from another origin', async () => {
    const cookie = await srv.signIn('planner');
    const res = await srv.call('POST', '/api/v1/auth/sign-out', {
      cookie,
      headers: { origin: 'http://evil.example' },
    });
    expect(res.status).toBe(403);
    expect((await srv.call('GET', '/api/v1/me', { cookie })).status).toBe(200);
  });
});

describe('errors and health', () => {
  it('an unknown API route answers 404 with the JSON error body', async () => {
    const res = await srv.call('GET', '/api/v1/no-such-thing');
    expect(res.status).toBe(404);
    const body = await res.json();
    expect(body).toEqual({
      error: { code: 'not_found', message: expect.stringContaining('/api/v1/no-such-thing') },
    });
  });

  it('health answers ok with the database up', async () => {
    const res = await srv.call('GET', '/api/health');
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ status: 'ok', db: 'up' });
  });
});
