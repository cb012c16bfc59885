/**
 * The planner's main job in a real browser: open the weekly review, pick the week, turn a
 * forecast row into a finding, see it listed and move it to planned, change its priority, owner
 * and planned downtime, export the CSV, print.
 * Data: two weeks of daily captures on MFP-P102-MDE-H whose 1× velocity rises 1.00 → 1.65
 * mm/s RMS (see tests/api/review.test.ts for the numbers), and two captures over the alert
 * level on MFP-P101-MDE-H, ingested through the gateway API and analysed by the real worker.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { strFromU8, unzipSync } from 'fflate';
import { beforeAll, describe, expect, it } from 'vitest';
import { screenshot, tallScreenshot, serverAndBrowserForFile } from '../support/browser.ts';
import { postAndAnalyse } from '../support/alert-captures.ts';
import { snapshotBody } from '../support/signals.ts';
import { formatDateTime } from '@turnstone/contracts/dates';

const { srv, pageAs } = serverAndBrowserForFile({ gateway: true });
let CLIPPED = '';
const RISING = 'MFP-P102-MDE-H';
const DAY_MS = 86_400_000;
const DAY0 = Date.parse('2026-11-02T12:00:00Z');
const SHAFT_HZ = 1480 / 60;
const peakGOf = (vRms: number) => (vRms * Math.SQRT2 * 2 * Math.PI * SHAFT_HZ) / 9806.65;

beforeAll(async () => {
  const body = (tag: string, uid: string, day: number, vRms: number) =>
    snapshotBody(tag, uid, {
      takenAt: new Date(DAY0 + day * DAY_MS).toISOString(),
      tones: [{ hz: SHAFT_HZ, peakG: peakGOf(vRms) }],
      noiseG: 0.0002,
      speedRpm: 1480,
      seed: day + 1,
      sensitivityMvPerG: 1000,
      fullScaleV: 0.5,
    });
  const bodies = [];
  for (let d = 0; d <= 13; d++) bodies.push(body(RISING, `b-rise-${d}`, d, 1 + 0.05 * d));
  for (const d of [12, 13]) bodies.push(body('MFP-P101-MDE-H', `b-alert-${d}`, d, 3.0));
  // One clipped capture (0.8 g peak into a 0.5 g full scale) on a third point: a quality notice.
  const [row] = await srv.q(
    "SELECT tag FROM points WHERE tag LIKE 'MFP-%' AND tag NOT IN ('MFP-P101-MDE-H', ?) ORDER BY id LIMIT 1",
    [RISING],
  );
  CLIPPED = String(row!.tag);
  bodies.push(
    snapshotBody(CLIPPED, 'b-clipped', {
      takenAt: new Date(DAY0 + 11 * DAY_MS).toISOString(),
      tones: [{ hz: SHAFT_HZ, peakG: 0.8 }],
      speedRpm: 1480,
      sensitivityMvPerG: 1000,
      fullScaleV: 0.5,
    }),
  );
  await postAndAnalyse(srv, srv.key, bodies);
}, 120_000);

describe('weekly review in a real browser', () => {
  it('planner opens the review, creates a finding from a forecast row, plans it, exports CSV and prints', async () => {
    const page = await pageAs('planner');
    await page.getByRole('navigation').first().getByRole('link', { name: 'Review' }).click();
    await page.getByRole('heading', { name: 'Weekly review' }).waitFor();
    // The default week (ending today) has no captures: the tables say so.
    await page.getByText('No band rose above the noise threshold').waitFor();
    await screenshot(page, 'review-empty-week');

    await page.getByLabel('Week ending').fill('2026-11-15');
    const forecasts = page.locator('#forecasts');
    await forecasts.getByRole('link', { name: RISING }).first().waitFor();
    const movers = page.locator('#movers');
    const moverRow = movers
      .getByRole('row')
      .filter({ hasText: RISING })
      .filter({ hasText: '1× running speed' });
    // +30.4 %: (1.50 − 1.15)/1.15, tests/api/review.test.ts; 7 values in each week.
    await moverRow.getByText('+30.4 %').waitFor();
    expect(await moverRow.getByText('7 values').count()).toBe(2);
    // Grouped by machine, with the noise threshold stated.
    await movers
      .locator('[data-machine-group="Intake pump P-102"]')
      .getByRole('rowheader')
      .waitFor();
    await movers
      .getByText('at least 5 % above last week’s and each week has at least 3 values')
      .waitFor();
    expect(await movers.getByRole('link', { name: RISING }).first().getAttribute('href')).toMatch(
      /^\/points\/\d+$/,
    );
    await page.locator('#open-alerts').getByText('MFP-P101-MDE-H').first().waitFor();
    await tallScreenshot(page, 'review-planner');

    await forecasts
      .getByRole('button', { name: `Create finding for ${RISING}, 1× running speed` })
      .click();
    const dialog = page.getByRole('dialog', { name: 'Create finding' });
    await dialog.waitFor();
    const title = dialog.getByLabel('Title');
    expect(await title.inputValue()).toContain('1× running speed projected to reach alert');
    // A bad work-order reference is refused next to the field, by the shared schema.
    await dialog.getByLabel('Work-order reference').fill(`WO ${'9'.repeat(62)}`);
    await dialog.getByRole('button', { name: 'Save finding' }).click();
    await dialog.getByText('At most 64 characters').waitFor();
    await dialog.getByLabel('Work-order reference').fill('');
    await title.fill('Check P-102 motor DE: 1× rising towards alert');
    await dialog.getByLabel('Due date').fill('2026-11-20');
    await dialog.getByLabel('Note').fill('Balance check at the next stop.');
    await dialog.getByLabel('Priority').selectOption('high');
    await dialog.getByLabel('Owner').fill('Mechanical crew A');
    await screenshot(page, 'review-create-finding');
    await dialog.getByRole('button', { name: 'Save finding' }).click();
    await dialog.waitFor({ state: 'hidden' });

    const findings = page.locator('#findings');
    const row = findings.getByRole('row').filter({ hasText: 'Check P-102 motor DE' });
    await row.waitFor();
    await row.getByText('Open', { exact: true }).waitFor();
    await row.getByText('High', { exact: true }).waitFor();
    await row.getByText('Mechanical crew A').waitFor();
    await row.getByRole('button', { name: /Mark planned/ }).click();
    await row.getByLabel(/Work-order reference for/).fill('WO-2026-1187');
    const patched = page.waitForResponse(
      (r) => r.url().includes('/api/v1/findings/') && r.request().method() === 'PATCH',
    );
    await row.getByRole('button', { name: 'Mark planned', exact: true }).click();
    expect((await patched).status()).toBe(200);
    await row.getByText('Planned', { exact: true }).waitFor();
    await row.getByText('WO-2026-1187').waitFor();
    const [audit] = (await srv.ctx.dbHandle.pool.query(
      "SELECT action FROM audit_log WHERE entity = 'finding' ORDER BY id",
    )) as unknown as [{ action: string }[]];
    expect(audit.map((a) => a.action)).toEqual(['finding.create', 'finding.planned']);
    await tallScreenshot(page, 'review-finding-planned');

    // Priority, owner and planned downtime change after creation, in the same form; bad
    // downtime is refused beside the field and nothing is sent.
    await row.getByRole('button', { name: 'Edit: Check P-102 motor DE' }).click();
    const edit = page.getByRole('dialog', { name: 'Edit finding' });
    await edit.waitFor();
    expect(await edit.getByLabel('Work-order reference').inputValue()).toBe('WO-2026-1187');
    await edit.getByLabel('Priority').selectOption('medium');
    await edit.getByLabel('Owner').fill('Mechanical crew B');
    await edit.getByLabel('Planned downtime (h)').fill('4 h');
    await edit.getByRole('button', { name: 'Save changes' }).click();
    await edit.getByText('Give the downtime in hours, like 4 or 1.5').waitFor();
    await screenshot(page, 'review-edit-finding-error');
    // A planned finding keeps its work order: the server's refusal lands beside the field.
    await edit.getByLabel('Planned downtime (h)').fill('6,5');
    await edit.getByLabel('Work-order reference').fill('');
    await edit.getByRole('button', { name: 'Save changes' }).click();
    await edit.getByText('Give the work-order reference to mark it planned').waitFor();
    await edit.getByLabel('Work-order reference').fill('WO-2026-1187');
    const edited = page.waitForResponse(
      (r) => r.url().includes('/api/v1/findings/') && r.request().method() === 'PATCH',
    );
    await edit.getByRole('button', { name: 'Save changes' }).click();
    expect((await edited).status()).toBe(200);
    await edit.waitFor({ state: 'hidden' });
    await row.getByText('Mechanical crew B').waitFor();
    await row.getByText('6.50 h').waitFor();
    await row.getByText('Medium', { exact: true }).waitFor();
    const [entries] = (await srv.ctx.dbHandle.pool.query(
      "SELECT action, `before`, `after` FROM audit_log WHERE entity = 'finding' ORDER BY id",
    )) as unknown as [{ action: string; before: unknown; after: unknown }[]];
    const last = entries.at(-1)!;
    const json = (v: unknown) => (typeof v === 'string' ? JSON.parse(v) : v);
    expect(last.action).toBe('finding.update');
    expect(json(last.before)).toMatchObject({ priority: 'high', owner: 'Mechanical crew A' });
    expect(json(last.after)).toMatchObject({
      priority: 'medium',
      owner: 'Mechanical crew B',
      plannedDowntimeHours: 6.5,
    });
    await tallScreenshot(page, 'review-finding-edited');

    // Filters: state and ISO due week (2026-11-20 is in 2026-W47, ISO 8601).
    await findings.getByLabel('State').selectOption('planned');
    await findings.getByLabel('Due in week').fill('2026-W47');
    await row.waitFor();
    await findings.getByLabel('Due in week').fill('2026-W48');
    await findings.getByText('No findings to show.').waitFor();
    await screenshot(page, 'review-findings-filtered');
    await findings.getByLabel('Due in week').fill('2026-W47');
    await row.waitFor();

    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('link', { name: 'Export CSV files (ZIP)' }).click(),
    ]);
    expect(download.suggestedFilename()).toBe('turnstone-review-2026-11-15.zip');
    const files = unzipSync(readFileSync((await download.path())!));
    expect(strFromU8(files['rising-bands.csv']!)).toContain(RISING);
    expect(strFromU8(files['findings-due.csv']!)).toContain('WO-2026-1187');

    // Paper through Chromium's own PDF: the summary (KPIs, top machines, forecasts,
    // findings) fits two A4 pages; the details follow from a new page.
    const pages = (pdf: Buffer) =>
      (pdf.toString('latin1').match(/\/Type\s*\/Page\b(?!s)/g) ?? []).length;
    await page.emulateMedia({ media: 'print' });
    expect(await page.getByRole('navigation').first().isVisible()).toBe(false);
    await page.getByText('Turnstone · weekly review').waitFor();
    await page.getByText('Top machines by rise').waitFor();
    const whole = await page.pdf({ format: 'A4', printBackground: true });
    writeFileSync('test-output/review-print.pdf', whole);
    await page.addStyleTag({ content: '.review-details { display: none !important; }' });
    const summaryOnly = await page.pdf({ format: 'A4', printBackground: true });
    writeFileSync('test-output/review-print-summary.pdf', summaryOnly);
    expect(pages(summaryOnly)).toBeGreaterThanOrEqual(1);
    expect(pages(summaryOnly)).toBeLessThanOrEqual(2);
    expect(pages(whole)).toBeGreaterThan(pages(summaryOnly));
    await screenshot(page, 'review-print-summary');
    await page.context().close();
  });

  it('planner marks a quality notice reviewed; the point page shows who reviewed it and when', async () => {
    const page = await pageAs('planner');
    await page.goto(`${srv.url}/review?weekEnding=2026-11-15`);
    const notices = page.locator('#quality-notices');
    await notices.getByRole('button', { name: `Mark reviewed: notices of ${CLIPPED}` }).click();
    await page
      .getByText(`1 quality notice of ${CLIPPED} marked reviewed by Pat Planner at`)
      .waitFor();
    await notices.getByText('No unreviewed quality notices this week.').waitFor();
    const [stored] = await srv.q(
      'SELECT n.reviewed_at FROM quality_notices n JOIN points p ON p.id = n.point_id WHERE p.tag = ?',
      [CLIPPED],
    );
    const at = (stored!.reviewed_at as Date).getTime();
    await screenshot(page, 'review-notice-reviewed');

    const [p] = await srv.q('SELECT id FROM points WHERE tag = ?', [CLIPPED]);
    await page.goto(`${srv.url}/points/${p!.id}`);
    const area = page.getByRole('region', { name: /Data quality/ });
    await area.waitFor();
    await area.getByText('all notices reviewed').waitFor();
    // The stored time, in the one date format (contracts/dates.ts) and the zone the screen names.
    await area.getByText(`Reviewed by Pat Planner, ${formatDateTime(at, 'UTC')}`).waitFor();
    await area.getByText('Unusable').waitFor();
    await screenshot(page, 'point-quality-notices');
    await page.context().close();
  });

  it('shows the review at tablet width', async () => {
    const page = await pageAs('planner', 820, 1100);
    await page.goto(`${srv.url}/review?weekEnding=2026-11-15&weeksAhead=4`);
    await page.locator('#forecasts').getByRole('link', { name: RISING }).first().waitFor();
    await tallScreenshot(page, 'review-tablet');
    await page.context().close();
  });
});
