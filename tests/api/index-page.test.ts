/**
 * The web app's page as the server answers it per request (apps/server/src/lib/index-page.ts):
 * the session inside it as JSON, the first screen's code and data preloaded, never cached,
 * and still under the strict Content-Security-Policy.
 */
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ensureWebBuilt, webDist } from '../../apps/server/src/lib/web-build.ts';
import { jsonForHtml, screenModules } from '../../apps/server/src/lib/index-page.ts';
import { formatDate } from '@turnstone/contracts/dates';
import { startTestServer, type TestServer } from '../support/test-server.ts';

let srv: TestServer;
beforeAll(async () => {
  await ensureWebBuilt(() => undefined);
  srv = await startTestServer();
}, 180_000);
afterAll(async () => {
  await srv?.stop();
});

/** The session data block's text, and how many elements of the page end a script. */
function sessionBlock(html: string): { json: string; scriptEnds: number } {
  const m = /<script type="application\/json" id="turnstone-session">([^<]*)<\/script>/.exec(html);
  if (!m) throw new Error('the page carries no session block');
  return { json: m[1]!, scriptEnds: html.split('</script>').length - 1 };
}

/** The addresses of the page's `<link rel=…>`; fonts (`as="font"`) only when `as` asks for them. */
const preloads = (html: string, rel: string, as?: string) =>
  [...html.matchAll(/<link [^>]*>/g)]
    .map((m) => m[0])
    .filter((l) => l.includes(`rel="${rel}"`))
    .filter((l) => (as ? l.includes(`as="${as}"`) : !l.includes('as="font"')))
    .map((l) => /href="([^"]+)"/.exec(l)![1]!);

