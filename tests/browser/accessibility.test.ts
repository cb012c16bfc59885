/**
 * WCAG 2.1 A/AA in a real browser: axe-core on every screen of every role — the opened alert
 * detail panel, the dialogs, the machine page, the point page on each view and measure (the
 * waveform, waterfall and trend zoomed by their keys with their values tables open), the
 * limits editor with a point chosen — fails on any serious or critical violation. The totals
 * per rule are written to test-output/axe-totals.json. Data: three weeks of daily captures on
 * MFP-P102-MDE-H (a slowly rising 1× and a 212 Hz tone) and two captures over the alert level
 * on MFP-P101-MDE-H, ingested through the gateway API and analysed by the real worker.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { newPage, OUTPUT_DIR, serverAndBrowserForFile } from '../support/browser.ts';
import {
  captureVelocities,
  dailyBodies,
  pointOfTag,
  postAndAnalyse,
} from '../support/alert-captures.ts';
import { seriousViolations, type AxeFinding } from '../support/axe.ts';

const { srv, browser, pageAs } = serverAndBrowserForFile({ gateway: true });
let pointId: number;
let machineId: number;
let alertId: number;
/** rule → number of failing elements, summed over every screen checked. */
const totals: Record<string, number> = {};
const perScreen: Record<string, AxeFinding[]> = {};

beforeAll(async () => {
  const bodies = dailyBodies('MFP-P102-MDE-H', 'a11y', 21, (i) => [
    { hz: 24.7, peakG: 0.035 + 0.001 * i },
    { hz: 212, peakG: 0.05 },
  ]);
  await postAndAnalyse(srv, srv.key, bodies);
  await captureVelocities(srv, srv.key, 'MFP-P101-MDE-H', [1.5, 3.5, 3.5]);
  ({ pointId, machineId } = await pointOfTag(srv, 'MFP-P102-MDE-H'));
  const cookie = await srv.signIn('engineer');
  const alerts = await (await srv.call('GET', '/api/v1/alerts', { cookie })).json();
  alertId = Number(alerts.items[0].id);
}, 180_000);
afterAll(async () => {
  mkdirSync(OUTPUT_DIR, { recursive: true });
  writeFileSync(
    join(OUTPUT_DIR, 'axe-totals.json'),
    JSON.stringify({ totals, perScreen }, null, 2) + '\n',
  );
  console.log('axe serious/critical elements per rule:', totals);
});

/** Lets the page settle (requests done, lazy chunks in), then runs axe and records the result. */
async function check(page: Page, screen: string) {
  await page.waitForLoadState('networkidle');
  await page
    .getByText(/^Loading/)
    .first()
    .waitFor({ state: 'detached', timeout: 10_000 })
    .catch(() => undefined);
  await page.waitForTimeout(250);
  const found = await seriousViolations(page);
  perScreen[screen] = found;
  for (const f of found) totals[f.rule] = (totals[f.rule] ?? 0) + f.nodes.length;
  const lines = found.map(
    (f) =>
      `${f.rule} (${f.impact}, ${f.nodes.length}×): ${f.help} — e.g. ${f.nodes[0]!.target}: ${f.nodes[0]!.summary}`,
  );
  expect.soft(lines, `axe on ${screen}`).toEqual([]);
}

async function visit(page: Page, path: string, screen: string) {
  await page.goto(srv.url + path);
  await page.getByRole('main').first().waitFor();
  await check(page, screen);
}

/** The machine page and the point page on every view, spectrum measure and x axis. */
async function pointScreens(page: Page, role: string) {
  await visit(page, `/machines/${machineId}`, `${role} machine`);
  await visit(page, `/points/${pointId}`, `${role} point trend`);
  await page.getByRole('tab', { name: 'Spectrum' }).click();
  await page.getByRole('table').getByText('Largest peaks').waitFor();
  await check(page, `${role} point spectrum`);
  await page.getByRole('radio', { name: 'Orders' }).click();
  await check(page, `${role} point spectrum orders`);
  await page.getByRole('radio', { name: /^Acceleration/ }).click();
  await check(page, `${role} point spectrum acceleration`);
  await page.getByRole('tab', { name: 'Waveform' }).click();
  await check(page, `${role} point waveform`);
  // Zoomed in by its keys, with the values table open.
  await page.getByRole('button', { name: 'Zoom in' }).click();
  await page.getByText(/^Values as a table/).click();
  await page.getByRole('region', { name: 'Waveform values' }).waitFor();
  await check(page, `${role} point waveform values`);
  await page.getByRole('tab', { name: 'Waterfall' }).click();
  await check(page, `${role} point waterfall`);
  await page.getByRole('button', { name: 'Zoom in' }).click();
  await page.getByText(/^Largest peaks as a table/).click();
  await page.getByRole('region', { name: 'Waterfall peaks' }).waitFor();
  await check(page, `${role} point waterfall peaks`);
  // The trend's values table too.
  await page.getByRole('tab', { name: 'Trend' }).click();
  await page.getByText(/^Values as a table/).click();
  await page.getByRole('region', { name: /values$/ }).waitFor();
  await check(page, `${role} point trend values`);
}

