/**
 * The machine page says why it is red: open alerts and findings at the top, each linked to its
 * point on its band; the zone with its range and a small trend of the governing band per
 * point; Limits and Setup for the engineer; one safety caution. At desktop and tablet width.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { launchBrowser, newPage, screenshot, signInAs } from '../support/browser.ts';
import { snapshotBody } from '../support/signals.ts';

let srv: TestServer;
let browser: Browser;
let machineId: number;
let pointId: number;
const TAG = 'MFP-P101-MDE-H';
const t0 = Date.now() - 5 * 86_400_000;

/** Peak g of a 24.7 Hz tone of `mmS` mm/s RMS: a = v·√2·2πf / 9806.65 (sinusoid calculus). */
const peakGFor = (mmS: number) => (mmS * Math.SQRT2 * 2 * Math.PI * 24.7) / 9806.65;

beforeAll(async () => {
  srv = await startTestServer();
  browser = await launchBrowser();
  const key = await srv.gatewayKey(1);
  const values = [1.2, 1.4, 3.3, 3.6, 5.1, 5.3];
  for (let i = 0; i < values.length; i++) {
    const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
      body: snapshotBody(TAG, `why-${i}`, {
        tones: [{ hz: 24.7, peakG: peakGFor(values[i]!) }],
        noiseG: 0.001,
        seed: i,
        speedRpm: 1482,
        takenAt: new Date(t0 + i * 3 * 3600_000).toISOString(),
      }),
      headers: { authorization: `Bearer ${key}` },
    });
    expect(res.status).toBe(201);
  }
  await createWorker(srv.ctx).drain();
  const [p] = await srv.q('SELECT id, machine_id FROM points WHERE tag = ?', [TAG]);
  pointId = Number(p!.id);
  machineId = Number(p!.machine_id);
  const engineer = await srv.signIn('engineer');
  const list = await srv.call('GET', `/api/v1/alerts?pointId=${pointId}`, { cookie: engineer });
  const overall = (await list.json()).items.find(
    (a: { bandKey: string }) => a.bandKey === 'overall-velocity',
  );
  const ack = await srv.call('POST', `/api/v1/alerts/${overall.id}/acknowledge`, {
    cookie: engineer,
    body: { note: 'Coupling guard off; alignment check booked' },
  });
  expect(ack.status).toBe(200);
  const f = await srv.call('POST', '/api/v1/findings', {
    cookie: await srv.signIn('planner'),
    body: { pointId, alertId: overall.id, bandKey: 'overall-velocity', title: 'Realign motor' },
  });
  expect(f.status).toBe(201);
});
afterAll(async () => {
  await browser?.close();
  await srv?.stop();
});

async function openMachine(page: Page, role: string) {
  await signInAs(page, srv.url, role);
  await page.goto(`${srv.url}/machines/${machineId}`);
  await page.getByRole('heading', { name: 'Why this state' }).waitFor();
  await page.getByRole('heading', { name: /^Open alerts \(\d+\)$/ }).waitFor();
}

describe('machine page: why is it red', () => {
  it('lists the open alerts and findings, each linked to its point on its band', async () => {
    const page = await newPage(browser, 1280, 1000);
    await openMachine(page, 'engineer');
    const alertLink = page.getByRole('link', {
      name: /Motor drive end, horizontal · Overall velocity/,
    });
    await alertLink.waitFor();
    expect(await alertLink.getAttribute('href')).toBe(`/points/${pointId}?band=overall-velocity`);
    await page
      .getByText(/acknowledged by .*: “Coupling guard off; alignment check booked”/)
      .waitFor();
    await page.getByRole('link', { name: 'Realign motor' }).waitFor();
    // Engineer's links.
    await page.getByRole('link', { name: 'Limits', exact: true }).last().waitFor();
    expect(
      await page.getByRole('main').getByRole('link', { name: 'Setup', exact: true }).count(),
    ).toBe(1);
    // The zone with its range for group 2 rigid (ISO 20816-3 group 2 table, from memory):
    // 5.3 mm/s is zone D, at or above 4.5 mm/s (written by the one number rule: 4.50).
    await page.getByText('≥ 4.50 mm/s').first().waitFor();
    // One safety caution on the page (the app's note), not a second one in the page body.
    expect(await page.getByText(/not a machine-protection system/).count()).toBe(1);
    await screenshot(page, 'machine-why');
    await alertLink.click();
    await page.waitForURL(`**/points/${pointId}?band=overall-velocity`);
    await page.context().close();
  });

  it('an operator sees why, without the engineer links; usable at tablet width (820 px)', async () => {
    const page = await newPage(browser, 820, 1180);
    await openMachine(page, 'operator');
    await page.getByRole('link', { name: 'Realign motor' }).waitFor();
    expect(
      await page.getByRole('main').getByRole('link', { name: 'Setup', exact: true }).count(),
    ).toBe(0);
    const width = await page.evaluate<number>('document.documentElement.scrollWidth');
    expect(width).toBeLessThanOrEqual(820);
    // The points table fits without scrolling sideways at this width.
    const table = page.getByRole('table').first();
    const fits = await table.evaluate(
      (t) => t.parentElement!.scrollWidth <= t.parentElement!.clientWidth,
    );
    expect(fits).toBe(true);
    await screenshot(page, 'machine-why-tablet');
    await page.context().close();
  });
});
