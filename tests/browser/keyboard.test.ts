/**
 * The main jobs with the keyboard alone (WAI-ARIA Authoring Practices patterns for tabs,
 * radio groups and dialogs; WCAG 2.1.1 keyboard, 2.4.3 focus order, 3.2.2 on input): after
 * signing in, only key presses — no clicks — acknowledge an alert from its detail panel,
 * choose a point and save its limits, and switch point views and spectrum measures.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { launchBrowser, newPage, screenshot, signInAs } from '../support/browser.ts';
import { captureVelocities, gatewayKey, peakGFor } from '../support/alert-captures.ts';
import { snapshotBody } from '../support/signals.ts';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { focused, tabTo } from '../support/keyboard.ts';

let srv: TestServer;
let browser: Browser;
let pointId: number;
const TAG = 'MFP-P102-MDE-H';

beforeAll(async () => {
  srv = await startTestServer();
  browser = await launchBrowser();
  const key = await gatewayKey(srv, 1);
  // P-101 (alert 2.8 mm/s, persistence 2): two captures at 3.5 mm/s raise alerts.
  await captureVelocities(srv, key, 'MFP-P101-MDE-H', [1.5, 3.5, 3.5]);
  // Four captures on P-102 with the running speed, so the spectrum can be shown in orders.
  for (let i = 0; i < 4; i++) {
    const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
      body: snapshotBody(TAG, `kb-${i}`, {
        takenAt: new Date(Date.now() - (4 - i) * 3600_000).toISOString(),
        tones: [{ hz: 24.7, peakG: peakGFor(1.5 + 0.1 * i) }],
        noiseG: 0.001,
        speedRpm: 1482,
        seed: i,
      }),
      headers: { authorization: `Bearer ${key}` },
    });
    expect(res.status).toBe(201);
  }
  await createWorker(srv.ctx, { owner: 'kb' }).drain();
  const [rows] = await srv.ctx.dbHandle.pool.query('SELECT id FROM points WHERE tag = ?', [TAG]);
  pointId = Number((rows as { id: number }[])[0]!.id);
}, 120_000);
afterAll(async () => {
  await browser?.close();
  await srv?.stop();
});

describe('keyboard only', () => {
  it('an operator opens an alert from the table, acknowledges it in the detail panel and gets back to the row', async () => {
    const page = await newPage(browser);
    await signInAs(page, srv.url, 'operator');
    await page.clock.install();
    await page.goto(`${srv.url}/alerts`);
    await page
      .getByRole('button', { name: /history of the alert on MFP-P101-MDE-H, Overall/i })
      .waitFor();
    await tabTo(
      page,
      (f) => /history of the alert on MFP-P101-MDE-H, Overall/i.test(f.text),
      'the alert row',
    );
    const opener = (await focused(page)).id;
    // The table's 30-second clock ticks: the focus stays where it was.
    await page.clock.runFor(31_000);
    expect((await focused(page)).id).toBe(opener);
    await page.keyboard.press('Enter');
    // The panel takes the focus on its title, so it is announced and next in Tab order.
    const panel = page.getByRole('region', { name: /Overall velocity/ });
    await panel.waitFor();
    await expect.poll(async () => (await focused(page)).tag).toBe('H2');
    await tabTo(page, (f) => f.name === 'Note for this alert', 'the note');
    await page.keyboard.type('Bearing housing warm to touch; told the shift lead.');
    await tabTo(page, (f) => f.text === 'Acknowledge alert', 'the acknowledge button');
    await page.keyboard.press('Enter');
    await page.getByRole('status').filter({ hasText: 'Alert acknowledged.' }).waitFor();
    await panel.getByText('“Bearing housing warm to touch; told the shift lead.”').waitFor();
    // The form is gone; the focus is back on the panel, not lost to the page.
    expect((await focused(page)).tag).toBe('H2');
    await screenshot(page, 'keyboard-alert-acknowledged');
    await page.keyboard.press('Escape');
    await panel.waitFor({ state: 'detached' });
    await expect.poll(async () => (await focused(page)).id).toBe(opener);
    await page.context().close();
  });

  it('an engineer chooses a point, is asked before an unsaved edit would be lost, and saves the limits', async () => {
    const page = await newPage(browser, 1280, 900);
    await signInAs(page, srv.url, 'engineer');
    await page.goto(`${srv.url}/limits`);
    await page.getByText('Choose a point', { exact: true }).waitFor();
    await tabTo(page, (f) => f.tag === 'SELECT' && f.name === 'Point', 'the Point list');
    // Arrow keys on the closed list only move the choice: nothing loads.
    await page.keyboard.press('ArrowDown');
    await page.keyboard.press('ArrowDown');
    await page.waitForTimeout(300);
    expect(new URL(page.url()).searchParams.get('point')).toBeNull();
    expect(await page.getByRole('group', { name: /Band 1:/ }).count()).toBe(0);
    const label = `${TAG} — Motor drive end, horizontal`;
    for (let i = 0; i < 60; i++) {
      const text = await page.evaluate<string>(
        `document.activeElement.selectedOptions[0]?.textContent ?? ''`,
      );
      if (text === label) break;
      await page.keyboard.press('ArrowDown');
    }
    await page.keyboard.press('Enter');
    const band = page.getByRole('group', { name: /Band 1: Overall velocity/ });
    await band.waitFor();
    expect(new URL(page.url()).searchParams.get('point')).toBe(String(pointId));

    await tabTo(page, (f) => f.name === 'Alert level', 'the alert level of band 1');
    await page.keyboard.press('ControlOrMeta+A');
    await page.keyboard.type('3.1');
    // Another point with an unsaved edit: asked, and Keep editing keeps it.
    await tabTo(page, (f) => f.tag === 'SELECT' && f.name === 'Point', 'the Point list', {
      back: true,
    });
    await page.keyboard.press('ArrowDown');
    await page.keyboard.press('Enter');
    const ask = page.getByRole('dialog', { name: 'Discard the unsaved limit changes?' });
    await ask.waitFor();
    await screenshot(page, 'keyboard-limits-discard-question');
    expect((await focused(page)).text).toBe('Keep editing');
    await page.keyboard.press('Enter');
    await ask.waitFor({ state: 'hidden' });
    expect(new URL(page.url()).searchParams.get('point')).toBe(String(pointId));
    expect(await band.getByLabel('Alert level').inputValue()).toBe('3.1');
    expect((await focused(page)).tag).toBe('SELECT');

    await tabTo(page, (f) => f.text === 'Replay history', 'Replay history');
    await page.keyboard.press('Enter');
    await page
      .getByRole('status')
      .filter({ hasText: /^Replay done:/ })
      .waitFor({ state: 'attached' });
    expect((await focused(page)).text).toBe('Replay history');
    await tabTo(page, (f) => f.text === 'Save limits…', 'Save limits…');
    await page.keyboard.press('Enter');
    expect((await focused(page)).name).toBe('Reason for the change');
    await page.keyboard.type('Alert a little higher after the coupling was aligned');
    await tabTo(page, (f) => f.text === 'Save with this reason', 'Save with this reason');
    await page.keyboard.press('Enter');
    await page.getByRole('status').filter({ hasText: 'Saved as version 2.' }).waitFor();
    await expect.poll(async () => (await focused(page)).text).toMatch(/^Saved as version 2\./);
    await screenshot(page, 'keyboard-limits-saved');
    const cookie = await srv.signIn('engineer');
    const stored = await (
      await srv.call('GET', `/api/v1/points/${pointId}/limits`, { cookie })
    ).json();
    expect(stored.bands[0].alertLevel).toBe(3.1);
    await page.context().close();
  });

  it('a planner switches point views with the arrow keys and spectrum measures and axis likewise', async () => {
    const page = await newPage(browser, 1280, 900);
    await signInAs(page, srv.url, 'planner');
    await page.goto(`${srv.url}/points/${pointId}`);
    await page.getByRole('img', { name: /^Trend of / }).waitFor();
    await tabTo(page, (f) => f.role === 'tab', 'the view tabs');
    expect((await focused(page)).text).toBe('Trend');
    await page.keyboard.press('ArrowRight');
    expect(await focused(page)).toMatchObject({ text: 'Spectrum', state: 'true' });
    // With no alert band to open on: velocity over 0–40 orders.
    await page.getByRole('img', { name: /^Velocity spectrum in mm\/s RMS against Hz/ }).waitFor();
    // The panel is named by its tab.
    await page.getByRole('tabpanel', { name: 'Spectrum' }).waitFor();
    await tabTo(page, (f) => f.role === 'radio', 'the Measure radios');
    expect(await focused(page)).toMatchObject({ text: 'Velocity', state: 'true' });
    await page.keyboard.press('ArrowLeft');
    expect(await focused(page)).toMatchObject({ text: 'Acceleration', state: 'true' });
    await page.getByRole('img', { name: /^Acceleration spectrum/ }).waitFor();
    await page.keyboard.press('ArrowRight');
    expect(await focused(page)).toMatchObject({ text: 'Velocity', state: 'true' });
    await page.getByRole('img', { name: /^Velocity spectrum/ }).waitFor();
    // One Tab stop per radio group: the next Tab goes to the X axis group.
    await page.keyboard.press('Tab');
    expect(await focused(page)).toMatchObject({ text: 'Hz', state: 'true' });
    await page.keyboard.press('ArrowRight');
    expect(await focused(page)).toMatchObject({ text: 'Orders', state: 'true' });
    await page.getByRole('img', { name: /against order/ }).waitFor();
    await screenshot(page, 'keyboard-spectrum-velocity-orders');
    // Zoom without a pointer: the whole range, the middle half, then a step right.
    await tabTo(page, (f) => f.text === 'Whole range', 'Whole range');
    await page.keyboard.press('Enter');
    await page.getByText('Showing 0 %–100 % of the range').waitFor();
    await tabTo(page, (f) => f.text === 'Zoom in', 'Zoom in', { back: true });
    await page.keyboard.press('Enter');
    await page.getByText('Showing 25 %–75 % of the range').waitFor();
    await tabTo(page, (f) => f.name === 'Move right', 'Move right');
    await page.keyboard.press('Enter');
    await page.getByText('Showing 50 %–100 % of the range').waitFor();
    await tabTo(page, (f) => f.role === 'tab', 'the view tabs', { back: true });
    expect((await focused(page)).text).toBe('Spectrum');
    await page.keyboard.press('End');
    expect(await focused(page)).toMatchObject({ text: 'Waterfall', state: 'true' });
    await page.getByRole('img', { name: /^Waterfall of the last/ }).waitFor();
    await page.keyboard.press('Home');
    expect(await focused(page)).toMatchObject({ text: 'Trend', state: 'true' });
    await page.context().close();
  });
});
