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

describe('users admin in a real browser', () => {
  it('the admin invites a user; the invitee sets a password through the mailed link and signs in', async () => {
    const page = await newPage(browser);
    await signInAs(page, srv.url, 'admin');
    await page.getByRole('navigation').first().getByRole('link', { name: 'Users' }).click();
    await page.getByRole('heading', { name: 'Invite a user' }).waitFor();
    await page.getByLabel('E-mail').fill('rowan@example.test');
    await page.getByLabel('Name').fill('Rowan Reliability');
    await page.getByLabel('Role').selectOption('engineer');
    await page.getByRole('group', { name: 'Sites of the new user' }).getByText('MFP').click();
    await page.getByRole('button', { name: 'Send invite' }).click();
    await page.getByRole('status').getByText('rowan@example.test').waitFor();
    const row = page.getByRole('row', { name: /Rowan Reliability/ });
    await row.getByText('Invited').waitFor();
    await screenshot(page, 'users-invited');

    await srv.mail.sender.drain();
    await page.getByRole('navigation').first().getByRole('link', { name: 'Mailbox' }).click();
    await page.getByRole('button', { name: /You are invited to Turnstone/ }).click();
    await page.getByRole('button', { name: 'Text' }).click();
    // The admin sees that the link went out, not a working link to someone else's account.
    await page.getByRole('link', { name: /accept-invite#token=hidden/ }).waitFor();
    await screenshot(page, 'mailbox-invite');
    // The invitee's copy, as the relay received it.
    const [received] = await srv.ctx.dbHandle.pool.query(
      'SELECT text_body FROM mail_messages WHERE mail_to = ? ORDER BY id DESC LIMIT 1',
      ['rowan@example.test'],
    );
    const text = String((received as { text_body: string }[])[0]!.text_body);
    const href = /(http\S+\/accept-invite#token=[A-Za-z0-9_-]+)/.exec(text)![1]!;
    expect(href.startsWith(`${srv.url}/accept-invite#token=`)).toBe(true);
    expect(href).not.toContain('token=hidden');

    // The invitee, in a browser of their own.
    const invitee = await newPage(browser);
    await invitee.goto(href);
    await invitee.getByRole('heading', { name: 'Choose your password' }).waitFor();
    await invitee.getByLabel('New password').fill('rowan-pass-1');
    await invitee.getByLabel('Repeat the password').fill('rowan-pass-1');
    await screenshot(invitee, 'accept-invite');
    await invitee.getByRole('button', { name: 'Set password' }).click();
    await invitee.getByRole('heading', { name: 'Password set' }).waitFor();
    await invitee.getByRole('link', { name: 'Go to sign-in' }).click();
    await invitee.getByLabel(/e-mail/i).fill('rowan@example.test');
    await invitee.getByLabel(/password/i).fill('rowan-pass-1');
    await invitee.getByRole('button', { name: /sign in/i }).click();
    const nav = invitee.getByRole('navigation').first();
    await nav.getByRole('link', { name: 'Limits' }).waitFor();
    await screenshot(invitee, 'invitee-signed-in');

    // The same link a second time is refused.
    const again = await newPage(browser);
    await again.goto(href);
    await again.getByLabel('New password').fill('rowan-pass-2');
    await again.getByLabel('Repeat the password').fill('rowan-pass-2');
    await again.getByRole('button', { name: 'Set password' }).click();
    await again
      .getByRole('alert')
      .getByText(/expired or was used already/)
      .waitFor();

    // Back to the admin: the row now reads Active; disable it.
    await page.getByRole('navigation').first().getByRole('link', { name: 'Users' }).click();
    await page
      .getByRole('row', { name: /Rowan Reliability/ })
      .getByText('Active')
      .waitFor();
    await page.getByRole('button', { name: 'Disable Rowan Reliability' }).click();
    await page
      .getByRole('row', { name: /Rowan Reliability/ })
      .getByText('Disabled')
      .waitFor();
    await screenshot(page, 'users-disabled');
    for (const p of [page, invitee, again]) await p.context().close();
  });

  it('the sign-in page links to forgot-password, which answers the same for any address', async () => {
    const page = await newPage(browser);
    await page.goto(`${srv.url}/sign-in`);
    await page.getByRole('link', { name: 'Forgot password?' }).click();
    // The sign-in page has an E-mail field too and stays on screen while the lazy page
    // loads: wait for the new page before typing, or the address lands in the old form.
    await page.getByRole('heading', { name: 'Forgot your password?' }).waitFor();
    await page.getByLabel('E-mail').fill('nobody@example.test');
    await page.getByRole('button', { name: 'Send me a link' }).click();
    await page
      .getByRole('status')
      .getByText(/If an account exists/)
      .waitFor();
    await screenshot(page, 'forgot-password');
    await page.context().close();
  });

  it('every role finds Account with notification settings and password change', async () => {
    const page = await newPage(browser);
    await signInAs(page, srv.url, 'planner');
    await page.getByRole('navigation').first().getByRole('link', { name: 'Account' }).click();
    await page.getByRole('heading', { name: 'Notifications by e-mail' }).waitFor();
    await page.getByText('Weekly digest on Monday morning').waitFor();
    expect(await page.getByRole('group', { name: /Rule/ }).count()).toBe(2);
    await page.getByRole('button', { name: 'Save notifications' }).click();
    await page.getByRole('status').getByText('Saved.').waitFor();
    await screenshot(page, 'account-planner');
    await page.context().close();
  });
});
