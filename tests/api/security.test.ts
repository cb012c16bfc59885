/** Security baseline (OWASP ASVS 5.0 level 2 where it applies): headers, cookies, logs. */
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import bcrypt from 'bcryptjs';
import { request } from 'node:http';
import { redact } from '../../apps/server/src/lib/logger.ts';
import { passwordTasksRun } from '../../apps/server/src/lib/passwords.ts';
import { uploadsInFlight } from '../../apps/server/src/features/uploads/upload-pool.ts';
import { MAX_SAMPLES } from '@turnstone/contracts/ingest';
import { writeWav } from '@turnstone/dsp';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { snapshotBody } from '../support/signals.ts';

let srv: TestServer;
const logged: string[] = [];
const realWrite = process.stderr.write.bind(process.stderr);
beforeAll(async () => {
  process.stderr.write = ((chunk: string | Uint8Array, ...rest: unknown[]) => {
    logged.push(String(chunk));
    return (realWrite as (c: string | Uint8Array, ...r: unknown[]) => boolean)(chunk, ...rest);
  }) as typeof process.stderr.write;
  srv = await startTestServer({ LOG_LEVEL: 'debug', TRUST_PROXY: '1' });
});
afterAll(async () => {
  process.stderr.write = realWrite;
  await srv?.stop();
});

describe('headers', () => {
  it('sends a strict Content-Security-Policy and the other helmet headers', async () => {
    const res = await srv.call('GET', '/api/health');
    const csp = res.headers.get('content-security-policy') ?? '';
    expect(csp).toContain("default-src 'self'");
    expect(csp).toContain("script-src 'self'");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).toContain("object-src 'none'");
    expect(csp).not.toMatch(/script-src[^;]*unsafe/);
    expect(res.headers.get('x-content-type-options')).toBe('nosniff');
    expect(res.headers.get('x-powered-by')).toBeNull();
    expect(res.headers.get('referrer-policy')).toBeTruthy();
  });

  it('the ingest endpoint answers JSON that is not sniffed, without the page headers', async () => {
    const res = await srv.call('POST', '/api/ingest/v1/snapshots', { body: {} });
    expect(res.status).toBe(401);
    expect(res.headers.get('content-type')).toMatch(/^application\/json/);
    expect(res.headers.get('x-content-type-options')).toBe('nosniff');
    expect(res.headers.get('x-request-id')).toMatch(/^[0-9a-f-]{36}$/);
    expect(res.headers.get('x-powered-by')).toBeNull();
  });
});

describe('cookies', () => {
  it('behind a TLS proxy (TRUST_PROXY and X-Forwarded-Proto: https) the session cookie is Secure', async () => {
    const res = await srv.call('POST', '/api/v1/auth/sign-in', {
      body: { email: 'planner@turnstone.local', password: 'turnstone-demo' },
      headers: { 'x-forwarded-proto': 'https' },
    });
    const cookie = res.headers.get('set-cookie') ?? '';
    expect(cookie).toMatch(/;\s*Secure/i);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
  });

  it('over plain HTTP on loopback it is not marked Secure (the browser would drop it)', async () => {
    const res = await srv.call('POST', '/api/v1/auth/sign-in', {
      body: { email: 'planner@turnstone.local', password: 'turnstone-demo' },
    });
    expect(res.headers.get('set-cookie') ?? '').not.toMatch(/;\s*Secure/i);
  });
});

