import { readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import type { TestServer } from '../support/test-server.ts';
import { newPage, screenshot, signInAs, withServerAndBrowser } from '../support/browser.ts';
import { webDist } from '../../apps/server/src/lib/web-build.ts';

let srv: TestServer;
let browser: Browser;
withServerAndBrowser((s, b) => {
  srv = s;
  browser = b;
});

describe('sign-in in a real browser', () => {
  it('shows the sign-in page to a visitor', async () => {
    const page = await newPage(browser);
    // A visitor's first load asks whether anyone is signed in; the answer must not be an
    // error in the console (a 401 there is logged as "Failed to load resource").
    const errors: string[] = [];
    page.on('console', (m) => {
      if (m.type() === 'error') errors.push(m.text());
    });
    await page.goto(srv.url + '/');
    await page.getByRole('button', { name: /sign in/i }).waitFor();
    expect(page.url()).toContain('/sign-in');
    expect(errors).toEqual([]);
    await screenshot(page, 'sign-in');
    await page.context().close();
  });

  it('a wrong password shows the server message and stays on the page', async () => {
    const page = await newPage(browser);
    await page.goto(srv.url + '/sign-in');
    await page.getByLabel(/e-mail/i).fill('engineer@turnstone.local');
    await page.getByLabel(/password/i).fill('wrong-password');
    await page.getByRole('button', { name: /sign in/i }).click();
    await page.getByText('E-mail address or password is not correct.').waitFor();
    await page.context().close();
  });

  it.each([
    ['admin', ['Fleet']],
    ['engineer', ['Fleet']],
    ['planner', ['Fleet']],
    ['operator', ['Fleet']],
  ])('%s signs in and sees the fleet with the right navigation', async (role, expected) => {
    const page = await newPage(browser);
    await signInAs(page, srv.url, role);
    const nav = page.getByRole('navigation').first();
    for (const label of expected) await nav.getByRole('link', { name: label }).waitFor();
    await page.getByText('Marlow Fen Pumping Station').first().waitFor();
    await screenshot(page, `fleet-${role}`);
    await page.context().close();
  });
});

describe('how the app is sent', () => {
  it('sends its scripts compressed, cached for good under hashed names; a missing one is a 404', async () => {
    const page = await newPage(browser);
    const scripts: { url: string; cache: string; encoding: string }[] = [];
    page.on('response', async (r) => {
      if (r.request().resourceType() !== 'script') return;
      const h = await r.allHeaders();
      scripts.push({
        url: r.url(),
        cache: h['cache-control'] ?? '',
        encoding: h['content-encoding'] ?? '',
      });
    });
    await page.goto(srv.url + '/sign-in');
    await page.getByRole('button', { name: /sign in/i }).waitFor();
    expect(scripts.length).toBeGreaterThan(0);
    for (const s of scripts) {
      // Vite names every built file by its content hash (common practice, no source).
      expect(s.url).toMatch(/\/assets\/[\w.-]+-[\w-]{8}\.js$/);
      expect(s.cache).toContain('immutable');
      expect(s.cache).toContain('max-age=31536000');
    }
    // Small files stay uncompressed (the compression middleware's 1 kB threshold); the
    // larger ones go compressed (Chromium accepts brotli, which the middleware prefers).
    const big = scripts.filter((s) => /\/(react|router)-/.test(s.url));
    expect(big.length).toBe(2);
    for (const s of big) expect(['br', 'gzip']).toContain(s.encoding);
    // The build wrote each large file compressed beside itself; that copy is what is sent
    // (its length), and it decodes to the file byte for byte (fetch decodes gzip, RFC 1952).
    const react = new URL(big.find((s) => s.url.includes('/react-'))!.url).pathname;
    const res = await fetch(srv.url + react, { headers: { 'accept-encoding': 'gzip' } });
    expect(res.headers.get('content-encoding')).toBe('gzip');
    expect(res.headers.get('content-type')).toContain('javascript');
    expect(Number(res.headers.get('content-length'))).toBe(
      statSync(join(webDist, `${react}.gz`)).size,
    );
    const plainFile = readFileSync(join(webDist, react));
    expect(Buffer.from(await res.arrayBuffer()).equals(plainFile)).toBe(true);
    const plain = await fetch(srv.url + react, { headers: { 'accept-encoding': 'identity' } });
    expect(plain.headers.get('content-encoding')).toBeNull();
    expect(Buffer.from(await plain.arrayBuffer()).equals(plainFile)).toBe(true);
    const missing = await fetch(`${srv.url}/assets/no-such-file-00000000.js`);
    expect(missing.status).toBe(404);
    expect(missing.headers.get('content-type')).toContain('application/json');
    await page.context().close();
  });
});
