/**
 * An engineer switches to imperial units on the Account screen and reads in/s on the point
 * page and the limits screen; a level typed in in/s is stored in mm/s. 1 in = 25.4 mm
 * exactly (NIST SP 811 appendix B; 1959 international yard and pound agreement).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { launchBrowser, newPage, screenshot, signInAs } from '../support/browser.ts';
import { captureVelocities, gatewayKey } from '../support/alert-captures.ts';

let srv: TestServer;
let browser: Browser;
const TAG = 'MFP-P102-MDE-H';
let pointId = 0;
beforeAll(async () => {
  srv = await startTestServer();
  browser = await launchBrowser();
  await captureVelocities(srv, await gatewayKey(srv, 1), TAG, [1.5, 1.6, 1.7]);
  const [p] = await srv.q<{ id: number }>('SELECT id FROM points WHERE tag = ?', [TAG]);
  pointId = p!.id;
}, 60_000);
afterAll(async () => {
  await browser?.close();
  await srv?.stop();
});

describe('unit system', () => {
  it('when an engineer switches to imperial, the point page and the limits screen read in/s, and a typed level is stored in mm/s', async () => {
    const page = await newPage(browser, 1280, 900);
    await signInAs(page, srv.url, 'engineer');
    await page.goto(`${srv.url}/account`);
    const imperial = page.getByRole('radio', { name: 'Imperial (in/s, mil)' });
    await imperial.click();
    await page.waitForFunction(
      `document.querySelector('[role="radio"][aria-checked="true"]')?.textContent?.includes('Imperial') === true`,
    );
    await screenshot(page, 'units-account-imperial');

    // The point page: the header's velocity and displacement in in/s and mil, the trend's
    // levels too. P-102's template alert 2.8 mm/s is 0.110 in/s (÷ 25.4 by hand).
    await page.goto(`${srv.url}/points/${pointId}`);
    const velocity = page.locator('dt', { hasText: /^Velocity RMS/ }).locator('+ dd');
    await velocity.waitFor();
    const shown = (await velocity.textContent()) ?? '';
    expect(shown).toMatch(/^0\.0\d{3} in\/s$/);
    const cookie = await srv.signIn('engineer');
    const detail = await (await srv.call('GET', `/api/v1/points/${pointId}`, { cookie })).json();
    // Three significant digits of the stored mm/s value ÷ 25.4 (by hand: ~1.7 mm/s → ~0.067).
    expect(parseFloat(shown)).toBeCloseTo(detail.latest.overall.velocityRmsMmS / 25.4, 4);
    const displacement = page.locator('dt', { hasText: /^Displ\. pk-pk/ }).locator('+ dd');
    expect(await displacement.textContent()).toMatch(/ mil$/);
    await page.getByText('0.110 in/s').first().waitFor();
    expect(await page.getByText('mm/s').count()).toBe(0);
    await page.locator('canvas').first().waitFor();
    await page.waitForTimeout(400);
    await screenshot(page, 'units-point-imperial');

    // The limits screen: levels shown and typed in in/s, stored in mm/s.
    await page.goto(`${srv.url}/limits`);
    await page
      .getByLabel('Point', { exact: true })
      .selectOption({ label: `${TAG} — Motor drive end, horizontal` });
    const band = page.getByRole('group', { name: /Band 1: Overall velocity/ });
    await band.waitFor();
    expect(Number(await band.getByLabel('Alert level').inputValue())).toBeCloseTo(2.8 / 25.4, 12);
    expect(await band.getByLabel('Unit').locator('option:checked').textContent()).toBe('in/s');
    await band.getByLabel('Alert level').fill('0.12');
    await page.getByRole('button', { name: 'Save limits…' }).click();
    await page.getByLabel('Reason for the change').fill('Site standard, typed in inches');
    await page.getByRole('button', { name: 'Save with this reason' }).click();
    await page.getByText('Saved as version 2.').waitFor();
    // Shown again as typed; stored as 0.12 × 25.4 = 3.048 mm/s (by hand).
    expect(await band.getByLabel('Alert level').inputValue()).toBe('0.12');
    await band.scrollIntoViewIfNeeded();
    await screenshot(page, 'units-limits-imperial');
    const stored = await (
      await srv.call('GET', `/api/v1/points/${pointId}/limits`, { cookie })
    ).json();
    expect(stored.bands[0].alertLevel).toBe(3.048);
    expect(stored.bands[0].unit).toBe('mm/s');
    await page.context().close();
  });
});
