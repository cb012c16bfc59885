/**
 * Browser tests drive Debian's Chromium with playwright-core (no browser download): headless,
 * no sandbox (CI runs as root), background networking off (the machine has no Internet).
 * Screenshots go to test-output/ (git-ignored) for people to look at.
 */
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';
import { chromiumPath } from '@turnstone/db/provision';
import { afterAll, beforeAll } from 'vitest';
import { testServerForFile, type FileServer, type FileServerOptions } from './api-suite.ts';
import { DEMO_PASSWORD, demoEmail, startTestServer, type TestServer } from './test-server.ts';

export const CHROMIUM = chromiumPath();
export const OUTPUT_DIR = join(process.cwd(), 'test-output');

export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: CHROMIUM,
    headless: true,
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
      '--disable-dev-shm-usage',
    ],
  });
}

export async function newPage(browser: Browser, width = 1280, height = 860): Promise<Page> {
  const context = await browser.newContext({ viewport: { width, height } });
  return context.newPage();
}

/** Signs in through the real sign-in form and waits for the app shell. */
export async function signInAs(page: Page, baseUrl: string, role: string): Promise<void> {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel(/e-mail/i).fill(demoEmail(role));
  await page.getByLabel(/password/i).fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: /sign in/i }).click();
  await page.getByRole('navigation').first().waitFor();
}

export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(OUTPUT_DIR, { recursive: true });
  const path = join(OUTPUT_DIR, `${name}.png`);
  await page.screenshot({ path, fullPage: true });
  return path;
}

/**
 * A test file's server and browser: started before its tests (then `ready` runs with both),
 * closed after them.
 */
export function withServerAndBrowser(
  ready: (srv: TestServer, browser: Browser) => void | Promise<void>,
): void {
  let srv: TestServer | undefined;
  let browser: Browser | undefined;
  beforeAll(async () => {
    srv = await startTestServer();
    browser = await launchBrowser();
    await ready(srv, browser);
  });
  afterAll(async () => {
    await browser?.close();
    await srv?.stop();
  });
}

/**
 * A browser test file's server (as testServerForFile makes it: the roles of `o.signIn` signed
 * in, a gateway of site 1 with `o.gateway`) and Chromium, started before the file's tests and
 * closed after them. Both stand for the running ones from `beforeAll` on, so a file keeps them
 * in module constants.
 */
export function serverAndBrowserForFile<Role extends string = never>(
  o: FileServerOptions<Role> = {},
): {
  srv: FileServer<Role>;
  browser: Browser;
  /** A new page (1280 × 860 unless given) signed in as `role` through the sign-in form. */
  pageAs(role: string, width?: number, height?: number): Promise<Page>;
} {
  const srv = testServerForFile(o);
  let running: Browser | undefined;
  beforeAll(async () => {
    running = await launchBrowser();
  });
  afterAll(async () => {
    await running?.close();
  });
  const browser = new Proxy({} as Browser, {
    get(_, prop) {
      if (prop === 'then' || typeof prop === 'symbol') return undefined;
      if (!running) throw new Error('the browser starts in beforeAll: use it in a test');
      const value = Reflect.get(running, prop);
      return typeof value === 'function' ? value.bind(running) : value;
    },
  });
  const pageAs = async (role: string, width?: number, height?: number) => {
    const page = await newPage(browser, width, height);
    await signInAs(page, srv.url, role);
    return page;
  };
  return { srv, browser, pageAs };
}

/** The app scrolls inside <main>; grow the viewport to the content so the shot shows it all. */
export async function tallScreenshot(page: Page, name: string): Promise<void> {
  const viewport = page.viewportSize()!;
  // A string: the root tsconfig has no DOM types.
  const height = await page.evaluate<number>(
    `document.documentElement.clientHeight - document.querySelector('main').clientHeight + document.querySelector('main').scrollHeight`,
  );
  await page.setViewportSize({ width: viewport.width, height: Math.min(height, 8000) });
  await screenshot(page, name);
  await page.setViewportSize(viewport);
}

/** The chart with this accessible name, once its canvas is drawn. */
export async function chartCanvas(page: Page, label: RegExp) {
  const chart = page.getByRole('img', { name: label });
  await chart.waitFor();
  await chart.locator('canvas').first().waitFor();
  return chart;
}
