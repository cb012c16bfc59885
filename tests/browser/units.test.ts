/**
 * An engineer switches to imperial units on the Account screen and reads in/s on the point
 * page and the limits screen; a level typed in in/s is stored in mm/s. An imperial engineer
 * then walks every screen that shows a velocity (machine, point views, alerts, limits, review,
 * audit log) and finds no mm/s on any. 1 in = 25.4 mm exactly (NIST SP 811 appendix B; 1959
 * international yard and pound agreement).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { demoChannels } from '@turnstone/demo-scenario/plant-channels';
import { simulateSnapshot, toIngestItem } from '@turnstone/demo-scenario/simulated-snapshot';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { chartCanvas, launchBrowser, newPage, screenshot, signInAs } from '../support/browser.ts';
import { captureVelocities, gatewayKey } from '../support/alert-captures.ts';

let srv: TestServer;
let browser: Browser;
const TAG = 'MFP-P102-MDE-H';
let pointId = 0;
// P-201's developing unbalance from the demo scenario (with tach pulses, so it has 1×
// vectors; it raises an alert on its overall velocity): eight captures a day apart.
const WALK_TAG = 'MFP-P201-MDE-H';
let walkPoint = { id: 0, machineId: 0 };
const DAY = 86_400_000;
beforeAll(async () => {
  srv = await startTestServer();
  browser = await launchBrowser();
  const key = await gatewayKey(srv, 1);
  await captureVelocities(srv, key, TAG, [1.5, 1.6, 1.7]);
  const [p] = await srv.q<{ id: number }>('SELECT id FROM points WHERE tag = ?', [TAG]);
  pointId = p!.id;
  const channel = demoChannels('MFP').find((c) => c.tag === WALK_TAG)!;
  const now = Date.now();
  for (let i = 0; i < 8; i++) {
    const snap = simulateSnapshot(
      channel,
      new Date(now - (7 - i) * DAY - 3600_000),
      0.65 + 0.05 * i,
      { faults: false },
    );
    const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
      body: toIngestItem(snap),
      headers: { authorization: `Bearer ${key}` },
    });
    expect(res.status).toBe(201);
  }
  await createWorker(srv.ctx).drain();
  const [w] = await srv.q<{ id: number; machine_id: number }>(
    'SELECT id, machine_id FROM points WHERE tag = ?',
    [WALK_TAG],
  );
  walkPoint = { id: Number(w!.id), machineId: Number(w!.machine_id) };
}, 120_000);

/** What a reader meets on the page: the main area's text and its accessible names and titles. */
const readable = (page: Page) =>
  page.evaluate(`(() => {
    const main = document.querySelector('main') ?? document.body;
    const names = [...main.querySelectorAll('[aria-label],[title]')].map(
      (e) => (e.getAttribute('aria-label') ?? '') + ' ' + (e.getAttribute('title') ?? ''),
    );
    return main.innerText + '\\n' + names.join('\\n');
  })()`) as Promise<string>;

/** The page shows velocities in in/s and none in mm/s; a screenshot is kept. */
async function imperialOnly(page: Page, name: string) {
  const text = await readable(page);
  expect(text, name).toContain('in/s');
  expect(text, name).not.toContain('mm/s');
  await screenshot(page, `units-walk-${name}`);
}
afterAll(async () => {
  await browser?.close();
  await srv?.stop();
});