describe('logs', () => {
  it('the redactor masks secret-bearing fields at any depth', () => {
    const out = JSON.stringify(
      redact({
        password: 'p',
        nested: { apiKey: 'k', token: 't', ok: 1 },
        headers: { authorization: 'Bearer x', cookie: 'c' },
      }),
    );
    expect(out).not.toMatch(/"p"|"k"|"t"|Bearer x|"c"/);
    expect(out).toContain('"ok":1');
  });

  it("a failed query's bound values never reach the log (message or stack)", () => {
    // The shape Drizzle 0.45 gives a failing query (DrizzleQueryError): SQL, then params.
    const err = new Error(
      'Failed query: insert into `mail_outbox` (`text_body`) values (?, ?)\n' +
        'params: Reset: https://x.test/reset-password#token=live-secret-token,other',
    );
    const out = JSON.stringify(redact({ err }));
    expect(out).not.toContain('live-secret-token');
    expect(out).toContain('Failed query: insert into');
    expect(out).toContain('params: [redacted]');
  });

  it('no password, token, cookie or API key reaches the log during real traffic', async () => {
    const password = 'Wr0ng-Secret-Passw0rd';
    await srv.call('POST', '/api/v1/auth/sign-in', {
      body: { email: 'engineer@turnstone.local', password },
    });
    const cookie = await srv.signIn('admin');
    const { apiKey } = await (
      await srv.call('POST', '/api/v1/gateways', { cookie, body: { siteId: 1, name: 'log gw' } })
    ).json();
    await srv.call('POST', '/api/ingest/v1/snapshots', {
      body: snapshotBody('MFP-P101-MDE-H', 'log-1'),
      headers: { authorization: `Bearer ${apiKey}` },
    });
    await srv.call('POST', '/api/ingest/v1/snapshots', {
      body: snapshotBody('MFP-P101-MDE-H', 'log-2'),
      headers: { authorization: `Bearer ${apiKey}x` },
    });
    await srv.call('GET', `/api/v1/me?token=${apiKey}`, { cookie });
    const all = logged.join('');
    expect(all).toContain('"msg":"request"'); // the access log did run
    for (const secret of [
      password,
      apiKey,
      cookie.split('=')[1]!,
      'turnstone-demo',
      srv.ctx.jwtSecret,
    ])
      expect(all).not.toContain(secret);
  });
});

describe('password links under a flood of made-up tokens', () => {
  it('a made-up token costs no bcrypt on any thread, and bcrypt never runs on the event loop', async () => {
    // OWASP ASVS 5.0 V6 (authentication): verify the link before any costly work.
    const onMainThread = [
      vi.spyOn(bcrypt, 'hash'),
      vi.spyOn(bcrypt, 'hashSync'),
      vi.spyOn(bcrypt, 'compare'),
      vi.spyOn(bcrypt, 'compareSync'),
    ];
    try {
      const before = passwordTasksRun();
      for (const path of ['/api/v1/auth/reset-password', '/api/v1/auth/accept-invite']) {
        const res = await srv.call('POST', path, {
          body: { token: 'x'.repeat(43), password: 'a-new-password-1' },
          headers: { 'x-forwarded-for': '198.51.100.7' },
        });
        expect(res.status).toBe(400);
        expect((await res.json()).error.code).toBe('link_invalid');
      }
      expect(passwordTasksRun()).toBe(before);
      // A real check (sign-in) goes to the pool, not the main thread.
      await srv.signIn('admin');
      expect(passwordTasksRun()).toBe(before + 1);
      for (const spy of onMainThread) expect(spy).not.toHaveBeenCalled();
    } finally {
      for (const spy of onMainThread) spy.mockRestore();
    }
  });

  it('both link routes are rate-limited per client, with the seconds left in Retry-After', async () => {
    // Limit: SIGN_IN_MAX_PER_IP (default 50) failed link attempts per window per client.
    for (const path of ['/api/v1/auth/reset-password', '/api/v1/auth/accept-invite']) {
      const ip = path.includes('reset') ? '198.51.100.20' : '198.51.100.21';
      const send = () =>
        srv.call('POST', path, {
          body: { token: 'y'.repeat(43), password: 'a-new-password-1' },
          headers: { 'x-forwarded-for': ip },
        });
      for (let i = 0; i < 50; i++) expect((await send()).status).toBe(400);
      const res = await send();
      expect(res.status).toBe(429);
      expect((await res.json()).error.code).toBe('rate_limited');
      const retry = Number(res.headers.get('retry-after'));
      expect(retry).toBeGreaterThan(0);
      expect(retry).toBeLessThanOrEqual(15 * 60);
      // Another client is not affected.
      const other = await srv.call('POST', path, {
        body: { token: 'y'.repeat(43), password: 'a-new-password-1' },
        headers: { 'x-forwarded-for': '198.51.100.99' },
      });
      expect(other.status).toBe(400);
    }
  });
});

