/**
 * The operator's shift on the alerts screen: keyboard only (WAI-ARIA Authoring Practices;
 * WCAG 2.1.1 keyboard, 2.4.3 focus order) from the alert list to the detail, out to the
 * band's trend and back, then acknowledging there; the list as cards on a tablet (820 px,
 * WCAG 1.4.10 reflow: no sideways scroll, nothing cut); and a first page load without a
 * console error.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { newPage, screenshot, serverAndBrowserForFile } from '../support/browser.ts';
import { captureVelocities } from '../support/alert-captures.ts';
import { tabUntil } from '../support/keyboard.ts';

const { srv, browser, pageAs } = serverAndBrowserForFile({ gateway: true });
const TAG = 'MFP-P101-MDE-H';

beforeAll(async () => {
  // P-101 (ISO group 2, rigid: template alert 2.8, danger 4.5 mm/s, persistence 2): two
  // captures at 3.5 mm/s raise alerts on overall velocity and the 1× band.
  await captureVelocities(srv, srv.key, TAG, [1.5, 1.6, 3.5, 3.5]);
}, 120_000);

/** What has the focus: tag, its text, its label and the alert id it opens. */
const focused = (page: Page) =>
  page.evaluate<{ tag: string; text: string; name: string | null; id: string; note: string }>(
    `(() => { const e = document.activeElement; return { tag: e.tagName,
      text: (e.textContent || '').trim(), name: e.getAttribute('aria-label') || (e.labels && e.labels[0] ? e.labels[0].textContent.trim() : null),
      id: e.getAttribute('data-alert-open') || '', note: e.getAttribute('data-acknowledge-note') || '' }; })()`,
  );

const tabTo = (
  page: Page,
  test: (f: Awaited<ReturnType<typeof focused>>) => boolean,
  what: string,
  options: { back?: boolean; max?: number } = {},
) => tabUntil(page, focused, test, what, options);

