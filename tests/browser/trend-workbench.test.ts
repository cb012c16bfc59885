/**
 * The analyst's trend in a real browser: an engineer opens a point's trend, adds a second
 * band of the point and a band of another point of the machine (one y axis per unit, the
 * selection in the address), points at an event on the chart and reads its text, reads the
 * acknowledgement's who and note from the events list by keyboard, zooms to a range and reads
 * the values behind it; then the same address at tablet width (820 px) without sideways
 * scrolling. Data: captures of P-101 (drive end H rising into alert; non-drive end H) made
 * through the gateway API and analysed by the real worker, an acknowledgement, a finding, a
 * limit change and a WAV upload through the dashboard API.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { trendResponseSchema } from '@turnstone/contracts/trend';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { chartCanvas, launchBrowser, newPage, screenshot, signInAs } from '../support/browser.ts';
import {
  acknowledgeAndOpenFinding,
  captureVelocities,
  gatewayKey,
} from '../support/alert-captures.ts';
import { routeRecordingForm } from '../support/signals.ts';

let srv: TestServer;
let browser: Browser;
let pointId = 0;
let otherId = 0;
const TAG = 'MFP-P101-MDE-H';
const OTHER = 'MFP-P101-MNDE-H';
const HOUR = 3600_000;
const t0 = Date.now() - 3 * 86_400_000;
let engineer = '';

beforeAll(async () => {
  srv = await startTestServer();
  browser = await launchBrowser();
  const key = await gatewayKey(srv, 1);
  // P-101 is ISO 20816-3 group 2, rigid: template alert 2.8 mm/s, danger 4.5 mm/s,
  // persistence 2 (template defaults, common practice, no source): raised at the 4th capture.
  await captureVelocities(srv, key, TAG, [1.0, 1.0, 3.5, 3.5, 3.5], t0);
  await captureVelocities(srv, key, OTHER, [0.9, 1.0, 1.1], t0);
  // a day ago: two more on each (the alert stays raised), so a zoom can leave them out
  const t1 = Date.now() - 86_400_000;
  await captureVelocities(srv, key, TAG, [3.6, 3.6], t1);
  await captureVelocities(srv, key, OTHER, [1.2], t1);
  const ids = await srv.q<{ id: number; tag: string }>(
    'SELECT id, tag FROM points WHERE tag IN (?, ?)',
    [TAG, OTHER],
  );
  pointId = Number(ids.find((r) => r.tag === TAG)!.id);
  otherId = Number(ids.find((r) => r.tag === OTHER)!.id);
  engineer = await srv.signIn('engineer');
  await acknowledgeAndOpenFinding(srv, pointId, {
    engineer,
    planner: await srv.signIn('planner'),
    note: 'Soft foot suspected, shims ordered',
    title: 'Check motor feet for soft foot',
  });
  const limits = await (
    await srv.call('GET', `/api/v1/points/${pointId}/limits`, { cookie: engineer })
  ).json();
  const put = await srv.call('PUT', `/api/v1/points/${pointId}/limits`, {
    cookie: engineer,
    body: {
      bands: (limits.bands as { key: string }[]).map((b) =>
        b.key === 'overall-velocity' ? { ...b, alertLevel: 3.2, dangerLevel: 5.1 } : b,
      ),
      reason: 'maker levels after the shim job',
    },
  });
  expect(put.status).toBe(200);
  // A route recording from a portable instrument: 0.3 g peak at 24.7 Hz, 16-bit at ±5 V.
  const form = routeRecordingForm({
    tones: [{ hz: 24.7, peakG: 0.03 }],
    seed: 3,
    speedRpm: 1482,
    takenAt: new Date(t0 + 2.5 * HOUR).toISOString(),
    fileName: 'route-p101-de.wav',
  });
  const up = await srv.call('POST', `/api/v1/points/${pointId}/uploads`, {
    cookie: engineer,
    raw: form,
  });
  expect(up.status).toBe(201);
  await createWorker(srv.ctx, { owner: 'trend-workbench' }).drain();
}, 180_000);
afterAll(async () => {
  await browser?.close();
  await srv?.stop();
});

/** The API's own trend of a band over the last 7 days (what the page asks for). */
async function apiTrend(id: number, band: string) {
  const from = new Date(Date.now() - 7 * 86_400_000).toISOString();
  const res = await srv.call('GET', `/api/v1/points/${id}/trend?band=${band}&from=${from}`, {
    cookie: engineer,
  });
  expect(res.status).toBe(200);
  return trendResponseSchema.parse(await res.json());
}

/**
 * Where the chart draws an event symbol of `rgb` on its strip (centred 26 px from the chart's
 * top, trend-series-option's STRIP_Y): the middle of the first run of such pixels, in page
 * pixels.
 */
