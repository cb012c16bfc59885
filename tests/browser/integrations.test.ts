/**
 * The Integrations screen in a real browser: the admin issues an API token (shown once),
 * the token works on the API, its last use shows, and revoking it ends it; a webhook
 * receiver is added with its secret shown once.
 */
import { describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import type { TestServer } from '../support/test-server.ts';
import { newPage, screenshot, signInAs, withServerAndBrowser } from '../support/browser.ts';

let srv: TestServer;
let browser: Browser;
withServerAndBrowser((s, b) => {
  srv = s;
  browser = b;
});

describe('integrations in a real browser', () => {
  it('the admin issues a token, sees it used, revokes it; adds a webhook receiver', async () => {
    const page = await newPage(browser);
    await signInAs(page, srv.url, 'admin');
    await page.getByRole('navigation').first().getByRole('link', { name: 'Integrations' }).click();
    await page.getByRole('heading', { name: 'New API token' }).waitFor();
    await page.getByLabel('Integration').fill('Plant CMMS');
    await page.getByLabel('Role').selectOption('planner');
    await page.getByRole('group', { name: 'Sites' }).first().getByText('MFP').click();
    await page.getByRole('button', { name: 'Issue token' }).click();
    const dialog = page.getByRole('dialog', { name: 'API token' });
    const token = await dialog.getByLabel('Token').inputValue();
    expect(token).toMatch(/^tst_/);
    await screenshot(page, 'integrations-token-shown');
    await dialog.getByRole('button', { name: 'I have stored it' }).click();

    const res = await fetch(`${srv.url}/api/v1/alerts?siteId=1`, {
      headers: { authorization: `Bearer ${token}` },
    });
    expect(res.status).toBe(200);
    await page.reload();
    const row = page.getByRole('row', { name: /Plant CMMS/ });
    await row
      .getByText(/ago|just now|now/)
      .first()
      .waitFor();
    await row.getByRole('button', { name: 'Revoke' }).click();
    await page.getByRole('button', { name: 'Revoke token' }).click();
    await row.getByText(/Revoked/).waitFor();
    const after = await fetch(`${srv.url}/api/v1/alerts`, {
      headers: { authorization: `Bearer ${token}` },
    });
    expect(after.status).toBe(401);

    await page.getByLabel('Name', { exact: true }).fill('CMMS hook');
    await page.getByLabel('URL').fill('http://127.0.0.1:9/hook');
    await page.getByRole('button', { name: 'Add receiver' }).click();
    const secretDialog = page.getByRole('dialog', { name: 'Signing secret' });
    expect(await secretDialog.getByLabel('Secret').inputValue()).toMatch(/^whsec_/);
    await secretDialog.getByRole('button', { name: 'I have stored it' }).click();
    await page.getByRole('row', { name: /CMMS hook/ }).waitFor();
    await screenshot(page, 'integrations');
  });
});
