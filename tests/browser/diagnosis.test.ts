import { beforeAll, describe, expect, it } from 'vitest';
import { demoChannels } from '@turnstone/demo-scenario/plant-channels';
import { simulateSnapshot, toIngestItem } from '@turnstone/demo-scenario/simulated-snapshot';
import { screenshot, chartCanvas as chart, serverAndBrowserForFile } from '../support/browser.ts';
import { pointOfTag, postAndAnalyse } from '../support/alert-captures.ts';

// P-201's developing unbalance from the gateway simulator (with tach pulses): eight captures
// a day apart over the last part of the story; the last ones carry an unbalance hint and the
// 1× vector grows.
const { srv, pageAs } = serverAndBrowserForFile({ gateway: true });
let pointId: number;
let machineId: number;
let alertId: number;
const TAG = 'MFP-P201-MDE-H';
const DAY = 86_400_000;

beforeAll(async () => {
  const channel = demoChannels('MFP').find((c) => c.tag === TAG)!;
  const now = Date.now();
  const bodies = Array.from({ length: 8 }, (_, i) =>
    toIngestItem(
      simulateSnapshot(channel, new Date(now - (7 - i) * DAY - 3600_000), 0.65 + 0.05 * i, {
        faults: false,
      }),
    ),
  );
  await postAndAnalyse(srv, srv.key, bodies);
  ({ pointId, machineId } = await pointOfTag(srv, TAG));
  const [a] = await srv.q(
    "SELECT id FROM alerts WHERE point_id = ? AND band_key = 'overall-velocity'",
    [pointId],
  );
  alertId = Number(a!.id);
});

describe('diagnosis hints and the 1× vector in a real browser', () => {
  it('the spectrum shows the hints beside the chart and marks the evidence of the chosen one', async () => {
    const page = await pageAs('planner', 1366, 900);
    await page.goto(`${srv.url}/points/${pointId}`);
    await page.getByRole('tab', { name: 'Spectrum' }).click();
    await chart(page, /^Velocity spectrum/);
    const hints = page.getByRole('region', { name: 'Diagnosis hints' });
    await hints.getByText(/hints, not verdicts/).waitFor();
    const unbalance = hints.getByRole('button', { name: /^Unbalance/ });
    expect(await unbalance.getAttribute('aria-pressed')).toBe('false');
    // Keyboard: focus the hint and press Enter.
    await unbalance.focus();
    await page.keyboard.press('Enter');
    expect(await unbalance.getAttribute('aria-pressed')).toBe('true');
    // The evidence is in the velocity spectrum: the chart switches to it and marks the peaks.
    await chart(page, /^Velocity spectrum .* evidence peaks of the unbalance hint marked/);
    await hints.getByRole('table', { name: 'Evidence for Unbalance' }).getByText('1×').waitFor();
    await screenshot(page, 'diagnosis-spectrum-hints');
    await page.context().close();
  });

  it('the point shows the 1× vector over time and on a polar plot', async () => {
    const page = await pageAs('engineer', 1366, 900);
    await page.goto(`${srv.url}/points/${pointId}`);
    await page.getByRole('tab', { name: '1× vector' }).click();
    await chart(page, /^1× vector over time/);
    await chart(page, /^1× vector polar plot/);
    const rows = page.getByRole('table', { name: 'Latest 1× vectors' }).getByRole('row');
    expect(await rows.count()).toBe(9); // header + the 8 captures
    // A developing unbalance grows at a steady phase: the 1× phase against a once-per-revolution
    // mark is set by where the heavy spot sits (definition; common practice, no source for the
    // tolerance). The simulator's build-up turns it by ~4° over these captures, plus ~2° scatter.
    const phases = (await rows.locator('td:last-child').allInnerTexts()).map(Number);
    expect(phases).toHaveLength(8);
    for (const a of phases)
      for (const b of phases) {
        const d = Math.abs(a - b) % 360;
        expect(Math.min(d, 360 - d)).toBeLessThan(12);
      }
    await screenshot(page, 'diagnosis-vector');
    await page.context().close();
  });

  it('the machine page and the alert detail show the current hints', async () => {
    const page = await pageAs('operator', 1366, 900);
    await page.goto(`${srv.url}/machines/${machineId}`);
    await page.getByRole('heading', { name: 'Current diagnosis hints' }).waitFor();
    await page
      .getByRole('heading', { name: /^Unbalance/ })
      .first()
      .waitFor();
    await screenshot(page, 'diagnosis-machine');
    await page.goto(`${srv.url}/alerts?alert=${alertId}`);
    await page.getByRole('heading', { name: 'Current diagnosis hints' }).waitFor();
    await page
      .getByRole('heading', { name: /^Unbalance/ })
      .first()
      .waitFor();
    await screenshot(page, 'diagnosis-alert');
    await page.context().close();
  });
});