async function stripSymbol(page: Page, rgb: [number, number, number]) {
  const chart = page.getByRole('img', { name: /^Trend of / });
  const box = (await chart.boundingBox())!;
  const x = await page.evaluate<number>(`(() => {
    const canvas = document.querySelector('[role="img"][aria-label^="Trend of "] canvas');
    const ratio = canvas.width / canvas.getBoundingClientRect().width;
    const y = Math.round(26 * ratio);
    const row = canvas.getContext('2d').getImageData(0, y, canvas.width, 1).data;
    const [r, g, b] = ${JSON.stringify(rgb)};
    const hits = [];
    for (let i = 0; i < canvas.width; i++) {
      const d = Math.abs(row[4 * i] - r) + Math.abs(row[4 * i + 1] - g) + Math.abs(row[4 * i + 2] - b);
      if (d < 40) hits.push(i);
    }
    if (hits.length === 0) return -1;
    const run = hits.filter((h) => h - hits[0] < 16);
    return (run[0] + run[run.length - 1]) / 2 / ratio;
  })()`);
  expect(x, 'an event symbol of that colour on the strip').toBeGreaterThan(0);
  return { x: box.x + x, y: box.y + 26 };
}

describe('the analyst trend', () => {
  let shared = '';

  it('adds a second band and a band of another point, reads an event by pointer and by keyboard, and the values of a zoomed range', async () => {
    const page = await newPage(browser, 1280, 900);
    await signInAs(page, srv.url, 'engineer');
    await page.goto(`${srv.url}/points/${pointId}?period=7d`);
    await chartCanvas(page, /^Trend of Overall velocity .* in mm\/s/);

    // A second band of the point: 1× (same unit, same axis).
    const picker = page.getByRole('group', { name: 'Add a series' });
    await picker.getByLabel('Series band').selectOption('order-1x');
    await picker.getByRole('button', { name: 'Add series' }).click();
    await page.waitForURL(new RegExp(`with=${pointId}%3Aorder-1x`));
    // A band of another point of the machine, in another unit (its own axis).
    await picker.getByLabel('Add from point').selectOption(String(otherId));
    await picker.getByLabel('Series band').selectOption('overall-acceleration');
    await picker.getByRole('button', { name: 'Add series' }).click();
    await chartCanvas(page, new RegExp(`with .*${OTHER} · Overall acceleration`));
    const legend = page.getByRole('list', { name: 'Series on the chart' });
    await legend.getByText(`${OTHER} · Overall acceleration`).waitFor();
    expect(await legend.getByRole('listitem').count()).toBe(3);
    expect(await legend.textContent()).toContain('(g)');
    shared = page.url();
    expect(shared).toContain(`with=${otherId}%3Aoverall-acceleration`);
    await page.waitForTimeout(400);
    await screenshot(page, 'trend-workbench-series');

    // Pointing at the raised alert's symbol (amber triangle) shows its text by the chart.
    const raised = await stripSymbol(page, [0xa8, 0x74, 0x1a]);
    await page.mouse.move(raised.x, raised.y);
    const tip = page.getByRole('tooltip');
    await tip.waitFor();
    expect(await tip.textContent()).toContain('Alert raised');
    await screenshot(page, 'trend-workbench-hover-event');
    await page.mouse.move(5, 5);

    // The events list, by keyboard: the acknowledgement with who and the note, the finding
    // with its state, the limit change (old → new) and the upload.
    const events = page.getByRole('region', { name: 'Events on this trend' });
    const ack = events.getByRole('button', { name: /acknowledged by/ });
    await ack.focus();
    await tip.waitFor();
    const tipText = (await tip.textContent()) ?? '';
    expect(tipText).toContain('Soft foot suspected, shims ordered');
    expect(tipText).toMatch(/Alert acknowledged by \S/);
    const text = (await events.textContent()) ?? '';
    expect(text).toContain('Finding (open): Check motor feet for soft foot');
    // the stored levels 2.8 → 3.2 and 4.5 → 5.1 mm/s, by the number rule (3 significant digits)
    expect(text).toMatch(
      /Limits changed by .+: alert 2\.80 → 3\.20 mm\/s, danger 4\.50 → 5\.10 mm\/s/,
    );
    expect(text).toContain('maker levels after the shim job');
    expect(text).toMatch(/Portable-instrument capture “route-p101-de\.wav” uploaded by \S/);
    await screenshot(page, 'trend-workbench-events');

    // The range table: the whole period first — every value of the three series, the first
    // twelve shown and the rest counted.
    const [main, oneX, other] = await Promise.all([
      apiTrend(pointId, 'overall-velocity'),
      apiTrend(pointId, 'order-1x'),
      apiTrend(otherId, 'overall-acceleration'),
    ]);
    const total = main.items.length + oneX.items.length + other.items.length;
    expect(main.items.length).toBe(8); // seven gateway captures and the upload
    const table = page.getByRole('table', { name: 'Values in the selected range' });
    await table.waitFor();
    expect(await table.locator('tbody tr').count()).toBe(12);
    expect(await page.getByTestId('range-more').textContent()).toBe(
      `${total - 12} more ${total - 12 === 1 ? 'value' : 'values'} in this range`,
    );
    const tableText = (await table.textContent()) ?? '';
    expect(tableText).toContain('Portable instrument (upload)');
    // Zoom in twice and move to the start: the first quarter of the period, which holds the
    // first captures and not those of a day ago; fewer values, each within the stated range.
    const zoom = page.getByRole('group', { name: 'Zoom the trend' });
    await zoom.getByRole('button', { name: 'Zoom in' }).click();
    await zoom.getByRole('button', { name: 'Zoom in' }).click();
    for (let i = 0; i < 4; i++) await zoom.getByRole('button', { name: 'Move left' }).click();
    await zoom.getByText(/^Showing 0 %–25 % of the range/).waitFor();
    await page.waitForFunction(
      `Number(document.querySelector('[data-testid="range-more"]')?.textContent.split(' ')[0] ?? 0) < ${total - 12}`,
    );
    await page.waitForTimeout(300);
    const csv = page.getByRole('link', { name: /^CSV of this range: Overall velocity/ });
    const href = (await csv.getAttribute('href')) ?? '';
    const url = new URL(href, srv.url);
    expect(url.pathname).toBe(`/api/v1/points/${pointId}/trend.csv`);
    const from = Date.parse(url.searchParams.get('from')!);
    const to = Date.parse(url.searchParams.get('to')!);
    expect(to - from).toBeLessThan((7 * 86_400_000) / 3);
    const inRange = [main, oneX, other].reduce(
      (n, d) => n + d.items.filter((i) => Date.parse(i.t) >= from && Date.parse(i.t) <= to).length,
      0,
    );
    // the first captures are in it, those of a day ago are not: the table lists exactly the
    // values of the three series inside the window
    expect(inRange).toBeGreaterThan(0);
    expect(inRange).toBeLessThan(total);
    expect(await table.locator('tbody tr').count()).toBe(Math.min(12, inRange));
    if (inRange > 12)
      expect(await page.getByTestId('range-more').textContent()).toBe(
        `${inRange - 12} more ${inRange - 12 === 1 ? 'value' : 'values'} in this range`,
      );
    else expect(await page.getByTestId('range-more').count()).toBe(0);
    // the CSV of the range answers with the values of that range
    const res = await srv.call('GET', `${url.pathname}${url.search}`, { cookie: engineer });
    expect(res.status).toBe(200);
    const lines = (await res.text()).trim().split('\n');
    expect(lines.length - 1).toBe(
      main.items.filter((i) => Date.parse(i.t) >= from && Date.parse(i.t) <= to).length,
    );
    await table.scrollIntoViewIfNeeded();
    await screenshot(page, 'trend-workbench-range');
    await page.context().close();
  });

  it('opens on the default period with the one trend request the server preloaded with the page', async () => {
    const page = await newPage(browser, 1280, 900);
    await signInAs(page, srv.url, 'engineer');
    // The requests the browser makes for the trend: the page's own fetch is answered by the
    // preload (it makes no request of its own) only when it asks the very same address.
    const asked: string[] = [];
    page.on('request', (r) => {
      const u = new URL(r.url());
      if (u.pathname.endsWith('/trend')) asked.push(`${r.resourceType()} ${u.pathname}${u.search}`);
    });
    await page.goto(`${srv.url}/points/${pointId}`);
    const res = await srv.call('GET', `/api/v1/points/${pointId}/trend?band=overall-velocity`, {
      cookie: engineer,
    });
    const api = trendResponseSchema.parse(await res.json());
    // seven gateway captures and the upload, all within the default 90 days
    expect(api.items.length).toBe(8);
    await chartCanvas(
      page,
      new RegExp(`^Trend of Overall velocity .* in mm/s, ${api.items.length} values$`),
    );
    await page.waitForTimeout(300);
    expect(asked).toEqual([`other /api/v1/points/${pointId}/trend?band=overall-velocity`]);
    await screenshot(page, 'trend-workbench-default-period');
    await page.context().close();
  });

  it('the shared address opens the same series, usable at tablet width without sideways scrolling', async () => {
    const page = await newPage(browser, 820, 1100);
    await signInAs(page, srv.url, 'engineer');
    await page.goto(shared);
    await chartCanvas(page, new RegExp(`with .*${OTHER} · Overall acceleration`));
    const legend = page.getByRole('list', { name: 'Series on the chart' });
    expect(await legend.getByRole('listitem').count()).toBe(3);
    await page.getByRole('table', { name: 'Values in the selected range' }).waitFor();
    const overflow = await page.evaluate<number>(
      `document.documentElement.scrollWidth - document.documentElement.clientWidth`,
    );
    expect(overflow).toBeLessThanOrEqual(0);
    await page.waitForTimeout(400);
    await screenshot(page, 'trend-workbench-tablet');
    // A removed series leaves the address.
    await legend
      .getByRole('listitem')
      .nth(1)
      .getByRole('button', { name: /^Remove / })
      .click();
    await page.waitForFunction(`!location.search.includes('order-1x')`);
    expect(await legend.getByRole('listitem').count()).toBe(2);
    await page.context().close();
  });
});
