/**
 * The analyst's walk in a real browser: from an alert to the spectrum of its band in one
 * click, opening on the band's measure and span; a typed range; the harmonic cursor set by a
 * click without losing the zoom; the sideband cursor; cursors A/B; the dB scale; compare with
 * the change per line and a hover box holding both traces; a capture's quality where its
 * numbers are read; the waterfall's hover readout; the point page at tablet width (820 px);
 * and the harmonic, sideband and A/B cursors set with the keyboard alone.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import type { Locator, Page } from 'playwright-core';
import { screenshot, tallScreenshot, serverAndBrowserForFile } from '../support/browser.ts';
import { peakGFor, postAndAnalyse } from '../support/alert-captures.ts';
import { snapshotBody } from '../support/signals.ts';
import { focused, tabTo } from '../support/keyboard.ts';

const { srv, pageAs } = serverAndBrowserForFile({ gateway: true });
let alertId: number;
let pointId: number;
let unusableId: number;
const TAG = 'MFP-P101-MDE-H';
/** 1482 r/min: 1× at 24.7 Hz. */
const RPM = 1482;
const SHAFT_HZ = RPM / 60;
const HOUR = 3600_000;

beforeAll(async () => {
  // Hourly captures of P-101 with the speed: 1× growing past the template's alert level
  // (2.8 mm/s, persistence 2) and a 212 Hz bearing-like tone; the newest one clips
  // (60 g peak on a ±50 g range), so it is unusable and the header must say so.
  const velocities = [1.5, 1.6, 1.5, 3.5, 3.6, 3.7];
  const t0 = Date.now() - 10 * HOUR;
  const bodies = velocities.map((v, i) =>
    snapshotBody(TAG, `walk-${i}`, {
      n: 8192,
      tones: [
        { hz: SHAFT_HZ, peakG: peakGFor(v) },
        { hz: 212, peakG: 0.05 },
      ],
      noiseG: 0.001,
      seed: i,
      speedRpm: RPM,
      takenAt: new Date(t0 + i * HOUR).toISOString(),
    }),
  );
  bodies.push(
    snapshotBody(TAG, 'walk-clipped', {
      n: 8192,
      tones: [{ hz: SHAFT_HZ, peakG: 60 }],
      seed: 99,
      speedRpm: RPM,
      takenAt: new Date(t0 + 7 * HOUR).toISOString(),
    }),
  );
  await postAndAnalyse(srv, srv.key, bodies, 'walk');
  const cookie = await srv.signIn('engineer');
  const list = await (await srv.call('GET', '/api/v1/alerts', { cookie })).json();
  type Item = { id: number; pointTag: string; bandKey: string; pointId: number };
  const alert = (list.items as Item[]).find(
    (a) => a.pointTag === TAG && a.bandKey === 'overall-velocity',
  );
  expect(alert).toBeDefined();
  alertId = alert!.id;
  pointId = alert!.pointId;
  const [u] = await srv.q<{ id: number }>(
    "SELECT a.id FROM analyses a JOIN snapshots s ON s.id = a.snapshot_id WHERE s.uid = 'walk-clipped'",
  );
  unusableId = Number(u!.id);
}, 120_000);

/** The zoom keys' live line: "… : 0 Hz to 988.0 Hz" → [0, 988]. */
async function shownWindow(page: Page): Promise<[number, number]> {
  const text =
    (await page
      .getByRole('group', { name: 'Zoom the spectrum' })
      .getByRole('status')
      .textContent()) ?? '';
  const m = /: ([\d.]+) (?:Hz|order) to ([\d.]+) (?:Hz|order)/.exec(text);
  if (!m) throw new Error(`no window in "${text}"`);
  return [Number(m[1]), Number(m[2])];
}

/** Clicks the spectrum's plot at x on its axis, given the window shown (grid: 64 px left, 28 px right). */
async function clickAt(chart: Locator, x: number, view: [number, number]) {
  const box = (await chart.boundingBox())!;
  const plot = box.width - 64 - 28;
  await chart.click({ position: { x: 64 + ((x - view[0]) / (view[1] - view[0])) * plot, y: 160 } });
}

async function typeRange(page: Page, from: number, to: number) {
  const form = page.getByRole('form', { name: 'X range' });
  await form.getByLabel(/^From/).fill(String(from));
  await form.getByLabel(/^To/).fill(String(to));
  await form.getByRole('button', { name: 'Show range' }).click();
  await expect.poll(() => shownWindow(page)).toEqual([from, to]);
}

/** A table cell (a typed stand-in for the DOM: the root tsconfig has no DOM). */
interface Cell {
  textContent: string | null;
}

