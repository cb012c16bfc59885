import { beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { newPage, screenshot, signInAs, serverAndBrowserForFile } from '../support/browser.ts';
import { dailyBodies, pointOfTag, postAndAnalyse } from '../support/alert-captures.ts';

const { srv, browser } = serverAndBrowserForFile({ gateway: true });
let pointId: number;
const TAG = 'MFP-P102-MDE-H';

beforeAll(async () => {
  // Eight daily captures at 1482 r/min (1× = 24.7 Hz) with a 1× that grows capture by
  // capture and a 212 Hz tone, so the stack shows a rising peak at one order.
  const bodies = dailyBodies(TAG, 'wf', 8, (i) => [
    { hz: 24.7, peakG: 0.03 + 0.01 * i },
    { hz: 212, peakG: 0.05 },
  ]);
  await postAndAnalyse(srv, srv.key, bodies);
  ({ pointId } = await pointOfTag(srv, TAG));
});

/** Sweeps the pointer along a row of the chart and collects every readout it gave. */
async function sweep(page: Page, yFromBottom: number): Promise<string[]> {
  const chart = page.getByRole('img', { name: /^Waterfall of the last/ });
  // Below the fold the pointer would land on the page's fixed footer: bring the chart in view.
  await chart.scrollIntoViewIfNeeded();
  const box = (await chart.boundingBox())!;
  const readout = page.getByTestId('waterfall-readout');
  const seen: string[] = [];
  // The plot lies between the grid's margins (64 px left, 112 px right).
  for (let x = box.x + 66; x < box.x + box.width - 114; x += 4) {
    await page.mouse.move(x, box.y + box.height - yFromBottom);
    seen.push((await readout.textContent()) ?? '');
  }
  return seen;
}

async function openWaterfall(page: Page) {
  await signInAs(page, srv.url, 'engineer');
  await page.goto(`${srv.url}/points/${pointId}`);
  await page.getByRole('tab', { name: 'Waterfall' }).click();
  await page
    .getByRole('img', { name: /^Waterfall of the last/ })
    .locator('canvas')
    .first()
    .waitFor();
  await page.getByRole('combobox', { name: 'Spectrum' }).selectOption('velocity');
  await page.getByText(/^Every trace has the same amplitude scale/).waitFor();
}

describe('waterfall in a real browser', () => {
  it('reads frequency, order, amplitude and date under the pointer after a span in orders', async () => {
    const page = await newPage(browser, 1280, 960);
    await openWaterfall(page);
    await page.getByRole('combobox', { name: 'Span' }).selectOption('5');
    // 0–5 orders of 24.7 Hz = 0–123.5 Hz of the front trace.
    await page.getByText(/Showing 0 %–\d+ % of the range: 0 Hz to 12\d(\.\d)? Hz/).waitFor();
    const seen = await sweep(page, 72);
    // The front trace's 1× line: 24.7 Hz (order = f / f1×, 1482 r/min = 24.7 Hz) — within a
    // line (df = 1.25 Hz at 10240 samples/s and 8192 samples, or finer).
    const oneX = seen.find((s) =>
      /Taken .* · 2[3-6](\.\d+)? Hz · (0\.9\d|1\.0\d)× · [\d.]+ mm\/s RMS/.test(s),
    );
    expect(oneX, seen.join('\n')).toBeDefined();
    // Back to the 1× position the sweep found, for the screenshot.
    const b = (await page.getByRole('img', { name: /^Waterfall of the last/ }).boundingBox())!;
    await page.mouse.move(b.x + 66 + 4 * seen.indexOf(oneX!), b.y + b.height - 72);
    await screenshot(page, 'waterfall-hover');
    await page.context().close();
  });

  it('is usable at tablet width (820 px): controls wrap, the readout still answers', async () => {
    const page = await newPage(browser, 820, 1100);
    await openWaterfall(page);
    const seen = await sweep(page, 72);
    expect(seen.some((s) => s.startsWith('Taken'))).toBe(true);
    const width = await page.evaluate<number>('document.documentElement.scrollWidth');
    expect(width).toBeLessThanOrEqual(820);
    await screenshot(page, 'waterfall-tablet');
    await page.context().close();
  });
});
