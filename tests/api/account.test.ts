/**
 * The signed-in user's account (password, notification settings) and the Mailbox — against
 * the real server and its local SMTP fake (links are read from the messages it received).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { requestPasswordReset } from '../../apps/server/src/features/users/users-service.ts';
import { cookieOf, inMailbox, lastMailTo, signInAs, tokenIn } from '../support/mail-inbox.ts';

let srv: TestServer;
let admin = '';

beforeAll(async () => {
  srv = await startTestServer();
  admin = await srv.signIn('admin');
});
afterAll(async () => {
  await srv?.stop();
});

describe('account', () => {
  it('changing the password needs the current one, ends other sessions and keeps this one', async () => {
    const a = await srv.signIn('planner');
    const b = await srv.signIn('planner');
    const wrong = await srv.call('POST', '/api/v1/account/password', {
      cookie: a,
      body: { currentPassword: 'nope', newPassword: 'planner-new-1' },
    });
    expect(wrong.status).toBe(400);
    const ok = await srv.call('POST', '/api/v1/account/password', {
      cookie: a,
      body: { currentPassword: 'turnstone-demo', newPassword: 'planner-new-1' },
    });
    expect(ok.status).toBe(204);
    const fresh = cookieOf(ok as unknown as Response);
    expect((await srv.call('GET', '/api/v1/me', { cookie: fresh })).status).toBe(200);
    expect((await srv.call('GET', '/api/v1/me', { cookie: b })).status).toBe(401);
    expect((await signInAs(srv, 'planner@turnstone.local', 'planner-new-1')).status).toBe(200);
  });

  it('notification settings read back as saved, and a site the user cannot see is refused', async () => {
    const [e] = await srv.q("SELECT id FROM users WHERE email = 'operator@turnstone.local'");
    await srv.call('PATCH', `/api/v1/users/${e!.id}`, { cookie: admin, body: { siteIds: [1] } });
    const op = await srv.signIn('operator');
    const got = await (
      await srv.call('GET', '/api/v1/account/subscriptions', { cookie: op })
    ).json();
    // Every operator hears of their sites' alerts by default (the demo operator too).
    expect(got.items).toEqual([
      { siteId: 1, machineId: null, minLevel: 'alert', cadence: 'immediate' },
    ]);
    expect(got.options.sites.map((s: { code: string }) => s.code)).toEqual(['MFP']);
    const machineId = got.options.machines[0].id;
    const put = await srv.call('PUT', '/api/v1/account/subscriptions', {
      cookie: op,
      body: {
        items: [
          { siteId: 1, machineId: null, minLevel: 'danger', cadence: 'immediate' },
          { siteId: null, machineId, minLevel: 'alert', cadence: 'hourly' },
        ],
        weeklyDigest: false,
      },
    });
    expect(put.status).toBe(200);
    const back = await (
      await srv.call('GET', '/api/v1/account/subscriptions', { cookie: op })
    ).json();
    expect(back.items).toEqual([
      { siteId: 1, machineId: null, minLevel: 'danger', cadence: 'immediate' },
      { siteId: null, machineId, minLevel: 'alert', cadence: 'hourly' },
    ]);
    const bad = await srv.call('PUT', '/api/v1/account/subscriptions', {
      cookie: op,
      body: {
        items: [{ siteId: 2, machineId: null, minLevel: 'alert', cadence: 'immediate' }],
        weeklyDigest: false,
      },
    });
    expect(bad.status).toBe(400);
  });
});

describe('mailbox', () => {
  it("an admin's own sign-in link stays readable in the Mailbox", async () => {
    await requestPasswordReset(srv.ctx, 'admin@turnstone.local');
    const mail = (await lastMailTo(srv, 'admin@turnstone.local'))!;
    const token = tokenIn(srv, mail.text, 'reset-password')!;
    expect(token).toBeTruthy();
    expect((await inMailbox(srv, admin, mail.id)).text).toContain(`reset-password#token=${token}`);
  });

  it('shows one message with text and sanitised HTML', async () => {
    const list = await (await srv.call('GET', '/api/v1/mailbox', { cookie: admin })).json();
    expect(list.items.length).toBeGreaterThan(0);
    expect(Object.keys(list.items[0]).sort()).toEqual(['id', 'receivedAt', 'subject', 'to']);
    const one = await (
      await srv.call('GET', `/api/v1/mailbox/${list.items[0].id}`, { cookie: admin })
    ).json();
    expect(one.text).toBeTruthy();
    expect(one.html).toContain('<a href=');
    expect((await srv.call('GET', '/api/v1/mailbox/999999', { cookie: admin })).status).toBe(404);
  });
});