async function alertScreens(page: Page, role: string) {
  await visit(page, '/alerts?state=all', `${role} alerts`);
  await visit(page, `/alerts?state=all&alert=${alertId}`, `${role} alert detail`);
}

describe('axe-core on every screen of every role (WCAG 2.0/2.1 A and AA)', () => {
  it('signed out: sign-in, forgot and reset password, invitation, unknown page', async () => {
    const page = await newPage(browser);
    for (const path of ['/sign-in', '/forgot-password', '/reset-password', '/accept-invite'])
      await visit(page, path, `visitor ${path}`);
    await page.goto(srv.url + '/sign-in');
    await page.getByLabel(/e-mail/i).fill('engineer@turnstone.local');
    await page.getByLabel(/password/i).fill('not the password');
    await page.getByRole('button', { name: /sign in/i }).click();
    await page.getByRole('alert').first().waitFor();
    await check(page, 'visitor sign-in with errors');
    await page.context().close();
  }, 300_000);

  it('operator', async () => {
    const page = await pageAs('operator');
    await visit(page, '/fleet', 'operator fleet');
    await alertScreens(page, 'operator');
    await pointScreens(page, 'operator');
    await visit(page, '/account', 'operator account');
    await visit(page, '/no-such-page', 'operator unknown page');
    await page.context().close();
  }, 300_000);

  it('maintenance planner', async () => {
    const page = await pageAs('planner');
    await visit(page, '/fleet', 'planner fleet');
    await alertScreens(page, 'planner');
    await visit(page, '/review', 'planner review');
    await pointScreens(page, 'planner');
    await visit(page, '/account', 'planner account');
    await page.context().close();
  }, 300_000);

  it('reliability engineer', async () => {
    const page = await pageAs('engineer');
    await visit(page, '/fleet', 'engineer fleet');
    await alertScreens(page, 'engineer');
    await pointScreens(page, 'engineer');
    await visit(page, '/limits', 'engineer limits');
    await visit(page, `/limits?point=${pointId}`, 'engineer limits with a point');
    const band = page.getByRole('group', { name: /Band 1: Overall velocity/ });
    await band.getByLabel('Alert level').fill('3');
    await page.getByRole('button', { name: 'Replay history' }).click();
    await page.getByTestId('replay-total').waitFor();
    await check(page, 'engineer limits replay');
    await page.getByRole('button', { name: 'Save limits…' }).click();
    await page.getByLabel('Reason for the change').waitFor();
    await check(page, 'engineer limits reason');
    await page.getByRole('button', { name: 'Cancel' }).click();
    // Leaving with unsaved edits asks first.
    await page.getByRole('tab', { name: 'A machine-type template' }).click();
    await page.getByRole('dialog', { name: 'Discard the unsaved limit changes?' }).waitFor();
    await check(page, 'engineer limits discard dialog');
    await page.getByRole('button', { name: 'Discard changes' }).click();
    await page.getByText(/Built-in pump template/).waitFor();
    await check(page, 'engineer limits template');
    await visit(page, '/review', 'engineer review');
    await page
      .getByRole('button', { name: /^Create finding for / })
      .first()
      .click();
    await page.getByRole('dialog', { name: 'Create finding' }).waitFor();
    await check(page, 'engineer create finding dialog');
    await page.keyboard.press('Escape');
    await visit(page, '/uploads', 'engineer uploads');
    await visit(page, '/setup', 'engineer setup');
    await visit(page, '/audit', 'engineer audit');
    await visit(page, '/account', 'engineer account');
    await page.context().close();
  }, 300_000);

  it('administrator', async () => {
    const page = await pageAs('admin');
    await visit(page, '/fleet', 'admin fleet');
    await alertScreens(page, 'admin');
    await visit(page, '/review', 'admin review');
    await visit(page, '/uploads', 'admin uploads');
    await visit(page, '/setup', 'admin setup');
    await visit(page, '/gateways', 'admin gateways');
    await page.getByRole('button', { name: 'Rotate key' }).first().click();
    await page.getByRole('dialog').waitFor();
    await check(page, 'admin gateway rotate dialog');
    await page.keyboard.press('Escape');
    await visit(page, '/audit', 'admin audit');
    await visit(page, '/users', 'admin users');
    await visit(page, '/integrations', 'admin integrations');
    await visit(page, '/mailbox', 'admin mailbox');
    await visit(page, '/account', 'admin account');
    await pointScreens(page, 'admin');
    await page.context().close();
  }, 300_000);
});
