import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { launchBrowser, newPage, screenshot, signInAs } from '../support/browser.ts';

let srv: TestServer;
let browser: Browser;
beforeAll(async () => {
  srv = await startTestServer();
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await srv?.stop();
});

describe('mailbox in a real browser', () => {
  it('the admin reads a received message, as HTML in a sandboxed frame and as text', async () => {
    // A reset request for the engineer puts one message through the outbox and the fake.
    const res = await srv.call('POST', '/api/v1/auth/forgot-password', {
      body: { email: 'engineer@turnstone.local' },
    });
    expect(res.status).toBe(202);
    for (let i = 0; i < 30; i++) {
      if ((await srv.mail.sender.drain()).length > 0) break;
      await new Promise((r) => setTimeout(r, 100));
    }
    const page = await newPage(browser);
    await signInAs(page, srv.url, 'admin');
    await page.getByRole('navigation').first().getByRole('link', { name: 'Mailbox' }).click();
    const list = page.getByRole('list', { name: 'Received messages' });
    await list.getByRole('button', { name: /Reset your Turnstone password/ }).click();
    const frame = page.locator('iframe[sandbox=""]');
    await frame.waitFor();
    await page
      .frameLocator('iframe[sandbox=""]')
      .getByText('Someone asked to reset your Turnstone password.')
      .waitFor();
    await screenshot(page, 'mailbox-html');
    await page.getByRole('button', { name: 'Text' }).click();
    await page
      .getByText(/reset-password#token=/)
      .first()
      .waitFor();
    expect(await page.getByRole('article').textContent()).toContain('engineer@turnstone.local');
    await screenshot(page, 'mailbox-text');
    await page.context().close();
  });

  it('the mailbox is not in the engineer’s navigation and its API refuses them', async () => {
    const page = await newPage(browser);
    await signInAs(page, srv.url, 'engineer');
    const nav = page.getByRole('navigation').first();
    await nav.getByRole('link', { name: 'Account' }).waitFor();
    expect(await nav.getByRole('link', { name: 'Mailbox' }).count()).toBe(0);
    await page.context().close();
  });
});
