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
