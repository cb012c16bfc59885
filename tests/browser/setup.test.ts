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

const q = (sqlText: string, params: unknown[] = []) => srv.q(sqlText, params);

describe('admin setup screens in a real browser', () => {
  it('an admin creates a gateway and sees its key once, in a dialog with a copy button', async () => {
    const page = await newPage(browser);
    await signInAs(page, srv.url, 'admin');
    await page.getByRole('navigation').first().getByRole('link', { name: 'Gateways' }).click();
    const form = page.getByRole('form', { name: 'New gateway' });
    // Submitting without a site shows the schema's message next to the field.
    await form.getByLabel('Name').fill('Pump hall cabinet 2');
    await form.getByRole('button', { name: 'Create gateway' }).click();
    await form.getByText('Choose a site.').waitFor();
    await form.getByLabel('Site').selectOption({ label: 'Marlow Fen Pumping Station (MFP)' });
    await form.getByRole('button', { name: 'Create gateway' }).click();

    const dialog = page.getByRole('dialog', { name: /API key for Pump hall cabinet 2/ });
    await dialog.waitFor();
    await dialog.getByText('This key is shown only once.').waitFor();
    await dialog.getByRole('button', { name: 'Copy key' }).waitFor();
    const key = await dialog.getByLabel('API key').inputValue();
    expect(key).toMatch(/^tsg_[0-9a-f]{12}_[A-Za-z0-9_-]{32}$/);
    // Where to post and an example request with this very key.
    await dialog.getByText(`${srv.url}/api/ingest/v1/snapshots`, { exact: true }).waitFor();
    expect(await dialog.getByLabel('Example request').textContent()).toContain(
      `Authorization: Bearer ${key}`,
    );
    await screenshot(page, 'gateways-key-once');
    await dialog.getByRole('button', { name: 'I have stored the key' }).click();
    await dialog.waitFor({ state: 'hidden' });

    // The list shows the prefix only; the key is nowhere on the page any more.
    const row = page.getByRole('row', { name: /Pump hall cabinet 2/ });
    await row.getByText(`tsg_${key.split('_')[1]}_…`).waitFor();
    expect(await page.content()).not.toContain(key);
    await page.reload();
    await page.getByRole('row', { name: /Pump hall cabinet 2/ }).waitFor();
    expect(await page.content()).not.toContain(key);

    // Revoke asks first, then shows the row as revoked.
    await page
      .getByRole('row', { name: /Pump hall cabinet 2/ })
      .getByRole('button', { name: 'Revoke' })
      .click();
    const confirm = page.getByRole('dialog', { name: /Revoke Pump hall cabinet 2/ });
    await confirm.getByRole('button', { name: 'Revoke gateway' }).click();
    await page
      .getByRole('row', { name: /Pump hall cabinet 2/ })
      .getByText(/Revoked/)
      .waitFor();
    await screenshot(page, 'gateways-list');
    await page.context().close();
  });

  it('an admin creates a machine with a bearing and then a point on it', async () => {
    const page = await newPage(browser);
    await signInAs(page, srv.url, 'admin');
    await page.getByRole('navigation').first().getByRole('link', { name: 'Setup' }).click();
    await page.getByRole('button', { name: 'Add machine in High-lift pumps' }).click();
    const form = page.getByRole('form', { name: 'Machine' });
    await form.getByLabel('Name', { exact: true }).fill('Backwash pump P-160');
    // A missing speed shows the schema message next to the field.
    await form.getByRole('button', { name: 'Create machine' }).click();
    await form.getByText('Nominal speed must be a number.').waitFor();
    await form.getByLabel('Nominal speed').fill('1485');
    await form.getByLabel('Power (optional)').fill('55');
    await form.getByRole('button', { name: 'Add bearing' }).click();
    const bearing = form.getByRole('group', { name: 'Bearing 1' });
    await bearing.getByLabel('Position').fill('Pump DE');
    await bearing.getByLabel('Designation').fill('6311');
    await bearing.getByLabel('Rolling elements').fill('8');
    await bearing.getByLabel('Ball diameter').fill('20.64');
    await bearing.getByLabel('Pitch diameter').fill('85');
    await screenshot(page, 'setup-machine-form');
    await form.getByRole('button', { name: 'Create machine' }).click();
    await page.getByRole('heading', { name: 'Backwash pump P-160' }).waitFor();

    await page.getByRole('button', { name: 'Add point to Backwash pump P-160' }).click();
    const pf = page.getByRole('form', { name: 'Point' });
    // A tag already in use gets the server's 409 message on the tag field.
    await pf.getByLabel('Tag').fill('MFP-P102-MDE-H');
    await pf.getByLabel('Name').fill('Pump DE, horizontal');
    await pf.getByLabel('Location').fill('Pump DE');
    await pf.getByLabel('Bearing').selectOption({ label: 'Pump DE (6311)' });
    await pf.getByRole('button', { name: 'Create point' }).click();
    await pf
      .getByText('Tag MFP-P102-MDE-H is already used by another point of this site.')
      .waitFor();
    await screenshot(page, 'setup-point-duplicate-tag');
    await pf.getByLabel('Tag').fill('MFP-P160-PDE-H');
    await pf.getByRole('button', { name: 'Create point' }).click();
    await page.getByRole('heading', { name: 'Point MFP-P160-PDE-H' }).waitFor();
    await screenshot(page, 'setup-point-created');

    const [row] = await q(
      `SELECT p.tag, b.designation, m.nominal_rpm FROM points p JOIN machines m ON m.id = p.machine_id
       JOIN bearings b ON b.id = p.bearing_id WHERE p.tag = ?`,
      ['MFP-P160-PDE-H'],
    );
    expect(row).toEqual({ tag: 'MFP-P160-PDE-H', designation: '6311', nominal_rpm: 1485 });

    // Deleting the point asks first, then closes the panel (not an empty "New point" form).
    page.once('dialog', (d) => void d.accept());
    await pf.getByRole('button', { name: 'Delete…' }).click();
    await page.getByText('Choose something to edit').waitFor();
    expect(await page.getByRole('heading', { name: 'New point' }).count()).toBe(0);
    expect(await q('SELECT id FROM points WHERE tag = ?', ['MFP-P160-PDE-H'])).toEqual([]);
    await page.context().close();
  });

  it('an engineer sees machines and points but no site or area editing, and the audit log', async () => {
    const page = await newPage(browser);
    await signInAs(page, srv.url, 'engineer');
    const nav = page.getByRole('navigation').first();
    await nav.getByRole('link', { name: 'Setup' }).click();
    await page.getByRole('button', { name: 'Add machine in High-lift pumps' }).waitFor();
    expect(await page.getByRole('button', { name: 'New site' }).count()).toBe(0);
    expect(await page.getByRole('button', { name: /Add area/ }).count()).toBe(0);
    expect(await nav.getByRole('link', { name: 'Gateways' }).count()).toBe(0);
    await page.setViewportSize({ width: 820, height: 1100 });
    await page.getByRole('button', { name: /^High-lift pump P-201/ }).click();
    await page.getByRole('form', { name: 'Machine' }).waitFor();
    await screenshot(page, 'setup-engineer-tablet');
    await page.setViewportSize({ width: 1280, height: 860 });
    // The machine's change history opens the audit log filtered to it.
    await page.getByRole('link', { name: 'Change history' }).click();
    expect(await page.getByLabel('Entity', { exact: true }).inputValue()).toBe('machine');
    await page.getByText('No entries').waitFor();
    await nav.getByRole('link', { name: 'Audit log' }).click();
    await page.getByRole('button', { name: 'Clear filters' }).click();
    await page.getByRole('cell', { name: 'point.create' }).first().waitFor();
    await page.getByLabel('Entity', { exact: true }).selectOption('gateway');
    await page.getByRole('cell', { name: 'gateway.create' }).first().waitFor();
    expect(await page.getByRole('cell', { name: 'point.create' }).count()).toBe(0);
    await screenshot(page, 'audit-log');
    await page.context().close();
  });
});
