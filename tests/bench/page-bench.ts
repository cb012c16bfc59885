// How fast the screens open in a real browser, next to how fast their data answers.
// The product is built (`vite build`, as `npm start` does when the build is stale) and served
// as in production by the real server, on a private MariaDB with the demo plant and 3 weeks
// of its history generated through the analysis pipeline. Debian's Chromium (playwright-core).
//
// For each role's main screens:
//   cold   — a new browser context (empty cache) signed in by cookie, navigation to the URL,
//            until the screen's main content shows: a visible table row / tree row, or a chart
//            canvas with pixels drawn on it (not network idle). Measured in the page against
//            the navigation's start (performance.now()).
//   in-app — the previous screen loaded cold in a new context, then a click on the link a user
//            would take (the main navigation, a fleet row), until the same content shows.
//            Measured in the page from the click. The pointer rests on the link 150 ms before
//            the click, as a user's does on the way to clicking.
// Median of RUNS each. `data` is the slowest of the screen's API requests (as the cold load
// made them), each the median of RUNS requests from Node with the same cookie, in this run;
// the ratios page/data show how much of the wait is the page rather than the data.
// `JS gzip` is what the first screen (fleet, cold) loaded: every script the browser fetched,
// gzip-compressed from the build (level 9, as a server would send it).
// Run: npx tsx tests/bench/page-bench.ts   (or npm run bench). Prints figures, no pass/fail.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { launchBrowser } from '../support/browser.ts';
import { signInCookie, startBenchServer } from './bench-support.ts';
import { webDist } from '../../apps/server/src/lib/web-build.ts';

const RUNS = Number(process.env.PAGE_BENCH_RUNS ?? 5);
const HOVER_MS = 150;
// PAGE_BENCH_ONLY: a comma-separated list of screen names ("point · trend,limits") to measure
// only those (the engineer's first screen is then not measured for its JavaScript).
const ONLY = (process.env.PAGE_BENCH_ONLY ?? '')
  .split(',')
  .map((x) => x.trim())
  .filter(Boolean);

interface Target {
  /** CSS of what shows the screen's content; `chart: true` means a canvas drawn on. */
  css: string;
  chart?: boolean;
}

interface Screen {
  name: string;
  role: string;
  path: string;
  target: Target;
  /** Cold: after load, click this (a tab) first; in-app: click it on `from`. */
  thenClick?: string;
  /**
   * In-app: the screen left from, and the link clicked there; or, where no link leads to
   * the screen, `go`: a client-side navigation to that address (history entry + popstate).
   */
  from: { path: string; target: Target; link?: string; go?: string };
}

const fleetRow: Target = { css: '[role="tree"] [role="treeitem"]' };
const tableRow: Target = { css: 'main table tbody tr' };
const nav = (label: string) => `nav a:text-is("${label}")`;

function screens(ids: { machineId: number; pointId: number; tag: string }): Screen[] {
  const fromFleet = (link: string) => ({ path: '/fleet', target: fleetRow, link });
  // The fleet searched for the point's tag, so its row is in view (the tree is virtualised).
  const fromSearch = (link: string) => ({
    path: `/fleet?q=${encodeURIComponent(ids.tag)}`,
    target: fleetRow,
    link,
  });
  const fromAlerts = { path: '/alerts', target: tableRow, link: nav('Fleet') };
  /** A list screen (its first table row is the target), reached from the fleet by its menu link. */
  const listFromFleet = (name: string, role: string, path: string, link: string): Screen => ({
    name,
    role,
    path,
    target: tableRow,
    from: fromFleet(nav(link)),
  });
  const point = `/points/${ids.pointId}`;
  const trendChart: Target = {
    css: 'main [role="img"][aria-label^="Trend of"] canvas',
    chart: true,
  };
  return [
    { name: 'fleet', role: 'engineer', path: '/fleet', target: fleetRow, from: fromAlerts },
    listFromFleet('alerts', 'engineer', '/alerts', 'Alerts'),
    {
      name: 'machine',
      role: 'engineer',
      path: `/machines/${ids.machineId}`,
      target: tableRow,
      from: fromSearch(`[role="tree"] a[href="/machines/${ids.machineId}"]`),
    },
    {
      name: 'point · trend',
      role: 'engineer',
      path: point,
      target: trendChart,
      from: fromSearch(`[role="tree"] a[href="${point}"]`),
    },
    {
      name: 'point · spectrum',
      role: 'engineer',
      path: point,
      thenClick: 'main [role="tab"]:text-is("Spectrum")',
      target: { css: 'main [role="img"][aria-label*="spectrum"] canvas', chart: true },
      from: { path: point, target: trendChart, link: 'main [role="tab"]:text-is("Spectrum")' },
    },
    {
      name: 'limits',
      role: 'engineer',
      path: `/limits?point=${ids.pointId}`,
      target: { css: 'main form input[inputmode], main form input[type="number"]' },
      from: { path: '/fleet', target: fleetRow, go: `/limits?point=${ids.pointId}` },
    },
    {
      name: 'review',
      role: 'planner',
      path: '/review',
      target: { css: 'main table.review-table tbody tr' },
      from: fromFleet(nav('Review')),
    },
    { name: 'fleet', role: 'operator', path: '/fleet', target: fleetRow, from: fromAlerts },
    listFromFleet('alerts', 'operator', '/alerts', 'Alerts'),
    listFromFleet('users', 'admin', '/users', 'Users'),
    {
      name: 'setup',
      role: 'admin',
      path: '/setup',
      target: { css: 'nav[aria-label="Plant tree"] button' },
      from: fromFleet(nav('Setup')),
    },
    listFromFleet('gateways', 'admin', '/gateways', 'Gateways'),
    listFromFleet('audit log', 'admin', '/audit', 'Audit log'),
  ];
}