describe('DNS rebinding and demo accounts on a network', () => {
  const withHost = (host: string, method = 'GET', path = '/api/health') =>
    new Promise<{ status: number; body: string }>((resolve, reject) => {
      const req = request(
        `${srv.url}${path}`,
        { method, headers: { host, origin: `http://${host}`, 'content-type': 'application/json' } },
        (res) => {
          let body = '';
          res.on('data', (d) => (body += d));
          res.on('end', () => resolve({ status: res.statusCode ?? 0, body }));
        },
      );
      req.on('error', reject);
      req.end(
        method === 'POST'
          ? JSON.stringify({ email: 'admin@turnstone.local', password: 'turnstone-demo' })
          : undefined,
      );
    });

  it('answers 421 to a host name it is not known by, also for a same-origin sign-in', async () => {
    // A rebound name: the page's Origin and the Host agree, so only the name gives it away.
    const health = await withHost('rebound.example:8080');
    expect(health.status).toBe(421);
    expect(JSON.parse(health.body).error.code).toBe('unknown_host');
    const signIn = await withHost('rebound.example:8080', 'POST', '/api/v1/auth/sign-in');
    expect(signIn.status).toBe(421);
    const page = await withHost('rebound.example', 'GET', '/');
    expect(page.status).toBe(421);
    for (const known of ['localhost', '127.0.0.1', '[::1]'])
      expect((await withHost(`${known}:${srv.port}`)).status).toBe(200);
  });

  it('refuses HOST=0.0.0.0 while demo accounts accept the published password, unless allowed', async () => {
    await expect(startTestServer({ HOST: '0.0.0.0' })).rejects.toThrow(
      /ALLOW_DEMO_PASSWORD_ON_NETWORK/,
    );
    const before = logged.length;
    const open = await startTestServer({
      HOST: '0.0.0.0',
      ALLOW_DEMO_PASSWORD_ON_NETWORK: 'true',
      LOG_LEVEL: 'warn',
    });
    await open.stop();
    expect(logged.slice(before).join('')).toMatch(/Demo accounts accept the demo password/);
  }, 150_000);
});

describe('large uploads', () => {
  let engineer: string;
  let pointId: number;
  const count = async () => {
    const [rows] = await srv.ctx.dbHandle.pool.query('SELECT COUNT(*) AS n FROM snapshots');
    return Number((rows as { n: number }[])[0]!.n);
  };
  const upload = (cookie: string, bytes: Uint8Array | string, name: string) => {
    const form = new FormData();
    form.append('sampleRateHz', '25600');
    const data = typeof bytes === 'string' ? new TextEncoder().encode(bytes) : bytes;
    form.append('file', new Blob([data as Uint8Array<ArrayBuffer>]), name);
    return srv.call('POST', `/api/v1/points/${pointId}/uploads`, { cookie, raw: form });
  };
  /** An upload whose body keeps coming: it holds its slot until `abort()`. */
  const held = (cookie: string) => {
    const boundary = `held${Math.random().toString(16).slice(2)}`;
    const req = request(`${srv.url}/api/v1/points/${pointId}/uploads`, {
      method: 'POST',
      headers: { cookie, 'content-type': `multipart/form-data; boundary=${boundary}` },
    });
    req.on('error', () => undefined);
    req.write(
      `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="held.csv"\r\n` +
        'Content-Type: text/csv\r\n\r\n1\n2\n3\n',
    );
    return { abort: () => req.destroy() };
  };
  const until = async (what: () => boolean) => {
    for (let i = 0; i < 200 && !what(); i++) await new Promise((r) => setTimeout(r, 25));
    expect(what()).toBe(true);
  };

  beforeAll(async () => {
    engineer = await srv.signIn('engineer');
    const [rows] = await srv.ctx.dbHandle.pool.query('SELECT id FROM points WHERE tag = ?', [
      'MFP-P101-MDE-H',
    ]);
    pointId = Number((rows as { id: number }[])[0]!.id);
  });

  it('a CSV past the sample limit is refused 413 with the limit, before its rows are parsed', async () => {
    // A bad value far past the limit: a parser would name it (400); the bound stops first.
    const lines = Array.from({ length: MAX_SAMPLES + 50_000 }, (_, i) =>
      i === MAX_SAMPLES + 40_000 ? 'not-a-number' : String(i % 7),
    );
    const before = await count();
    const res = await upload(engineer, lines.join('\n'), 'long.csv');
    expect(res.status).toBe(413);
    const body = (await res.json()) as { error: { code: string; message: string } };
    expect(body.error.code).toBe('payload_too_large');
    expect(body.error.message).toContain(String(MAX_SAMPLES));
    expect(await count()).toBe(before);
  });

  it('a WAV whose header announces more frames than the limit is refused 413 before decoding', async () => {
    // A NaN sample a decoder would report (400); the frame count from the header comes first.
    const samples = new Float32Array(MAX_SAMPLES + 1);
    samples[10] = NaN;
    const res = await upload(engineer, writeWav(samples, 25600, 'float32'), 'long.wav');
    expect(res.status).toBe(413);
    const body = (await res.json()) as { error: { message: string } };
    expect(body.error.message).toContain(`${MAX_SAMPLES + 1} samples`);
    expect(body.error.message).toContain(String(MAX_SAMPLES));
  });

  it('caps uploads in flight per user (429) and in all (503), with Retry-After, and frees the slots', async () => {
    const admin = await srv.signIn('admin');
    // A third person who may upload: a copy of the demo engineer.
    const pool = srv.ctx.dbHandle.pool;
    await pool.query(
      `INSERT INTO users (email, name, role, password_hash)
       SELECT 'second.engineer@turnstone.local', 'Sam Second', role, password_hash FROM users
       WHERE email = 'engineer@turnstone.local'`,
    );
    await pool.query(
      `INSERT INTO user_sites (user_id, site_id)
       SELECT (SELECT id FROM users WHERE email = 'second.engineer@turnstone.local'), site_id
       FROM user_sites WHERE user_id = (SELECT id FROM users WHERE email = 'engineer@turnstone.local')`,
    );
    const signedIn = await srv.call('POST', '/api/v1/auth/sign-in', {
      body: { email: 'second.engineer@turnstone.local', password: 'turnstone-demo' },
    });
    const third = (signedIn.headers.get('set-cookie') ?? '').split(';')[0]!;
    const good = '1\n2\n'.repeat(300);

    const holds = [held(engineer), held(engineer)];
    await until(() => uploadsInFlight() === 2);
    const mine = await upload(engineer, good, 'third.csv');
    expect(mine.status).toBe(429);
    expect(mine.headers.get('retry-after')).toMatch(/^[1-9]\d*$/);
    expect(((await mine.json()) as { error: { message: string } }).error.message).toMatch(
      /at most 2 at a time/,
    );

    holds.push(held(admin), held(admin));
    await until(() => uploadsInFlight() === 4);
    const all = await upload(third, good, 'fifth.csv');
    expect(all.status).toBe(503);
    expect(all.headers.get('retry-after')).toMatch(/^[1-9]\d*$/);

    // Uploads that break off give their slots back; the next one is taken.
    for (const h of holds) h.abort();
    await until(() => uploadsInFlight() === 0);
    expect((await upload(third, good, 'after.csv')).status).toBe(201);
  });
});

