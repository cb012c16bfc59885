/**
 * The fleet tree renders only the rows in view of its scroll box
 * (apps/web/src/features/fleet/utils/use-row-window.ts), and the keyboard still reaches every
 * row: the row it moves to is scrolled into view and named by aria-activedescendant
 * (WAI-ARIA Authoring Practices 1.2, "Tree View Pattern", keyboard interaction).
 */
import { describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import type { Fleet } from '@turnstone/contracts/fleet';
import type { TestServer } from '../support/test-server.ts';
import { newPage, screenshot, signInAs, withServerAndBrowser } from '../support/browser.ts';

let srv: TestServer;
let browser: Browser;
withServerAndBrowser((s, b) => {
  srv = s;
  browser = b;
});

/** Every row of the fully expanded tree: sites, areas, machines and points. */
async function fleetRowCount(): Promise<number> {
  const res = await srv.call('GET', '/api/v1/fleet', { cookie: await srv.signIn('engineer') });
  const fleet = (await res.json()) as Fleet;
  let n = 0;
  for (const site of fleet.items) {
    n += 1 + site.areas.length;
    for (const area of site.areas) {
      n += area.machines.length;
      for (const machine of area.machines) n += machine.points.length;
    }
  }
  return n;
}

/** The active row (aria-activedescendant) and whether it lies inside the tree's visible box. */
function activeRowInView(page: Page) {
  return page.evaluate(`(() => {
    const tree = document.querySelector('[role="tree"]');
    const id = tree.getAttribute('aria-activedescendant');
    const row = id ? document.getElementById(id) : null;
    if (!row) return { id, text: null, inView: false };
    const t = tree.getBoundingClientRect();
    const r = row.getBoundingClientRect();
    return { id, text: row.textContent, inView: r.top >= t.top - 1 && r.bottom <= t.bottom + 1 };
  })()`) as Promise<{ id: string | null; text: string | null; inView: boolean }>;
}

describe('the fleet tree', () => {
  it('renders the rows in view only, and End / Home reach the last and first row', async () => {
    const total = await fleetRowCount();
    const page = await newPage(browser);
    await signInAs(page, srv.url, 'engineer');
    const tree = page.getByRole('tree');
    await page.getByRole('treeitem').first().waitFor();
    const rendered = await page.getByRole('treeitem').count();
    // The demo plant's expanded tree is taller than the box: not every row is in the DOM.
    expect(rendered).toBeGreaterThan(10);
    expect(rendered).toBeLessThan(total);
    const first = (await page.getByRole('treeitem').first().textContent()) ?? '';

    await tree.focus();
    await page.keyboard.press('End');
    await expect.poll(async () => (await activeRowInView(page)).inView).toBe(true);
    const last = await activeRowInView(page);
    // The last row of the expanded tree is a point: its tag (site code first) is on it.
    expect(last.text).toMatch(/[A-Z]{2,}-[A-Z0-9]+-/);
    await expect.poll(() => page.getByRole('treeitem', { name: first }).count()).toBe(0);
    // The header names where the first visible row sits (site › area …).
    await expect.poll(() => page.getByText(/ › /).count()).toBeGreaterThan(0);
    await screenshot(page, 'fleet-tree-end');

    await page.keyboard.press('Home');
    await expect.poll(async () => (await activeRowInView(page)).text).toBe(first);
    expect((await activeRowInView(page)).inView).toBe(true);
    await page.context().close();
  });
});