/**
 * Runs in the page on every animation frame: the time (performance.now()) at which the target
 * first shows, or false. A chart counts once its canvas has pixels on it.
 */
/* eslint-disable @typescript-eslint/no-explicit-any -- page code; the root tsconfig has no DOM types */
function shownAt(t: Target): number | false {
  const doc = (globalThis as any).document;
  for (const el of doc.querySelectorAll(t.css)) {
    const r = el.getBoundingClientRect();
    if (r.width <= 0 || r.height <= 0) continue;
    if (t.chart) {
      const probe = doc.createElement('canvas');
      probe.width = 64;
      probe.height = 32;
      const ctx = probe.getContext('2d');
      ctx.drawImage(el, 0, 0, 64, 32);
      const px: Uint8ClampedArray = ctx.getImageData(0, 0, 64, 32).data;
      let drawn = false;
      for (let i = 3; i < px.length; i += 4)
        if (px[i]! > 0) {
          drawn = true;
          break;
        }
      if (!drawn) continue;
    }
    return performance.now() - ((globalThis as any).__benchT0 ?? 0);
  }
  return false;
}

function clickTimed(el: any) {
  (globalThis as any).__benchT0 = performance.now();
  el.click();
}
function goTimed(href: string) {
  const w = globalThis as any;
  w.__benchT0 = performance.now();
  w.history.pushState(null, '', href);
  w.dispatchEvent(new w.PopStateEvent('popstate'));
}
/* eslint-enable @typescript-eslint/no-explicit-any */

async function waitShown(page: Page, target: Target): Promise<number> {
  const handle = await page.waitForFunction(shownAt, target, {
    polling: 'raf',
    timeout: 30_000,
  });
  return (await handle.jsonValue()) as number;
}

async function contextFor(browser: Browser, url: string, cookie: string): Promise<BrowserContext> {
  const context = await browser.newContext({ viewport: { width: 1280, height: 860 } });
  const [name, value] = cookie.split('=') as [string, string];
  await context.addCookies([{ name, value, url }]);
  return context;
}

interface ColdResult {
  ms: number;
  scripts: string[];
  apis: string[];
}

async function cold(browser: Browser, url: string, cookie: string, s: Screen): Promise<ColdResult> {
  const context = await contextFor(browser, url, cookie);
  const page = await context.newPage();
  const scripts: string[] = [];
  const apis: string[] = [];
  page.on('request', (r) => {
    const u = new URL(r.url());
    if (r.resourceType() === 'script') scripts.push(u.pathname);
    if (u.pathname.startsWith('/api/')) apis.push(u.pathname + u.search);
  });
  await page.goto(url + s.path, { waitUntil: 'commit' });
  if (s.thenClick) await page.locator(s.thenClick).first().click();
  const ms = await waitShown(page, s.target);
  const seen = { scripts: [...scripts], apis: [...apis] };
  await context.close();
  return { ms, ...seen };
}

async function inApp(browser: Browser, url: string, cookie: string, s: Screen): Promise<number> {
  const context = await contextFor(browser, url, cookie);
  const page = await context.newPage();
  await page.goto(url + s.from.path, { waitUntil: 'commit' });
  await waitShown(page, s.from.target);
  if (s.from.link) {
    const link = page.locator(s.from.link).first();
    await link.hover();
    await page.waitForTimeout(HOVER_MS);
    // The click happens in the page, right after the clock starts there.
    await link.evaluate(clickTimed);
  } else {
    await page.evaluate(goTimed, s.from.go!);
  }
  const ms = await waitShown(page, s.target);
  await context.close();
  return ms;
}