describe('operator on the alerts screen', () => {
  it('loads the sign-in page with no console error (the anonymous session probe answers 200)', async () => {
    const page = await newPage(browser);
    const errors: string[] = [];
    page.on('console', (m) => {
      if (m.type() === 'error') errors.push(m.text());
    });
    await page.goto(`${srv.url}/alerts`);
    await page.getByRole('button', { name: /sign in/i }).waitFor();
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('keyboard only: opens the alert, follows its trend link and back, and acknowledges it in the detail', async () => {
    const page = await pageAs('operator');
    await page.goto(`${srv.url}/alerts`);
    const name = new RegExp(`history of the alert on ${TAG}, Overall`, 'i');
    await page.getByRole('button', { name }).waitFor();
    await tabTo(page, (f) => name.test(f.text), 'the alert row');
    const opener = (await focused(page)).id;
    await page.keyboard.press('Enter');
    const panel = page.getByRole('region', { name: /Overall velocity/ });
    await panel.waitFor();
    // The detail takes the focus on its title; it shows the band's sparkline with its levels,
    // what the band measures and the machine's ISO zone (3.5 mm/s, group 2 rigid: zone C,
    // between the B/C 2.8 and C/D 4.5 mm/s boundaries of ISO 20816-3, from memory).
    await expect.poll(async () => (await focused(page)).tag).toBe('H2');
    await panel.getByTestId('alert-sparkline').getByText('alert 2.80 mm/s').waitFor();
    await panel.getByTestId('alert-sparkline').getByText('danger 4.50 mm/s').waitFor();
    expect(await panel.getByTestId('alert-band-meaning').textContent()).toMatch(
      /overall RMS vibration velocity from 10 to 1000 Hz/,
    );
    expect(await panel.getByTestId('alert-machine-zone').textContent()).toMatch(/^Zone C/);
    // Raised by the second value at 3.5 mm/s (persistence 2), the newest.
    expect(await panel.getByTestId('alert-state-explained').textContent()).toMatch(
      /^Raised by the latest value at 3\.\d\d mm\/s against the alert level 2\.80 mm\/s\./,
    );
    await screenshot(page, 'alert-operator-detail');

    // Out to the band's trend by its link, and back by the point page's link to the alert.
    await tabTo(page, (f) => f.text === 'Trend of Overall velocity 10–1000 Hz', 'the trend link', {
      max: 30,
    });
    await page.keyboard.press('Enter');
    await page.waitForURL(/\/points\/\d+\?band=overall-velocity&alert=\d+/);
    await page.getByLabel('Band', { exact: true }).waitFor();
    await screenshot(page, 'alert-operator-trend');
    await tabTo(page, (f) => f.text === 'Back to the alert', 'the way back', { max: 30 });
    await page.keyboard.press('Enter');
    await page.waitForURL(/\/alerts\?alert=\d+/);
    await panel.waitFor();
    await expect.poll(async () => (await focused(page)).tag).toBe('H2');

    await tabTo(page, (f) => f.name === 'Note for this alert', 'the note', { max: 30 });
    await page.keyboard.type('Walked past P-101: louder than usual, told the shift lead.');
    await tabTo(page, (f) => f.text === 'Acknowledge alert', 'the acknowledge button', { max: 5 });
    await page.keyboard.press('Enter');
    await page.getByRole('status').filter({ hasText: 'Alert acknowledged.' }).waitFor();
    await panel.getByText('“Walked past P-101: louder than usual, told the shift lead.”').waitFor();
    // Focus kept in the panel after the form went away.
    expect((await focused(page)).tag).toBe('H2');
    await screenshot(page, 'alert-operator-acknowledged');
    await page.keyboard.press('Escape');
    await panel.waitFor({ state: 'detached' });
    await expect.poll(async () => (await focused(page)).id).toBe(opener);

    // The other raised alert: Enter on its box selects it and lands in the note field.
    await tabTo(page, (f) => /^Select alert on /.test(f.name ?? ''), 'a raised row box', {
      max: 20,
    });
    await page.keyboard.press('Enter');
    await expect.poll(async () => (await focused(page)).note).toBe('list');
    await page.keyboard.type('Same walk; 1× band up with the overall.');
    await tabTo(page, (f) => f.text === 'Acknowledge alert', 'the list button', { max: 5 });
    await page.keyboard.press('Enter');
    await page.getByRole('status').filter({ hasText: 'Alert acknowledged.' }).waitFor();
    await expect.poll(async () => (await focused(page)).text).toBe('Alert acknowledged.');
    const cookie = await srv.signIn('operator');
    const list = await (await srv.call('GET', '/api/v1/alerts?state=raised', { cookie })).json();
    expect(list.items).toEqual([]);
    await page.context().close();
  });

  it('on a tablet (820 px) the alerts are cards: no sideways scroll, every level shown', async () => {
    const page = await pageAs('operator', 820, 1180);
    await page.goto(`${srv.url}/alerts?state=all`);
    const cards = page.getByRole('list', { name: 'Alerts' }).getByRole('listitem');
    await cards.first().waitFor();
    expect(await page.locator('table').count()).toBe(0);
    const overflow = await page.evaluate(
      `(() => { const d = document.scrollingElement; return d.scrollWidth - d.clientWidth; })()`,
    );
    expect(overflow).toBe(0);
    // Every card, and the level text in it, lies inside the viewport's width.
    const n = await cards.count();
    expect(n).toBeGreaterThanOrEqual(2);
    for (let i = 0; i < n; i++) {
      const card = cards.nth(i);
      const box = (await card.boundingBox())!;
      expect(box.x).toBeGreaterThanOrEqual(0);
      expect(box.x + box.width).toBeLessThanOrEqual(820);
      const level = card.getByText(/\/ level \d/);
      const lb = (await level.boundingBox())!;
      expect(lb.x + lb.width).toBeLessThanOrEqual(box.x + box.width);
    }
    await screenshot(page, 'alert-operator-tablet');
    // The detail opens below the cards, with its sparkline.
    await cards
      .first()
      .getByRole('button', { name: /history of the alert/ })
      .click();
    await page.getByTestId('alert-sparkline').waitFor();
    await screenshot(page, 'alert-operator-tablet-detail');
    await page.context().close();
  });
});
