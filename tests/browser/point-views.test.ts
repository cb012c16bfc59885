import { readFileSync } from 'node:fs';
import { beforeAll, describe, expect, it } from 'vitest';
import {
  screenshot,
  chartCanvas as canvasIn,
  serverAndBrowserForFile,
} from '../support/browser.ts';
import { dailyBodies, pointOfTag, postAndAnalyse } from '../support/alert-captures.ts';

const { srv, pageAs } = serverAndBrowserForFile({ gateway: true });
let pointId: number;
let machineId: number;
let clippedAnalysisId: number;
const TAG = 'MFP-P102-MDE-H';

beforeAll(async () => {
  // Three weeks of daily captures with a slowly growing 1× (24.7 Hz at 1482 r/min; from
  // ≈ 1.6 to ≈ 2.5 mm/s RMS, v = a/2πf, so the alert level 2.8 mm/s lies ahead) and a
  // bearing-like tone at 212 Hz; the one in the middle clips (60 g peak on a ±50 g ADC range).
  const bodies = dailyBodies(TAG, 'bv', 21, (i) =>
    i === 10
      ? [{ hz: 24.7, peakG: 60 }]
      : [
          { hz: 24.7, peakG: 0.035 + 0.001 * i },
          { hz: 212, peakG: 0.05 },
        ],
  );
  await postAndAnalyse(srv, srv.key, bodies);
  ({ pointId, machineId } = await pointOfTag(srv, TAG));
  const [a] = await srv.q(
    "SELECT a.id FROM analyses a JOIN snapshots s ON s.id = a.snapshot_id WHERE s.uid = 'bv-10'",
  );
  clippedAnalysisId = Number(a!.id);
});

describe('point analysis views in a real browser', () => {
  it('the machine page lists its points with values, zone and small trends', async () => {
    const page = await pageAs('engineer', 1280, 900);
    await page.goto(`${srv.url}/machines/${machineId}`);
    await page.getByRole('heading', { name: 'Fault frequencies' }).waitFor();
    await page
      .getByText(/Zone [ABCD]/)
      .first()
      .waitFor();
    await page
      .getByRole('table')
      .getByRole('link', { name: 'Motor drive end, horizontal', exact: true })
      .waitFor();
    await screenshot(page, 'machine-page');
    await page.context().close();
  });

  it('opens a point from the fleet tree, sees trend and spectrum charts, switches to orders and downloads a CSV', async () => {
    const page = await pageAs('operator', 1280, 900);
    await page.goto(`${srv.url}/points/${pointId}`);
    await page.getByRole('heading', { name: 'Motor drive end, horizontal' }).waitFor();
    await canvasIn(page, /^Trend of /);
    await page.getByText('Alert level', { exact: true }).waitFor();
    // Rising towards alert: the projection names a crossing date.
    await page.getByText(/^Alert by /).waitFor();
    await screenshot(page, 'point-trend');

    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('link', { name: 'Download trend CSV' }).click(),
    ]);
    expect(download.suggestedFilename()).toMatch(/^MFP-P102-MDE-H_overall-velocity_.*\.csv$/);
    const text = readFileSync((await download.path())!, 'utf8');
    expect(text.split('\n')[0]).toBe(
      'taken_at_utc,overall-velocity_mm_per_s,quality,band_from_hz,band_to_hz',
    );
    expect(text.trim().split('\n').length).toBe(22);

    await page.getByRole('tab', { name: 'Spectrum' }).click();
    // With no alert band to open on: velocity, 0–40 orders of running speed.
    await canvasIn(page, /^Velocity spectrum in mm\/s RMS against Hz/);
    await page.getByRole('table').getByText('Largest peaks').waitFor();
    await screenshot(page, 'point-spectrum-hz');

    await page.getByRole('radio', { name: 'Orders' }).click();
    await canvasIn(page, /against order/);
    await page.getByLabel('Compare with').selectOption({ index: 3 });
    await canvasIn(page, /with a second snapshot/);
    await screenshot(page, 'point-spectrum-orders');

    await page.getByRole('tab', { name: 'Waveform' }).click();
    await page.getByLabel('Snapshot', { exact: true }).selectOption(String(clippedAnalysisId));
    await canvasIn(page, /clipped, with the ADC rails drawn/);
    await page.getByText('Bits used').waitFor();
    await screenshot(page, 'point-waveform-clipped');

    await page.getByRole('tab', { name: 'Waterfall' }).click();
    await canvasIn(page, /^Waterfall of the last/);
    await screenshot(page, 'point-waterfall');
    await page.context().close();
  });

  it('the fleet tree links a point to its page', async () => {
    const page = await pageAs('planner', 1280, 900);
    await page.getByRole('treeitem').first().waitFor();
    const search = page
      .getByRole('searchbox')
      .or(page.getByPlaceholder(/search/i))
      .first();
    await search.fill(TAG);
    await page.getByRole('link', { name: 'Motor drive end, horizontal' }).first().click();
    await page.waitForURL(`**/points/${pointId}`);
    await canvasIn(page, /^Trend of /);
    await page.context().close();
  });
});