async function apiMedian(url: string, path: string, cookie: string): Promise<number> {
  const times: number[] = [];
  await fetch(url + path, { headers: { cookie } }).then((r) => r.arrayBuffer());
  for (let i = 0; i < RUNS; i++) {
    const t = performance.now();
    const r = await fetch(url + path, { headers: { cookie, 'accept-encoding': 'gzip' } });
    await r.arrayBuffer();
    times.push(performance.now() - t);
    if (r.status >= 400) throw new Error(`${path} answered ${r.status}`);
  }
  return median(times);
}

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)]!;
};

function gzipOfScripts(paths: string[]): number {
  let total = 0;
  for (const p of new Set(paths)) {
    if (!p.startsWith('/assets/')) continue;
    total += gzipSync(readFileSync(join(webDist, p)), { level: 9 }).length;
  }
  return total;
}

async function main() {
  const t0 = performance.now();
  const bench = await startBenchServer('page', {
    BUILD_WEB: 'true',
    DEMO_HISTORY_WEEKS: '3',
    HOST: '127.0.0.1',
  });
  let browser: Browser | undefined;
  try {
    const url = bench.srv.url;
    const pool = bench.srv.ctx.dbHandle.pool;
    // The machine with the most captures and its first point: the demo story's busiest.
    const [rows] = (await pool.query(
      `SELECT p.id AS pointId, p.machine_id AS machineId, p.tag FROM points p
       JOIN analyses a ON a.point_id = p.id GROUP BY p.id ORDER BY COUNT(*) DESC, p.id LIMIT 1`,
    )) as unknown as [{ pointId: number; machineId: number; tag: string }[]];
    const ids = {
      pointId: Number(rows[0]!.pointId),
      machineId: Number(rows[0]!.machineId),
      tag: rows[0]!.tag,
    };
    console.log(
      `demo plant with 3 weeks of history ready in ${((performance.now() - t0) / 1000).toFixed(0)} s; ` +
        `point ${ids.pointId}, machine ${ids.machineId}`,
    );
    const cookies: Record<string, string> = {};
    for (const role of ['engineer', 'planner', 'operator', 'admin'])
      cookies[role] = await signInCookie(url, `${role}@turnstone.local`);
    browser = await launchBrowser();

    const table: string[][] = [];
    let firstScreenGzip = 0;
    let firstScreenScripts = 0;
    for (const s of screens(ids)) {
      if (ONLY.length > 0 && !ONLY.includes(s.name)) continue;
      const cookie = cookies[s.role]!;
      const colds: ColdResult[] = [];
      // One unmeasured load first: the server's and the browser's first-use costs.
      await cold(browser, url, cookie, s);
      for (let i = 0; i < RUNS; i++) colds.push(await cold(browser, url, cookie, s));
      const ins: number[] = [];
      for (let i = 0; i < RUNS; i++) ins.push(await inApp(browser, url, cookie, s));
      const apis = [...new Set(colds[0]!.apis)];
      let data = 0;
      let slowest = '';
      for (const a of apis) {
        const ms = await apiMedian(url, a, cookie);
        if (ms > data) [data, slowest] = [ms, a];
      }
      if (s.name === 'fleet' && s.role === 'engineer') {
        firstScreenGzip = gzipOfScripts(colds[0]!.scripts);
        firstScreenScripts = new Set(colds[0]!.scripts).size;
      }
      const c = median(colds.map((r) => r.ms));
      const n = median(ins);
      table.push([
        `${s.role} ${s.name}`,
        c.toFixed(0),
        n.toFixed(0),
        data.toFixed(1),
        (c / data).toFixed(1),
        (n / data).toFixed(1),
        `${apis.length} · ${slowest.replace(/\?.*/, '').replace(/\/\d+/g, '/:id')}`,
      ]);
      console.log(`  ${s.role} ${s.name}: cold ${c.toFixed(0)} ms, in-app ${n.toFixed(0)} ms`);
    }
    const head = [
      'screen',
      'cold ms',
      'in-app ms',
      'data ms',
      'cold/data',
      'in-app/data',
      'API requests · slowest',
    ];
    const widths = head.map((h, i) => Math.max(h.length, ...table.map((r) => r[i]!.length)));
    const line = (r: string[]) =>
      r
        .map((x, i) => (i === 0 || i === 6 ? x.padEnd(widths[i]!) : x.padStart(widths[i]!)))
        .join('  ');
    console.log(`\nmedian of ${RUNS}; targets: cold ≤ 500 ms, in-app ≤ 150 ms`);
    console.log(line(head));
    for (const r of table) console.log(line(r));
    console.log(
      `\nfirst screen (engineer fleet, cold): ${firstScreenScripts} scripts, ` +
        `${(firstScreenGzip / 1024).toFixed(1)} KiB JavaScript gzip (target ≤ 100 KB)`,
    );
  } finally {
    await browser?.close();
    await bench.stop();
  }
}

main().catch((err) => {
  console.error(err);
  process.exitCode = 1;
});
