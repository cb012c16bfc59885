import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { thinSpectra } from '../../apps/server/src/features/worker/retention.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { launchBrowser, newPage, screenshot, signInAs } from '../support/browser.ts';
import { snapshotBody } from '../support/signals.ts';

// Three captures of one point on one day 200 days ago: the daily tier keeps the first
// (01:00) and thins 05:00 and 09:00 (policy defaults; common practice, no source).
let srv: TestServer;
let browser: Browser;
let pointId: number;
const TAG = 'MFP-P102-MDE-H';
const DAY = 86_400_000;

async function q(sqlText: string, params: unknown[] = []) {
  const [rows] = await srv.ctx.dbHandle.pool.query(sqlText, params);
  return rows as Record<string, unknown>[];
}

beforeAll(async () => {
  srv = await startTestServer();
  browser = await launchBrowser();
  const admin = await srv.signIn('admin');
  const key = (
    await (
      await srv.call('POST', '/api/v1/gateways', { cookie: admin, body: { siteId: 1, name: 'gw' } })
    ).json()
  ).apiKey as string;
  const day = new Date(Date.now() - 200 * DAY).toISOString().slice(0, 10);
  for (const [i, h] of ['01', '05', '09'].entries()) {
    const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
      body: snapshotBody(TAG, `ret-${h}`, {
        takenAt: `${day}T${h}:00:00.000Z`,
        tones: [{ hz: 24.7, peakG: 0.02 }],
        seed: i,
      }),
      headers: { authorization: `Bearer ${key}` },
    });
    expect(res.status).toBe(201);
  }
  await createWorker(srv.ctx).drain();
  const pass = await thinSpectra(srv.ctx.db, {
    spectraWholeDays: 14,
    spectraHourlyDays: 90,
    keepWindowMinutes: 60,
  });
  expect(pass.rows).toBe(2);
  const [p] = await q('SELECT id FROM points WHERE tag = ?', [TAG]);
  pointId = Number(p!.id);
});
afterAll(async () => {
  await browser?.close();
  await srv?.stop();
});

describe('a thinned capture on the point page', () => {
  it('says its spectrum is no longer stored and opens the nearest whole capture', async () => {
    const page = await newPage(browser, 1366, 900);
    await signInAs(page, srv.url, 'engineer');
    await page.goto(`${srv.url}/points/${pointId}`);
    await page.getByRole('tab', { name: 'Spectrum' }).click();
    // The newest capture (09:00) is chosen first; its spectra were thinned.
    await page.getByText('Spectrum no longer stored').waitFor();
    // The picker marks the thinned captures.
    const picker = page.getByLabel('Snapshot', { exact: true });
    expect(await picker.locator('option', { hasText: 'values only' }).count()).toBe(2);
    await page.getByText(/retention policy/).waitFor();
    await screenshot(page, 'retention-thinned-spectrum');
    await page.getByRole('button', { name: /^Open the capture of/ }).click();
    const c = page.getByRole('img', { name: /^Velocity spectrum/ });
    await c.waitFor();
    await c.locator('canvas').first().waitFor();
    expect(await page.getByText('Spectrum no longer stored').count()).toBe(0);
    await screenshot(page, 'retention-nearest-spectrum');
    await page.context().close();
  });

  it('the administrator reads the retention policy on the gateways screen', async () => {
    const page = await newPage(browser, 1366, 900);
    await signInAs(page, srv.url, 'admin');
    await page.goto(`${srv.url}/gateways`);
    const table = page.getByRole('table', { name: 'Retention policy' });
    await table.waitFor();
    await table.getByText('under 14 days').waitFor();
    await table.getByText('the first capture of each point in each hour (UTC)').waitFor();
    await page.getByText('kept 90 days after they arrive').waitFor();
    await page.getByRole('heading', { name: 'Data retention' }).scrollIntoViewIfNeeded();
    await screenshot(page, 'retention-policy-admin');
    await page.context().close();
  });
});