/** The rows of a readout table by its caption: [line, Hz, order, amplitude]. */
async function rows(page: Page, caption: string): Promise<string[][]> {
  const table = page.locator('table', { has: page.locator('caption', { hasText: caption }) });
  await table.waitFor();
  return table
    .locator('tbody tr')
    .evaluateAll((trs: { querySelectorAll(s: string): Iterable<Cell> }[]) =>
      trs.map((tr) => Array.from(tr.querySelectorAll('td'), (td) => td.textContent ?? '')),
    );
}

describe('from an alert to the spectrum of its band', () => {
  it('one click opens velocity over 0–40 orders; cursors keep the zoom; compare shows the change', async () => {
    const page = await pageAs('engineer', 1280, 900);
    await page.goto(`${srv.url}/alerts?alert=${alertId}`);
    const panel = page.getByRole('region', { name: /Overall velocity/ });
    const link = panel.getByRole('link', { name: /^Spectrum of Overall velocity/ });
    await link.waitFor();
    await screenshot(page, 'walk-1-alert');

    // Click 1 (and the only one): the spectrum of the alert's band.
    await link.click();
    await page.waitForURL(
      `**/points/${pointId}?band=overall-velocity&view=spectrum&alert=${alertId}`,
    );
    const chart = page.getByRole('img', { name: /^Velocity spectrum in mm\/s RMS against Hz/ });
    await chart.locator('canvas').first().waitFor();
    // 0–40 orders at 1482 r/min = 0–988 Hz (40 × 24.7 Hz).
    await expect.poll(() => shownWindow(page)).toEqual([0, 988]);
    await page.getByText(/Opened on Overall velocity/).waitFor();
    // The header names the unusable newest capture and reads the latest usable one.
    await page.getByRole('note', { name: 'Capture quality' }).first().waitFor();
    await page.getByTestId('header-values-from').waitFor();
    await tallScreenshot(page, 'walk-2-spectrum-opened');

    // A typed range, then the harmonic cursor by a click beside 1×: the window stays.
    await typeRange(page, 0, 200);
    await clickAt(chart, SHAFT_HZ + 1.5, [0, 200]);
    const harmonic = await rows(page, 'Harmonic cursor');
    expect(await shownWindow(page)).toEqual([0, 200]);
    // Snapped to the 1× line: within one line (1.25 Hz) of 24.7 Hz, order ≈ 1.
    expect(Math.abs(Number(harmonic[0]![1]) - SHAFT_HZ)).toBeLessThanOrEqual(1.25);
    expect(Math.abs(Number(harmonic[0]![2]) - 1)).toBeLessThan(0.06);
    expect(harmonic[1]![0]).toBe('2×');
    await tallScreenshot(page, 'walk-3-harmonic-cursor');

    // The sideband cursor on the 212 Hz tone, spaced by 1× (the default spacing).
    await typeRange(page, 100, 330);
    await page.getByRole('radio', { name: 'Sideband carrier' }).click();
    await clickAt(chart, 212, [100, 330]);
    const side = await rows(page, 'Sideband cursor');
    const carrier = side.find((r) => r[0] === 'carrier')!;
    expect(Math.abs(Number(carrier[1]) - 212)).toBeLessThanOrEqual(1.25);
    const plus1 = side.find((r) => r[0] === '+1')!;
    expect(Number(plus1[1]) - Number(carrier[1])).toBeCloseTo(SHAFT_HZ, 1);
    expect(await shownWindow(page)).toEqual([100, 330]);
    // The peaks table holds the 212 Hz tone above its stated floor.
    const peaks = await rows(page, 'Largest peaks in view');
    expect(peaks.some((r) => Math.abs(Number(r[1]) - 212) <= 1.25)).toBe(true);
    await tallScreenshot(page, 'walk-4-sideband-cursor');

    // Cursors A and B: their difference.
    await typeRange(page, 0, 300);
    await page.getByRole('radio', { name: 'Cursors A/B' }).click();
    await clickAt(chart, SHAFT_HZ, [0, 300]);
    await clickAt(chart, 212, [0, 300]);
    const delta = (await page.getByTestId('cursor-delta').textContent()) ?? '';
    const dHz = Number(/^(-?[\d.]+) Hz/.exec(delta)![1]);
    expect(Math.abs(dHz - (212 - SHAFT_HZ))).toBeLessThanOrEqual(2.5);

    // dB re ISO 1683: the axis title says so.
    await page.getByRole('radio', { name: 'dB' }).click();
    await page.getByRole('img', { name: /in dB re ISO 1683 \(mm\/s RMS\)/ }).waitFor();
    await tallScreenshot(page, 'walk-5-cursors-ab-db');
    await page.getByRole('radio', { name: 'Linear' }).click();

    // Compare with the first capture: overlay, the change per line, and one hover box with both.
    const picker = page.getByLabel('Compare with');
    const options = await picker.locator('option').allTextContents();
    await picker.selectOption({ label: options[options.length - 1]! });
    const compared = page.getByRole('img', { name: /change in dB per line/ });
    await compared.locator('canvas').first().waitFor();
    const cbox = (await compared.boundingBox())!;
    await compared.hover({
      position: { x: 64 + (SHAFT_HZ / 300) * (cbox.width - 64 - 28), y: 120 },
    });
    const tip = compared.locator('div', { hasText: /^[\d.]+ Hz.*Change: / }).last();
    await tip.waitFor();
    const tipText = (await tip.innerText()) ?? '';
    // One line per capture (both named by their time), then the change in dB.
    const lines = tipText.split('\n');
    expect(lines).toHaveLength(4);
    expect(lines[1]).toMatch(/: [\d.]+ mm\/s$/);
    expect(lines[2]).toMatch(/: [\d.]+ mm\/s$/);
    expect(lines[3]).toMatch(/^Change: [+-][\d.]+ dB$/);
    await screenshot(page, 'walk-6-compare');

    // The unusable capture: its reason on the spectrum view.
    await page.getByLabel('Snapshot', { exact: true }).selectOption(String(unusableId));
    await page.getByText(/is unusable: read this spectrum with care/).waitFor();
    await tallScreenshot(page, 'walk-7-unusable-capture');

    // Last step: the waterfall's hover readout (date, frequency, order, amplitude).
    await page.getByRole('tab', { name: 'Waterfall' }).click();
    const fall = page.getByRole('img', { name: /^Waterfall of the last/ });
    await fall.locator('canvas').first().waitFor();
    await page.getByRole('combobox', { name: 'Spectrum' }).selectOption('velocity');
    await page.getByText(/^Every trace has the same amplitude scale/).waitFor();
    await fall.scrollIntoViewIfNeeded();
    const fbox = (await fall.boundingBox())!;
    const readout = page.getByTestId('waterfall-readout');
    const seen: string[] = [];
    // The plot lies between the grid's margins (64 px left, 112 px right).
    for (let x = fbox.x + 66; x < fbox.x + fbox.width - 114; x += 8) {
      await page.mouse.move(x, fbox.y + fbox.height - 72);
      seen.push((await readout.textContent()) ?? '');
    }
    expect(
      seen.some((t) => /^Taken .* Hz .*mm\/s/.test(t)),
      seen.join('\n'),
    ).toBe(true);
    await screenshot(page, 'walk-8-waterfall-hover');
    await page.context().close();
  });

  it('at tablet width (820 px) the point page and its spectrum fit without sideways scrolling', async () => {
    const page = await pageAs('engineer', 820, 1180);
    await page.goto(`${srv.url}/points/${pointId}?band=overall-velocity&view=spectrum`);
    const chart = page.getByRole('img', { name: /^Velocity spectrum/ });
    await chart.locator('canvas').first().waitFor();
    // A string: the root tsconfig has no DOM types.
    const widths = await page.evaluate<{ doc: number; view: number }>(
      '({ doc: document.documentElement.scrollWidth, view: window.innerWidth })',
    );
    expect(widths.doc).toBeLessThanOrEqual(widths.view);
    const box = (await chart.boundingBox())!;
    expect(box.width).toBeGreaterThan(500);
    await tallScreenshot(page, 'walk-9-tablet-spectrum');
    await page.context().close();
  });

  it('with the keyboard alone, the keyboard cursor walks the peaks and sets the harmonic, sideband and A/B cursors without losing the zoom', async () => {
    const page = await pageAs('engineer', 1280, 900);
    await page.goto(`${srv.url}/points/${pointId}?band=overall-velocity&view=spectrum`);
    await page
      .getByRole('img', { name: /^Velocity spectrum/ })
      .locator('canvas')
      .first()
      .waitFor();
    // 0–40 orders at 1482 r/min = 0–988 Hz (40 × 24.7 Hz).
    await expect.poll(() => shownWindow(page)).toEqual([0, 988]);
    const slider = page.getByRole('slider', { name: 'Keyboard cursor' });
    const hzOf = async () => {
      const text = (await slider.getAttribute('aria-valuetext')) ?? '';
      const m = /^([\d.]+) Hz/.exec(text);
      if (!m) throw new Error(`no frequency in "${text}"`);
      return Number(m[1]);
    };
    /** Arrow right until the keyboard cursor stands within one line (1.25 Hz) of `hz`. */
    const walkTo = async (hz: number) => {
      for (let i = 0; i < 40; i++) {
        if (Math.abs((await hzOf()) - hz) <= 1.25) return;
        await page.keyboard.press('ArrowRight');
      }
      throw new Error(`the keyboard cursor never reached ${hz} Hz`);
    };
    const mode = async (name: string) => {
      await tabTo(
        page,
        (f) => f.role === 'radio' && f.state === 'true' && /cursor|carrier|A\/B/i.test(f.text),
        'the cursor mode',
        { back: true },
      );
      for (let i = 0; i < 3 && (await focused(page)).text !== name; i++)
        await page.keyboard.press('ArrowRight');
      expect(await focused(page)).toMatchObject({ text: name, state: 'true' });
      await tabTo(page, (f) => f.role === 'slider', 'the keyboard cursor');
    };

    // Harmonic cursor: Tab to the keyboard cursor; it starts on the largest peak in view (1×).
    await tabTo(page, (f) => f.role === 'slider', 'the keyboard cursor');
    expect((await focused(page)).name).toBe('Keyboard cursor');
    expect(Math.abs((await hzOf()) - SHAFT_HZ)).toBeLessThanOrEqual(1.25);
    await screenshot(page, 'walk-keys-1-focused');
    await page.keyboard.press('Enter');
    const harmonic = await rows(page, 'Harmonic cursor');
    expect(Math.abs(Number(harmonic[0]![1]) - SHAFT_HZ)).toBeLessThanOrEqual(1.25);
    expect(harmonic[1]![0]).toBe('2×');
    await page
      .getByTestId('cursor-keys-status')
      .filter({ hasText: /^Harmonic cursor set at 2[45]\.\d+ Hz · 1\.0\d+×/ })
      .waitFor();
    expect(await shownWindow(page)).toEqual([0, 988]);
    // Shift+arrow moves one line: the stored velocity spectrum's line spacing, from the API.
    const [a] = await srv.q<{ id: number }>(
      "SELECT a.id FROM analyses a JOIN snapshots s ON s.id = a.snapshot_id WHERE s.uid = 'walk-5'",
    );
    const spectrum = await (
      await srv.call('GET', `/api/v1/analyses/${a!.id}/spectrum?kind=velocity`, {
        cookie: await srv.signIn('engineer'),
      })
    ).json();
    const before = await hzOf();
    await page.keyboard.press('Shift+ArrowRight');
    expect((await hzOf()) - before).toBeCloseTo(spectrum.dfHz, 2);
    await page.keyboard.press('Shift+ArrowLeft');

    // Sideband carrier on the 212 Hz tone, spaced by 1× (the default).
    await mode('Sideband carrier');
    await walkTo(212);
    await page.keyboard.press('Enter');
    const side = await rows(page, 'Sideband cursor');
    const carrier = side.find((r) => r[0] === 'carrier')!;
    expect(Math.abs(Number(carrier[1]) - 212)).toBeLessThanOrEqual(1.25);
    const plus1 = side.find((r) => r[0] === '+1')!;
    expect(Number(plus1[1]) - Number(carrier[1])).toBeCloseTo(SHAFT_HZ, 1);
    expect(await shownWindow(page)).toEqual([0, 988]);

    // Cursors A and B: A on 1× (where the cursor starts), B walked to 212 Hz; their difference.
    await mode('Cursors A/B');
    expect(Math.abs((await hzOf()) - SHAFT_HZ)).toBeLessThanOrEqual(1.25);
    await page.keyboard.press('Enter');
    await page
      .getByTestId('cursor-keys-status')
      .filter({ hasText: /^Cursor A set at/ })
      .waitFor();
    await walkTo(212);
    await page.keyboard.press('Enter');
    await page
      .getByTestId('cursor-keys-status')
      .filter({ hasText: /^Cursor B set at 21\d\.\d+ Hz/ })
      .waitFor();
    const delta = (await page.getByTestId('cursor-delta').textContent()) ?? '';
    const dHz = Number(/^(-?[\d.]+) Hz/.exec(delta)![1]);
    expect(Math.abs(dHz - (212 - SHAFT_HZ))).toBeLessThanOrEqual(2.5);
    expect(await shownWindow(page)).toEqual([0, 988]);
    await tallScreenshot(page, 'walk-keys-2-cursors-set');
    await page.context().close();
  });
});
