import { describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import type { TestServer } from '../support/test-server.ts';
import { newPage, screenshot, signInAs, withServerAndBrowser } from '../support/browser.ts';
import { snapshotBody } from '../support/signals.ts';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { queueMail } from '../support/mail-inbox.ts';

let srv: TestServer;
let browser: Browser;
withServerAndBrowser((s, b) => {
  srv = s;
  browser = b;
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

  it('the admin sees a message the relay refused for good and sends it again', async () => {
    await queueMail(srv, {
      kind: 'alert',
      dedupeKey: 'browser-failed-1',
      to: 'planner@turnstone.local',
      subject: 'Alert raised: Backwash pump P-160, overall velocity',
    });
    await srv.ctx.dbHandle.pool.query(
      `UPDATE outbox SET outcome = 'failed', attempts = 8,
              last_error = '550 5.1.1 mailbox unavailable' WHERE dedupe_key = 'browser-failed-1'`,
    );
    const page = await newPage(browser);
    await signInAs(page, srv.url, 'admin');
    await page.goto(`${srv.url}/mailbox`);
    const panel = page.getByRole('region', { name: /Not delivered/ });
    await panel.getByText('Failed after its last attempt').waitFor();
    await panel.getByText('550 5.1.1 mailbox unavailable').waitFor();
    await screenshot(page, 'mailbox-undelivered');
    page.once('dialog', (d) => void d.accept());
    await panel
      .getByRole('button', { name: /Send again: Alert raised: Backwash pump P-160/ })
      .click();
    // Back in the queue; the fake takes it and the panel empties.
    for (let i = 0; i < 30; i++) {
      if ((await srv.mail.sender.drain()).length > 0) break;
      await new Promise((r) => setTimeout(r, 100));
    }
    await panel.waitFor({ state: 'detached', timeout: 20_000 });
    const list = page.getByRole('list', { name: 'Received messages' });
    await list.getByRole('button', { name: /Alert raised: Backwash pump P-160/ }).waitFor();
    await page.context().close();
  });

  it('an alert raised by ingested captures reaches the mailbox with its facts and the caution', async () => {
    const key = await srv.gatewayKey(1, 'gw-browser');
    // 3.5 mm/s RMS at 24.7 Hz (peak g = v·√2·2πf/9806.65), twice: over P-101's 2.8 mm/s
    // alert level with persistence 2 (template defaults, see tests/api/alerts.test.ts).
    const peakG = (3.5 * Math.SQRT2 * 2 * Math.PI * 24.7) / 9806.65;
    const t0 = Date.now() - 4 * 3600_000;
    for (let i = 0; i < 2; i++) {
      const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
        body: snapshotBody('MFP-P101-MDE-H', `bm-${i}`, {
          tones: [{ hz: 24.7, peakG }],
          noiseG: 0.001,
          seed: i + 1,
          takenAt: new Date(t0 + i * 3600_000).toISOString(),
        }),
        headers: { authorization: `Bearer ${key}` },
      });
      expect(res.status).toBe(201);
    }
    await createWorker(srv.ctx, { owner: 'browser-mail' }).drain();
    await srv.mail.sender.drain();
    const page = await newPage(browser);
    await signInAs(page, srv.url, 'admin');
    await page.goto(`${srv.url}/mailbox`);
    await page
      .getByRole('list', { name: 'Received messages' })
      .getByRole('button', { name: /Alert raised: .*Overall velocity.*engineer@turnstone\.local/ })
      .click();
    const frame = page.frameLocator('iframe[sandbox=""]');
    await frame.getByText('Intake pump P-101 (MFP · Raw water intake)').waitFor();
    await frame.getByText(/not a machine-protection system/).waitFor();
    // The trend picture came as an inline CID part; the fake kept it and the frame shows it
    // (a sanitised SVG data: URI), not its alt text.
    const picture = frame.locator('img').first();
    await picture.waitFor();
    expect(await picture.getAttribute('src')).toMatch(/^data:image\/svg\+xml;base64,/);
    await expect
      .poll(() =>
        picture.evaluate(
          (img) => (img as unknown as { complete: boolean; naturalWidth: number }).naturalWidth,
        ),
      )
      .toBeGreaterThan(100);
    const [stored] = await srv.q(
      "SELECT html_body FROM mail_messages WHERE subject LIKE 'Alert raised:%' ORDER BY id DESC LIMIT 1",
    );
    expect(String(stored!.html_body)).not.toContain('cid:');
    await screenshot(page, 'mailbox-alert');
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
