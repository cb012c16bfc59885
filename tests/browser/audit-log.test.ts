/**
 * The admin reads a limit change in the audit log: the point by its tag and machine (not
 * "point #9") and the changed level as old → new value, with the engineer's reason.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { screenshot, serverAndBrowserForFile } from '../support/browser.ts';
import { captureVelocities } from '../support/alert-captures.ts';

const { srv, pageAs } = serverAndBrowserForFile({ gateway: true });
const TAG = 'MFP-P101-MDE-H';

beforeAll(async () => {
  // A first capture makes the point's limit set from its machine-type template (worker).
  await captureVelocities(srv, srv.key, TAG, [1.5]);
  // The engineer raises P-101's overall velocity alert level from the template's 2.8 mm/s
  // (ISO 20816-3 B/C boundary, group 2 rigid, from memory) to 3.1 mm/s.
  const [p] = await srv.q<{ id: number }>('SELECT id FROM points WHERE tag = ?', [TAG]);
  const cookie = await srv.signIn('engineer');
  const set = await (await srv.call('GET', `/api/v1/points/${p!.id}/limits`, { cookie })).json();
  type Band = { key: string; alertLevel: number };
  const bands = (set.bands as Band[]).map((b) =>
    b.key === 'overall-velocity' ? { ...b, alertLevel: 3.1 } : b,
  );
  expect((set.bands as Band[]).find((b) => b.key === 'overall-velocity')!.alertLevel).toBe(2.8);
  const res = await srv.call('PUT', `/api/v1/points/${p!.id}/limits`, {
    cookie,
    body: { bands, reason: 'Pump runs rougher since the impeller change; agreed with the vendor.' },
  });
  expect(res.status).toBe(200);
}, 120_000);

describe('audit log', () => {
  it('an admin reads a limit change with the point named and the old and new level', async () => {
    const page = await pageAs('admin');
    await page.getByRole('link', { name: 'Audit log' }).first().click();
    const row = page.locator('tr', { hasText: 'limits.update' });
    await row.waitFor();
    await row.getByText(`${TAG} · Intake pump P-101`).waitFor();
    const changes = row.getByRole('list', { name: 'Changes' });
    expect(await changes.textContent()).toBe(
      'Overall velocity 10–1000 Hz · alert level: 2.8 mm/s → 3.1 mm/s',
    );
    await row.getByText('Pump runs rougher since the impeller change').waitFor();
    expect(await row.getByText(/point #\d/).count()).toBe(0);
    await screenshot(page, 'audit-limit-change');
    await page.context().close();
  });
});