describe('unit system', () => {
  it('when an engineer switches to imperial, the point page and the limits screen read in/s, and a typed level is stored in mm/s', async () => {
    const page = await newPage(browser, 1280, 900);
    await signInAs(page, srv.url, 'engineer');
    await page.goto(`${srv.url}/account`);
    const imperial = page.getByRole('radio', { name: 'Imperial (in/s, mil)' });
    await imperial.click();
    await page.waitForFunction(
      `document.querySelector('[role="radio"][aria-checked="true"]')?.textContent?.includes('Imperial') === true`,
    );
    await screenshot(page, 'units-account-imperial');

    // The point page: the header's velocity and displacement in in/s and mil, the trend's
    // levels too. P-102's template alert 2.8 mm/s is 0.110 in/s (÷ 25.4 by hand).
    await page.goto(`${srv.url}/points/${pointId}`);
    const velocity = page.locator('dt', { hasText: /^Velocity RMS/ }).locator('+ dd');
    await velocity.waitFor();
    const shown = (await velocity.textContent()) ?? '';
    expect(shown).toMatch(/^0\.0\d{3} in\/s$/);
    const cookie = await srv.signIn('engineer');
    const detail = await (await srv.call('GET', `/api/v1/points/${pointId}`, { cookie })).json();
    // Three significant digits of the stored mm/s value ÷ 25.4 (by hand: ~1.7 mm/s → ~0.067).
    expect(parseFloat(shown)).toBeCloseTo(detail.latest.overall.velocityRmsMmS / 25.4, 4);
    const displacement = page.locator('dt', { hasText: /^Displ\. pk-pk/ }).locator('+ dd');
    expect(await displacement.textContent()).toMatch(/ mil$/);
    await page.getByText('0.110 in/s').first().waitFor();
    expect(await page.getByText('mm/s').count()).toBe(0);
    await page.locator('canvas').first().waitFor();
    await page.waitForTimeout(400);
    await screenshot(page, 'units-point-imperial');

    // The limits screen: levels shown and typed in in/s, stored in mm/s.
    await page.goto(`${srv.url}/limits`);
    await page
      .getByLabel('Point', { exact: true })
      .selectOption({ label: `${TAG} — Motor drive end, horizontal` });
    const band = page.getByRole('group', { name: /Band 1: Overall velocity/ });
    await band.waitFor();
    // 2.8 / 25.4 = 0.110236… in/s, shown to four significant digits (by hand).
    expect(await band.getByLabel('Alert level').inputValue()).toBe('0.1102');
    expect(await band.getByLabel('Unit').locator('option:checked').textContent()).toBe('in/s');
    await band.getByLabel('Alert level').fill('0.12');
    await page.getByRole('button', { name: 'Save limits…' }).click();
    await page.getByLabel('Reason for the change').fill('Site standard, typed in inches');
    await page.getByRole('button', { name: 'Save with this reason' }).click();
    await page.getByText('Saved as version 2.').waitFor();
    // Shown again as typed; stored as 0.12 × 25.4 = 3.048 mm/s (by hand).
    expect(await band.getByLabel('Alert level').inputValue()).toBe('0.12');
    await band.scrollIntoViewIfNeeded();
    await screenshot(page, 'units-limits-imperial');
    const stored = await (
      await srv.call('GET', `/api/v1/points/${pointId}/limits`, { cookie })
    ).json();
    expect(stored.bands[0].alertLevel).toBe(3.048);
    expect(stored.bands[0].unit).toBe('mm/s');
    await page.context().close();
  });

  it('an imperial engineer meets no mm/s on the machine page, the point views, alerts, limits, review and audit log', async () => {
    const cookie = await srv.signIn('engineer');
    await srv.call('PUT', '/api/v1/account/preferences', {
      cookie,
      body: { unitSystem: 'imperial' },
    });
    const page = await newPage(browser, 1400, 960);
    await signInAs(page, srv.url, 'engineer');

    // The machine page: the alert behind its state, each point's values and ISO zone range.
    await page.goto(`${srv.url}/machines/${walkPoint.machineId}`);
    await page.getByRole('heading', { name: 'Why this state' }).waitFor();
    await page
      .getByText(/ over /)
      .first()
      .waitFor();
    const machine = await (
      await srv.call('GET', `/api/v1/machines/${walkPoint.machineId}`, { cookie })
    ).json();
    const zoned = machine.points.find((p: { latest?: { isoZone?: string } }) => p.latest?.isoZone);
    expect(zoned).toBeDefined();
    // The zone range in in/s: ISO 20816-3 boundaries (mm/s, from the server) ÷ 25.4, three
    // significant digits (e.g. 2.8 → 0.110, 4.5 → 0.177).
    const b = machine.isoBoundaries as { ab: number; bc: number; cd: number };
    const three = (v: number) => (v / 25.4).toPrecision(3);
    const range = {
      A: `< ${three(b.ab)} in/s`,
      B: `${three(b.ab)}–${three(b.bc)} in/s`,
      C: `${three(b.bc)}–${three(b.cd)} in/s`,
      D: `≥ ${three(b.cd)} in/s`,
    }[zoned.latest.isoZone as 'A' | 'B' | 'C' | 'D'];
    await page.getByText(range, { exact: true }).first().waitFor();
    await page.waitForTimeout(300);
    await imperialOnly(page, 'machine');

    // The point: trend, spectrum, waterfall and 1× vector views.
    await page.goto(`${srv.url}/points/${walkPoint.id}`);
    await page.locator('dt', { hasText: /^Velocity RMS/ }).waitFor();
    await imperialOnly(page, 'point-trend');
    await page.getByRole('tab', { name: 'Spectrum' }).click();
    await page.locator('canvas').first().waitFor();
    await page
      .getByRole('radiogroup', { name: 'Measure' })
      .getByRole('radio', { name: 'Velocity' })
      .click();
    await page.waitForTimeout(600);
    await imperialOnly(page, 'point-spectrum');
    await page.getByRole('tab', { name: 'Waterfall' }).click();
    await chartCanvas(page, /^Waterfall of the last/);
    await page.getByRole('combobox', { name: 'Spectrum' }).selectOption('velocity');
    await page.getByText(/^Largest peaks as a table/).click();
    await page.getByRole('columnheader', { name: 'Amplitude (in/s)' }).first().waitFor();
    await page.waitForTimeout(400);
    await imperialOnly(page, 'point-waterfall');
    await page.getByRole('tab', { name: '1× vector' }).click();
    await chartCanvas(page, /^1× vector polar plot/);
    const vectors = page.getByRole('table', { name: 'Latest 1× vectors' });
    await vectors.getByRole('columnheader', { name: 'Amplitude (in/s RMS)' }).waitFor();
    // The newest 1× amplitude is the stored mm/s value ÷ 25.4 (three significant digits).
    const analyses = await (
      await srv.call('GET', `/api/v1/points/${walkPoint.id}/analyses`, { cookie })
    ).json();
    const newest = [...analyses.items]
      .filter((a: { shaftVectors?: unknown[] }) => (a.shaftVectors?.length ?? 0) > 0)
      .sort((x: { takenAt: string }, y: { takenAt: string }) =>
        y.takenAt.localeCompare(x.takenAt),
      )[0];
    const oneX = newest.shaftVectors.find((v: { order: number }) => v.order === 1);
    const cell = await vectors.getByRole('row').nth(1).getByRole('cell').nth(1).textContent();
    expect(Number(cell)).toBeCloseTo(oneX.velocityRmsMmS / 25.4, 3);
    await page.waitForTimeout(300);
    await imperialOnly(page, 'point-vector');

    // Alerts: the list and the open alert's detail.
    const [alert] = await srv.q<{ id: number }>(
      "SELECT id FROM alerts WHERE point_id = ? AND band_key = 'overall-velocity'",
      [walkPoint.id],
    );
    expect(alert).toBeDefined();
    await page.goto(`${srv.url}/alerts`);
    await page.getByText(WALK_TAG).first().waitFor();
    await imperialOnly(page, 'alerts');
    await page.goto(`${srv.url}/alerts?alert=${alert!.id}`);
    await page.getByTestId('alert-machine-zone').waitFor();
    await imperialOnly(page, 'alert-detail');

    // Limits: a stored level shows to four significant digits; saving with only the alert
    // level typed keeps the untouched danger level exactly as stored.
    const before = await (
      await srv.call('GET', `/api/v1/points/${walkPoint.id}/limits`, { cookie })
    ).json();
    const overall = before.bands.find((x: { key: string }) => x.key === 'overall-velocity');
    await page.goto(`${srv.url}/limits?point=${walkPoint.id}`);
    const band = page.getByRole('group', { name: /Overall velocity/ }).first();
    await band.waitFor();
    const shownDanger = await band.getByLabel('Danger level').inputValue();
    // e.g. 4.5 mm/s ÷ 25.4 = 0.177165… → "0.1772" (by hand).
    expect(shownDanger).toBe(String(Number((overall.dangerLevel / 25.4).toPrecision(4))));
    expect(shownDanger.replace(/^0\.0*/, '').length).toBeLessThanOrEqual(4);
    await imperialOnly(page, 'limits');
    await band.getByLabel('Alert level').fill('0.13');
    await page.getByRole('button', { name: 'Save limits…' }).click();
    await page.getByLabel('Reason for the change').fill('Alert level typed in inches');
    await page.getByRole('button', { name: 'Save with this reason' }).click();
    await page.getByText(/Saved as version \d+\./).waitFor();
    const after = await (
      await srv.call('GET', `/api/v1/points/${walkPoint.id}/limits`, { cookie })
    ).json();
    const saved = after.bands.find((x: { key: string }) => x.key === 'overall-velocity');
    expect(saved.alertLevel).toBe(3.302); // 0.13 × 25.4 (by hand)
    expect(saved.dangerLevel).toBe(overall.dangerLevel); // untouched: exactly as stored

    // The review and the audit log (the change just saved, its levels in in/s).
    await page.goto(`${srv.url}/review`);
    await page.getByText(WALK_TAG).filter({ visible: true }).first().waitFor();
    await page.waitForTimeout(300);
    await imperialOnly(page, 'review');
    await page.goto(`${srv.url}/audit`);
    await page
      .getByText(/alert level/)
      .first()
      .waitFor();
    await imperialOnly(page, 'audit');
    await page.context().close();
  });
});