describe('the page', () => {
  it('signed out: the session is null, nothing personal is preloaded, and it is not stored', async () => {
    const res = await srv.call('GET', '/fleet');
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/^text\/html/);
    expect(res.headers.get('cache-control')).toBe('no-store');
    const html = await res.text();
    expect(JSON.parse(sessionBlock(html).json)).toEqual({ user: null });
    expect(preloads(html, 'preload')).toEqual([]);
  });

  it('keeps the strict Content-Security-Policy: the data block is no script, no inline script is needed', async () => {
    const res = await srv.call('GET', '/fleet', { cookie: await srv.signIn('engineer') });
    const csp = res.headers.get('content-security-policy') ?? '';
    expect(csp).toContain("script-src 'self'");
    expect(csp).not.toMatch(/script-src[^;]*(unsafe|nonce|sha)/);
    const html = await res.text();
    // Every executable script of the page is a file of our own (src="/assets/…").
    for (const tag of html.match(/<script\b[^>]*>/g) ?? [])
      expect(tag).toMatch(/type="application\/json"|src="\/assets\/[\w.-]+\.js"/);
  });

  it('signed in: the session equals /auth/session, and the point page starts its code and data', async () => {
    const cookie = await srv.signIn('engineer');
    const res = await srv.call('GET', '/points/1', { cookie });
    expect(res.headers.get('cache-control')).toBe('no-store');
    const html = await res.text();
    const session = await (await srv.call('GET', '/api/v1/auth/session', { cookie })).json();
    expect(JSON.parse(sessionBlock(html).json)).toEqual(session);
    expect(preloads(html, 'preload')).toEqual([
      '/api/v1/points/1',
      '/api/v1/points/1/analyses?limit=200',
      '/api/v1/quality-notices?pointId=1&limit=10',
      // the trend it opens on, asked without times (the server's default period)
      '/api/v1/points/1/trend?band=overall-velocity',
    ]);
    const scripts = preloads(html, 'modulepreload');
    // The point page's own chunk is among them (its name is the route module's).
    expect(scripts.some((s) => /^\/assets\/point-[\w-]+\.js$/.test(s))).toBe(true);
    for (const s of scripts) {
      expect(existsSync(join(webDist, s))).toBe(true);
      expect(scripts.filter((x) => x === s)).toHaveLength(1);
    }
  });

  it('the trend of the point page is preloaded as the page will ask it, or not at all', async () => {
    const cookie = await srv.signIn('engineer');
    const trends = async (address: string) =>
      preloads(await (await srv.call('GET', address, { cookie })).text(), 'preload').filter((u) =>
        u.includes('/trend'),
      );
    expect(await trends('/points/1?band=bearing-envelope')).toEqual([
      '/api/v1/points/1/trend?band=bearing-envelope',
    ]);
    expect(await trends('/points/1?period=90d')).toEqual([
      '/api/v1/points/1/trend?band=overall-velocity',
    ]);
    // another period is asked with the browser's times; the spectrum view asks no trend
    expect(await trends('/points/1?period=30d')).toEqual([]);
    expect(await trends('/points/1?view=spectrum')).toEqual([]);
    // a band that is no key is not written into the page
    expect(await trends('/points/1?band=%22%3E%3Cscript%3E')).toEqual([]);
  });

  it('a role the data does not admit gets the code but not the data request', async () => {
    const html = await (
      await srv.call('GET', '/users', { cookie: await srv.signIn('operator') })
    ).text();
    expect(preloads(html, 'preload')).toEqual([]);
    const admin = await (
      await srv.call('GET', '/users', { cookie: await srv.signIn('admin') })
    ).text();
    expect(preloads(admin, 'preload')).toEqual(['/api/v1/users']);
  });

  it('the weekly review opened from the navigation starts this week’s review, its sites and findings', async () => {
    const cookie = await srv.signIn('planner');
    const session = (await (await srv.call('GET', '/api/v1/auth/session', { cookie })).json()) as {
      user: { timeZone: string };
    };
    const before = formatDate(new Date(), session.user.timeZone);
    const html = await (await srv.call('GET', '/review', { cookie })).text();
    const after = formatDate(new Date(), session.user.timeZone);
    // The addresses the page asks (get-review.ts: this week in the user's zone, 4 weeks ahead;
    // get-sites.ts; get-findings.ts with no site); a request across midnight may see either day.
    const urls = preloads(html, 'preload');
    expect([before, after]).toContain(/weekEnding=([\d-]+)/.exec(urls[0] ?? '')?.[1]);
    expect(urls).toEqual([
      expect.stringMatching(/^\/api\/v1\/review\?weekEnding=\d{4}-\d{2}-\d{2}&weeksAhead=4$/),
      '/api/v1/sites',
      '/api/v1/findings',
    ]);
    for (const url of urls) expect((await srv.call('GET', url, { cookie })).status).toBe(200);
    // A chosen week or site is the page's to ask; an operator does not read the review.
    const chosen = await (
      await srv.call('GET', '/review?weekEnding=2026-11-27', { cookie })
    ).text();
    expect(preloads(chosen, 'preload')).toEqual([]);
    const operator = await (
      await srv.call('GET', '/review', { cookie: await srv.signIn('operator') })
    ).text();
    expect(preloads(operator, 'preload')).toEqual([]);
  });

  it('a name written to end the element or open a comment stays text inside the JSON', async () => {
    // HTML Living Standard, 4.12.1.3 "Restrictions for contents of script elements": the
    // element ends at the first `</script`, and `<!--` changes how it is parsed.
    const hostile = '</script><script>alert(1)</script><!-- & \u2028 </SCRIPT >';
    await srv.q('UPDATE users SET name = ? WHERE email = ?', [hostile, 'planner@turnstone.local']);
    const html = await (
      await srv.call('GET', '/review', { cookie: await srv.signIn('planner') })
    ).text();
    const block = sessionBlock(html);
    expect(JSON.parse(block.json).user.name).toBe(hostile);
    expect(html.toLowerCase()).not.toContain('<script>alert');
    expect(html).not.toContain('<!-- &');
    // The page's own scripts plus the one data block: no element was ended early.
    const plain = (await (await srv.call('GET', '/review')).text()).split('</script>').length - 1;
    expect(block.scriptEnds).toBe(plain);
  });

  it('the fleet, the first screen, loads no zod: its answer and the session are not parsed there', async () => {
    const html = await (
      await srv.call('GET', '/fleet', { cookie: await srv.signIn('engineer') })
    ).text();
    expect(preloads(html, 'preload')).toEqual(['/api/v1/fleet']);
    const map = JSON.parse(readFileSync(join(webDist, '.vite/modules.json'), 'utf8')) as {
      modules: Record<string, string>;
      imports: Record<string, string[]>;
    };
    // What the page asks for (its scripts and preloads) and what those import statically.
    const files = new Set<string>();
    const visit = (file: string) => {
      if (files.has(file)) return;
      files.add(file);
      map.imports[file]?.forEach(visit);
    };
    for (const m of html.matchAll(/(?:src|href)="\/(assets\/[\w.-]+\.js)"/g)) visit(m[1]!);
    expect([...files].some((f) => f === map.modules['apps/web/src/app/routes/app/fleet.tsx'])).toBe(
      true,
    );
    // vite.config.ts puts zod in a chunk of its own, named after it.
    expect([...files].filter((f) => /(^|\/)zod-[\w-]+\.js$/.test(f))).toEqual([]);
  });

  it('asks for the Latin font files with the page, signed in or not, and each is in the build', async () => {
    for (const cookie of [undefined, await srv.signIn('engineer')]) {
      const html = await (await srv.call('GET', '/fleet', { cookie })).text();
      const fonts = preloads(html, 'preload', 'font');
      // main.tsx imports Inter 400, 500, 600 and Roboto Mono 400, 500.
      expect(fonts.map((f) => f.replace(/-[\w]+\.woff2$/, ''))).toEqual([
        '/assets/inter-latin-400-normal',
        '/assets/inter-latin-500-normal',
        '/assets/inter-latin-600-normal',
        '/assets/roboto-mono-latin-400-normal',
        '/assets/roboto-mono-latin-500-normal',
      ]);
      for (const f of fonts) expect(existsSync(join(webDist, f)), f).toBe(true);
    }
  });

  it('every module the screens preload is still in the build (a moved file would go unnoticed)', () => {
    const map = JSON.parse(readFileSync(join(webDist, '.vite/modules.json'), 'utf8')) as {
      modules: Record<string, string>;
    };
    for (const m of screenModules()) expect(map.modules[m], m).toBeTruthy();
  });

  it('the build made from inside the test runner (NODE_ENV=test) is the production build', () => {
    // React's development build prints this hint (from memory); the production build has none.
    const scripts = readdirSync(join(webDist, 'assets')).filter((f) => f.endsWith('.js'));
    expect(scripts.length).toBeGreaterThan(0);
    for (const f of scripts)
      expect(readFileSync(join(webDist, 'assets', f), 'utf8'), f).not.toContain(
        'Download the React DevTools',
      );
  });

  it('jsonForHtml leaves no character that HTML parsing inside an element reacts to', () => {
    // common practice, no source: escape < > & and the JS line separators as \u sequences.
    const value = { s: '<>&\u2028\u2029"\\', n: 1 };
    const out = jsonForHtml(value);
    expect(out).not.toMatch(/[<>&\u2028\u2029]/);
    expect(JSON.parse(out)).toEqual(value);
  });

  it('an unknown session cookie is a null session, not an error page', async () => {
    const res = await srv.call('GET', '/alerts', { cookie: 'turnstone_session=made-up' });
    expect(res.status).toBe(200);
    expect(JSON.parse(sessionBlock(await res.text()).json)).toEqual({ user: null });
  });
});