describe('attempt limits that do not lock the owner out', () => {
  const signIn = (password: string, ip: string, cookie?: string) =>
    srv.call('POST', '/api/v1/auth/sign-in', {
      body: { email: 'planner@turnstone.local', password },
      headers: { 'x-forwarded-for': ip },
      cookie,
    });

  it('wrong passwords from one client limit that client, not the owner elsewhere; a known client is never locked out', async () => {
    // OWASP ASVS 5.0 V6.3 / OWASP authentication cheat sheet: lockout must not become a
    // denial of service against the account's owner.
    const owner = await signIn('turnstone-demo', '203.0.113.1');
    expect(owner.status).toBe(200);
    const known = owner.headers
      .getSetCookie()
      .find((c) => c.startsWith('turnstone_client='))!
      .split(';')[0]!;
    for (let i = 0; i < 5; i++)
      expect((await signIn('wrong-guess-1', '198.18.0.1')).status).toBe(401);
    const limited = await signIn('wrong-guess-1', '198.18.0.1');
    expect(limited.status).toBe(429);
    const retry = Number(limited.headers.get('retry-after'));
    expect(retry).toBeGreaterThan(0);
    expect(retry).toBeLessThanOrEqual(15 * 60);
    // The owner, from another address, is not affected.
    expect((await signIn('turnstone-demo', '203.0.113.2')).status).toBe(200);
    // A guess spread over many addresses: the account-wide back-off (4 × 5) stops unknown
    // clients, while the owner's known browser still gets in.
    for (let i = 0; i < 20; i++) await signIn('wrong-guess-2', `198.18.1.${i}`);
    expect((await signIn('turnstone-demo', '198.18.2.1')).status).toBe(429);
    expect((await signIn('turnstone-demo', '203.0.113.3', known)).status).toBe(200);
  });

  it('/account/password allows five wrong current passwords per window, then 429', async () => {
    const cookie = await srv.signIn('operator');
    const change = (currentPassword: string) =>
      srv.call('POST', '/api/v1/account/password', {
        cookie,
        body: { currentPassword, newPassword: 'another-password-1' },
      });
    for (let i = 0; i < 5; i++) expect((await change(`wrong-${i}-password`)).status).toBe(400);
    const limited = await change('wrong-5-password');
    expect(limited.status).toBe(429);
    expect(Number(limited.headers.get('retry-after'))).toBeGreaterThan(0);
  });
});
