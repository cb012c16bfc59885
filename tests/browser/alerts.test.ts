import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { launchBrowser, newPage, screenshot, signInAs } from '../support/browser.ts';
import { captureVelocities, gatewayKey } from '../support/alert-captures.ts';

let srv: TestServer;
let browser: Browser;
beforeAll(async () => {
  srv = await startTestServer();
  browser = await launchBrowser();
  // P-101 (ISO group 2, rigid: template alert 2.8, danger 4.5 mm/s, persistence 2):
  // two captures at 3.5 mm/s raise alerts on overall velocity and the 1× band.
  const key = await gatewayKey(srv, 1);
  await captureVelocities(srv, key, 'MFP-P101-MDE-H', [1.5, 3.5, 3.5]);
}, 60_000);
afterAll(async () => {
  await browser?.close();
  await srv?.stop();
});

describe('alerts screen', () => {
  it('an operator acknowledges a raised alert with a note and finds it in its history', async () => {
    const page = await newPage(browser);
    await signInAs(page, srv.url, 'operator');
    await page.getByRole('navigation').first().getByRole('link', { name: 'Alerts' }).click();
    const box = page.getByRole('checkbox', {
      name: /Select alert on MFP-P101-MDE-H, Overall velocity/,
    });
    await box.waitFor();
    await screenshot(page, 'alerts-operator-raised');
    await box.check();
    await page
      .getByLabel(/Note for the selected alert/)
      .fill('Checked on the walkway; louder than usual. Told the shift lead.');
    await page.getByRole('button', { name: 'Acknowledge alert' }).click();
    await page.getByRole('status').filter({ hasText: 'Alert acknowledged.' }).waitFor();
    const row = page.locator('tr', { hasText: 'Overall velocity' });
    await row.getByText('Acknowledged', { exact: true }).waitFor();
    await row.getByText('Oli Operator').waitFor();
    await row.getByRole('button', { name: /history of the alert/i }).click();
    const history = page.getByRole('region', { name: /Overall velocity/ });
    await history
      .getByText('“Checked on the walkway; louder than usual. Told the shift lead.”')
      .waitFor();
    await screenshot(page, 'alerts-operator-acknowledged');
    // The server holds it too, with the operator's name.
    const cookie = await srv.signIn('operator');
    const list = await (
      await srv.call('GET', '/api/v1/alerts?state=acknowledged', { cookie })
    ).json();
    expect(list.items.map((a: { acknowledgedBy: string }) => a.acknowledgedBy)).toContain(
      'Oli Operator',
    );
    await page.context().close();
  });

  it('a planner sees the alerts without any way to acknowledge them', async () => {
    const page = await newPage(browser);
    await signInAs(page, srv.url, 'planner');
    await page.goto(`${srv.url}/alerts?state=all`);
    await page.locator('tr', { hasText: 'Overall velocity' }).first().waitFor();
    expect(await page.getByRole('checkbox').count()).toBe(0);
    expect(
      await page.getByRole('button', { name: /^Acknowledge( alert| \d+ alerts)$/ }).count(),
    ).toBe(0);
    expect(await page.getByRole('textbox').count()).toBe(0);
    await screenshot(page, 'alerts-planner');
    await page.setViewportSize({ width: 800, height: 1000 });
    await page
      .getByRole('button', { name: /history of the alert on MFP-P101-MDE-H, Overall/i })
      .click();
    await page.getByRole('region', { name: /Overall velocity/ }).waitFor();
    await screenshot(page, 'alerts-planner-tablet');
    await page.context().close();
  });
});
