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
  // Ten hours back, so a later test's captures (the last two hours) come after them.
  await captureVelocities(srv, key, 'MFP-P101-MDE-H', [1.5, 3.5, 3.5], Date.now() - 10 * 3600_000);
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

  it('the alert detail explains its state from the API answer and links to the point and the band trend', async () => {
    // The overall velocity alert was acknowledged above; two values at 6 mm/s (danger 4.5,
    // persistence 2) escalate it, which withdraws the acknowledgement.
    const key = await gatewayKey(srv, 1);
    await captureVelocities(srv, key, 'MFP-P101-MDE-H', [6, 6]);
    const cookie = await srv.signIn('operator');
    const list = await (await srv.call('GET', '/api/v1/alerts', { cookie })).json();
    type Item = { id: number; pointTag: string; bandKey: string };
    const ofTag = (list.items as Item[]).filter((a) => a.pointTag === 'MFP-P101-MDE-H');
    const overall = ofTag.find((a) => a.bandKey === 'overall-velocity')!;
    const other = ofTag.find((a) => a.bandKey !== 'overall-velocity')!;
    expect(other).toBeDefined();
    const detail = await (await srv.call('GET', `/api/v1/alerts/${overall.id}`, { cookie })).json();
    expect(detail).toMatchObject({ state: 'raised', level: 'danger' });
    type Event = { kind: string; value: number };
    const raised = (detail.history as Event[]).find((h) => h.kind === 'raised')!;
    const escalated = (detail.history as Event[]).find((h) => h.kind === 'escalated')!;
    // Two decimals below 10 mm/s, as the panel writes levels (common practice, no source).
    const fmt = (v: number) => `${v.toFixed(2)} mm/s`;

    const page = await newPage(browser);
    await signInAs(page, srv.url, 'operator');
    await page.goto(`${srv.url}/alerts?alert=${overall.id}`);
    const panel = page.getByRole('region', { name: detail.bandName });
    const explained = panel.getByTestId('alert-state-explained');
    await explained.waitFor();
    const text = (await explained.textContent()) ?? '';
    // Counted in values: the raising value, then the two at 6 mm/s that escalated it.
    expect(text).toContain(`Raised 2 values ago at ${fmt(raised.value)} against the alert level`);
    expect(text).toContain(
      `escalated to danger at ${fmt(escalated.value)} against the danger level ${fmt(detail.limit)}`,
    );
    expect(text).toContain('Escalated to danger after it was acknowledged; acknowledge again.');
    expect(text).toContain(
      `${detail.clearRule.clearPersistence} values in a row fall below ${fmt(detail.clearRule.clearLevel)}`,
    );
    const highest = panel.locator('dt', { hasText: 'Highest while open' }).locator('+ dd');
    expect(await highest.textContent()).toBe(fmt(detail.peakValue));
    await screenshot(page, 'alerts-detail-explained');

    // The band's trend: the point page opens its Trend view on this alert's band (not the
    // default overall velocity) and names the alert it came from; Back returns to it.
    const otherDetail = await (
      await srv.call('GET', `/api/v1/alerts/${other.id}`, { cookie })
    ).json();
    await page.goto(`${srv.url}/alerts?alert=${other.id}`);
    const otherPanel = page.getByRole('region', { name: otherDetail.bandName });
    await otherPanel.getByRole('link', { name: `Trend of ${otherDetail.bandName}` }).click();
    await page.waitForURL(
      `**/points/${otherDetail.pointId}?band=${encodeURIComponent(otherDetail.bandKey)}&alert=${other.id}`,
    );
    const band = page.getByLabel('Band', { exact: true });
    await band.waitFor();
    expect(await band.inputValue()).toBe(otherDetail.bandKey);
    await screenshot(page, 'alerts-detail-trend');
    await page.goBack();
    await otherPanel.getByRole('link', { name: `Point ${otherDetail.pointTag}` }).click();
    await page.waitForURL(`**/points/${otherDetail.pointId}`);
    await page.getByRole('heading', { name: otherDetail.pointName }).first().waitFor();
    await page.context().close();
  });
});
