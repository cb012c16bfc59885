/**
 * Chart zoom and values without a pointer, and a zoom status line that tells the truth after
 * a pointer zoom (WCAG 2.1.1 keyboard, 1.1.1 text alternatives, 4.1.3 status messages). On the
 * waveform and waterfall views: the zoom keys change the stated range; the values table opens
 * from the keyboard and its numbers are the API's own samples and spectrum lines, decoded here
 * from the same answers the page got. On every chart with a zoom: a mouse-wheel zoom moves
 * the status line. Data: four captures of two tones (24.7 Hz and 212 Hz, the larger) on
 * MFP-P102-MDE-H, ingested through the gateway API and analysed by the real worker.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Locator, Page } from 'playwright-core';
import { decodeFloat32Base64 } from '@turnstone/contracts/points';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { launchBrowser, newPage, screenshot, signInAs } from '../support/browser.ts';
import { gatewayKey } from '../support/alert-captures.ts';
import { snapshotBody } from '../support/signals.ts';

let srv: TestServer;
let browser: Browser;
let pointId: number;
let cookie: string;
const TAG = 'MFP-P102-MDE-H';
const FS = 10240;
const N = 8192;

beforeAll(async () => {
  srv = await startTestServer();
  browser = await launchBrowser();
  const key = await gatewayKey(srv, 1);
  for (let i = 0; i < 4; i++) {
    const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
      body: snapshotBody(TAG, `zoom-${i}`, {
        n: N,
        fs: FS,
        takenAt: new Date(Date.now() - (4 - i) * 86_400_000).toISOString(),
        tones: [
          { hz: 24.7, peakG: 0.03 + 0.002 * i },
          { hz: 212, peakG: 0.08 },
        ],
        speedRpm: 1482,
        seed: i + 1,
      }),
      headers: { authorization: `Bearer ${key}` },
    });
    expect(res.status).toBe(201);
  }
  await createWorker(srv.ctx, { owner: 'zoom' }).drain();
  const [rows] = await srv.ctx.dbHandle.pool.query('SELECT id FROM points WHERE tag = ?', [TAG]);
  pointId = Number((rows as { id: number }[])[0]!.id);
  cookie = await srv.signIn('engineer');
}, 120_000);
afterAll(async () => {
  await browser?.close();
  await srv?.stop();
});

const focused = (page: Page) =>
  page.evaluate<{ tag: string; role: string | null; text: string; name: string | null }>(
    `(() => { const e = document.activeElement; return { tag: e.tagName, role: e.getAttribute('role'),
      text: (e.textContent || '').trim(), name: e.getAttribute('aria-label') }; })()`,
  );

async function tabTo(
  page: Page,
  test: (f: Awaited<ReturnType<typeof focused>>) => boolean,
  what: string,
  { back = false, max = 80 } = {},
) {
  for (let i = 0; i < max; i++) {
    await page.keyboard.press(back ? 'Shift+Tab' : 'Tab');
    if (test(await focused(page))) return;
  }
  throw new Error(`Tab never reached ${what}`);
}

/** The view tabs by arrow keys, from the Trend tab. */
async function openView(page: Page, view: string) {
  await tabTo(page, (f) => f.role === 'tab', 'the view tabs');
  for (let i = 0; i < 6 && (await focused(page)).text !== view; i++)
    await page.keyboard.press('ArrowRight');
  expect((await focused(page)).text).toBe(view);
}

interface Stated {
  start: number;
  end: number;
  /** The window in axis units (NaN on the trend, which states dates). */
  from: number;
  to: number;
}

/** "… 12.5 ms to 200.0 ms" or "… 0 Hz (front trace) to 80.00 Hz …": the two numbers. */
function range(text: string): [number, number] {
  const m = /(-?\d[\d.]*) [^\d]*?to (-?\d[\d.]*)/.exec(text);
  return m ? [Number(m[1]), Number(m[2])] : [NaN, NaN];
}

/** The zoom status line of `group`, parsed: per cent of the range and the range in axis units. */
async function stated(group: Locator): Promise<Stated> {
  const text = (await group.getByRole('status').textContent()) ?? '';
  const m = /Showing (\d+) %–(\d+) % of the range: (.*)$/.exec(text);
  if (!m) throw new Error(`zoom status not understood: "${text}"`);
  const [from, to] = range(m[3]!);
  return { start: +m[1]!, end: +m[2]!, from, to };
}

/** The range a values table's disclosure states. */
const summaryRange = async (page: Page, title: RegExp) =>
  range((await page.locator('summary').filter({ hasText: title }).textContent()) ?? '');

/** The status line once two reads 300 ms apart agree. */
async function statedSettled(group: Locator): Promise<Stated> {
  let last = JSON.stringify(await stated(group));
  for (let i = 0; i < 20; i++) {
    await new Promise((r) => setTimeout(r, 300));
    const now = JSON.stringify(await stated(group));
    if (now === last) break;
    last = now;
  }
  return stated(group);
}

/** Waits until the status line differs from `before`, then parses it. */
async function statedAfter(group: Locator, before: Stated): Promise<Stated> {
  await expect
    .poll(async () => JSON.stringify(await stated(group)))
    .not.toBe(JSON.stringify(before));
  return stated(group);
}

interface Cell {
  textContent: string | null;
}
/** The body rows' cell texts (a typed stand-in for the DOM: the root tsconfig has no DOM). */
const cells = (table: Locator) =>
  table
    .locator('tbody tr')
    .evaluateAll((trs: { querySelectorAll(s: string): Iterable<Cell> }[]) =>
      trs.map((tr) => Array.from(tr.querySelectorAll('td'), (td) => td.textContent ?? '')),
    );

/** Four significant digits, as the table prints: close to that precision. */
const close4 = (shown: number, actual: number) =>
  Math.abs(shown - actual) <= Math.abs(actual) * 6e-4 + 1e-9;

describe('chart zoom and values by keyboard', () => {
  it('waveform: the zoom keys change the stated range and the values table shows the API samples of the window', async () => {
    const page = await newPage(browser, 1280, 900);
    await signInAs(page, srv.url, 'engineer');
    await page.goto(`${srv.url}/points/${pointId}`);
    await page.getByRole('img', { name: /^Trend of / }).waitFor();
    await openView(page, 'Waveform');
    await page.getByRole('img', { name: /^Time waveform in g/ }).waitFor();
    const analysisId = Number(await page.getByLabel('Snapshot', { exact: true }).inputValue());
    const w = await (
      await srv.call('GET', `/api/v1/analyses/${analysisId}/waveform`, { cookie })
    ).json();
    const samples = decodeFloat32Base64(w.values);
    expect(samples.length).toBe(N);
    const dtMs = 1000 / w.sampleRateHz;
    const lastMs = (samples.length - 1) * dtMs;

    const group = page.getByRole('group', { name: 'Zoom the waveform' });
    let s = await stated(group);
    expect(s).toMatchObject({ start: 0, end: 100, from: 0 });
    expect(close4(s.to, lastMs)).toBe(true);

    // The whole capture in 200 rows: each row is a real sample, and the largest magnitude of
    // the capture is among them (thinning keeps peaks; common practice, no source).
    await tabTo(page, (f) => f.tag === 'SUMMARY' && /^Values as a table/.test(f.text), 'Values');
    await page.keyboard.press('Enter');
    const table = page.getByRole('region', { name: 'Waveform values' }).getByRole('table');
    await table.waitFor();
    let rows = await cells(table);
    expect(rows.length).toBe(200);
    for (const [index, time, value] of rows) {
      const i = Number(index);
      expect(Number(time)).toBeCloseTo(i * dtMs, 2);
      expect(close4(Number(value), samples[i]!), `sample ${i}`).toBe(true);
    }
    let peak = 0;
    for (const v of samples) peak = Math.max(peak, Math.abs(v));
    expect(rows.some(([, , v]) => close4(Math.abs(Number(v)), peak))).toBe(true);

    // Zoom in five times by keyboard: 1/32 of the capture, 256 samples → still thinned;
    // the sixth leaves 128, each one listed.
    await tabTo(page, (f) => f.text === 'Zoom in', 'Zoom in', { back: true });
    await page.keyboard.press('Enter');
    s = await statedAfter(group, s);
    expect(s).toMatchObject({ start: 25, end: 75 });
    expect(close4(s.from, 0.25 * lastMs)).toBe(true);
    expect(close4(s.to, 0.75 * lastMs)).toBe(true);
    for (let k = 0; k < 5; k++) {
      await page.keyboard.press('Enter');
      s = await statedAfter(group, s);
    }
    const width = lastMs / 64;
    expect(close4(s.to - s.from, width) || Math.abs(s.to - s.from - width) < 0.2).toBe(true);
    await tabTo(page, (f) => f.name === 'Move right', 'Move right');
    await page.keyboard.press('Enter');
    const moved = await statedAfter(group, s);
    expect(moved.from).toBeCloseTo(s.from + width / 2, 0);

    rows = await cells(table);
    const first = Math.ceil(moved.from / dtMs - 0.01);
    expect(rows.length).toBeGreaterThanOrEqual(126);
    expect(rows.length).toBeLessThanOrEqual(130);
    // Every sample in the window, in order, each the API's value.
    expect(Math.abs(Number(rows[0]![0]) - first)).toBeLessThanOrEqual(1);
    rows.forEach(([index, , value], r) => {
      expect(Number(index)).toBe(Number(rows[0]![0]) + r);
      expect(close4(Number(value), samples[Number(index)]!), `sample ${index}`).toBe(true);
    });
    expect(await summaryRange(page, /^Values as a table/)).toEqual([moved.from, moved.to]);
    // The table scrolls by keyboard.
    await tabTo(page, (f) => f.name === 'Waveform values', 'the table');
    await page.keyboard.press('PageDown');
    await screenshot(page, 'chart-zoom-waveform-table-focus');
    await tabTo(page, (f) => f.text === 'Zoom out', 'Zoom out', { back: true });
    await screenshot(page, 'chart-zoom-waveform-keyboard-values');
    await page.context().close();
  });

  it('waterfall: the zoom keys change the stated band and the peaks table holds each spectrum’s largest lines in it', async () => {
    const page = await newPage(browser, 1280, 1000);
    await signInAs(page, srv.url, 'engineer');
    await page.goto(`${srv.url}/points/${pointId}`);
    await page.getByRole('img', { name: /^Trend of / }).waitFor();
    await openView(page, 'Waterfall');
    await page.getByRole('img', { name: /^Waterfall of the last/ }).waitFor();
    const wf = await (
      await srv.call('GET', `/api/v1/points/${pointId}/waterfall?kind=acceleration&limit=20`, {
        cookie,
      })
    ).json();
    const spectra = (wf.items as { step: number; values: string }[]).map((i) => ({
      step: i.step,
      v: decodeFloat32Base64(i.values),
    }));
    expect(spectra.length).toBe(4);

    const group = page.getByRole('group', { name: 'Zoom the waterfall' });
    let s = await stated(group);
    expect(s).toMatchObject({ start: 0, end: 100, from: 0 });
    await tabTo(page, (f) => f.tag === 'SUMMARY' && /^Largest peaks/.test(f.text), 'the peaks');
    await page.keyboard.press('Enter');
    const table = page.getByRole('region', { name: 'Waterfall peaks' }).getByRole('table');
    await table.waitFor();

    /** Each row: its largest peak is a line of that spectrum, the largest line in the band. */
    const checkRows = async (from: number, to: number) => {
      const rows = await cells(table);
      expect(rows.length).toBe(spectra.length);
      rows.forEach((row, r) => {
        const { step, v } = spectra[r]!;
        const hz = Number(row[1]);
        const amp = Number(row[2]);
        const k = Math.round(hz / step);
        expect(Math.abs(k * step - hz)).toBeLessThan(0.006);
        expect(close4(amp, v[k]!), `row ${r} line ${k}`).toBe(true);
        expect(hz).toBeGreaterThanOrEqual(from - step);
        expect(hz).toBeLessThanOrEqual(to + step);
        // Largest line strictly inside the band (the band's edge lines may be shoulders).
        let top = 0;
        const end = Math.min(v.length - 1, Math.floor(to / step));
        for (let j = Math.ceil(from / step) + 1; j < end; j++) top = Math.max(top, v[j]!);
        expect(v[k]!).toBeGreaterThanOrEqual(top * (1 - 1e-6));
        // Second and third peaks: lines of the spectrum, not above the first.
        for (const c of [3, 5]) {
          if (row[c] === '—') continue;
          const kk = Math.round(Number(row[c]) / step);
          expect(close4(Number(row[c + 1]), v[kk]!)).toBe(true);
          expect(v[kk]!).toBeLessThanOrEqual(v[k]!);
        }
      });
      return rows;
    };
    // Whole band: the 212 Hz tone (0.08 g peak against 0.03–0.036 g at 24.7 Hz) is the
    // largest line of every capture (the signal as generated; common practice, no source).
    const whole = await checkRows(0, Infinity);
    for (const row of whole)
      expect(Math.abs(Number(row[1]) - 212)).toBeLessThan(2 * spectra[0]!.step);

    // Zoom into the low band by keyboard: in then all the way left, where only 24.7 Hz lives.
    await tabTo(page, (f) => f.text === 'Zoom in', 'Zoom in', { back: true });
    for (let k = 0; k < 5; k++) {
      await page.keyboard.press('Enter');
      s = await statedAfter(group, s);
    }
    await page.keyboard.press('Tab');
    await page.keyboard.press('Tab');
    expect((await focused(page)).name).toBe('Move left');
    for (let k = 0; k < 60 && s.start > 0; k++) {
      await page.keyboard.press('Enter');
      s = await statedAfter(group, s);
    }
    expect(s.start).toBe(0);
    expect(s.to).toBeLessThan(212);
    await expect.poll(() => summaryRange(page, /^Largest peaks/)).toEqual([0, s.to]);
    const low = await checkRows(0, s.to);
    for (const row of low)
      expect(Math.abs(Number(row[1]) - 24.7)).toBeLessThan(2 * spectra[0]!.step);
    // The band's own peak grows capture by capture (newest first: 0.036 → 0.03 g peak).
    const amps = low.map((r) => Number(r[2]));
    for (let r = 1; r < amps.length; r++) expect(amps[r]!).toBeLessThan(amps[r - 1]!);
    await screenshot(page, 'chart-zoom-waterfall-keyboard-values');
    await tabTo(page, (f) => f.name === 'Waterfall peaks', 'the peaks table');
    await screenshot(page, 'chart-zoom-waterfall-table-focus');
    await page.context().close();
  });

  it('a mouse-wheel zoom moves the status line of every chart with a zoom, and the slider does too', async () => {
    const page = await newPage(browser, 1280, 900);
    await signInAs(page, srv.url, 'engineer');
    await page.goto(`${srv.url}/points/${pointId}`);
    const views = [
      { tab: 'Trend', img: /^Trend of /, group: 'Zoom the trend' },
      // The spectrum opens on 0–40 orders: its whole range first.
      { tab: 'Spectrum', img: /^Velocity spectrum/, group: 'Zoom the spectrum', whole: true },
      {
        tab: 'Waveform',
        img: /^Time waveform in g/,
        group: 'Zoom the waveform',
        slider: { gridLeft: 64, table: /^Values as a table/ },
      },
      {
        tab: 'Waterfall',
        img: /^Waterfall of the last/,
        group: 'Zoom the waterfall',
        slider: { gridLeft: 74, table: /^Largest peaks as a table/ },
      },
    ];
    for (const v of views) {
      await page.getByRole('tab', { name: v.tab, exact: true }).click();
      const img = page.getByRole('img', { name: v.img });
      await img.waitFor();
      await page.waitForTimeout(200);
      const group = page.getByRole('group', { name: v.group });
      if ('whole' in v) {
        await group.getByRole('button', { name: 'Whole range' }).click();
        await page.getByText('Showing 0 %–100 % of the range').waitFor();
      }
      const before = await stated(group);
      expect(before, v.tab).toMatchObject({ start: 0, end: 100 });
      // The chart may sit below the fold (the point page grew above it): bring it into view
      // so the wheel lands on it and not on the page's fixed footer.
      await img.scrollIntoViewIfNeeded();
      const box = (await img.boundingBox())!;
      await page.mouse.move(box.x + box.width / 2, box.y + box.height / 3);
      await page.mouse.wheel(0, -400);
      const after = await statedAfter(group, before);
      expect(after.start, v.tab).toBeGreaterThan(0);
      expect(after.end, v.tab).toBeLessThan(100);
      if (v.tab !== 'Trend')
        expect(after.to - after.from, v.tab).toBeLessThan(before.to - before.from);
      if (v.slider) {
        // The slider's left handle, dragged right: the line follows, and so does the table
        // (the waterfall redraws its band while the drag goes on).
        await page.getByRole('button', { name: 'Whole range' }).click();
        const whole = await statedAfter(group, after);
        expect(whole).toMatchObject({ start: 0, end: 100 });
        // Slider: 20 px high, 12 px above the chart's bottom; its left handle a few pixels
        // right of the grid's left edge (64 px). Measured again: the click may scroll the page.
        const at = (await img.boundingBox())!;
        const y = at.y + at.height - 12 - 10;
        const x = at.x + v.slider.gridLeft + 3;
        await page.mouse.move(x, y);
        await page.mouse.down();
        await page.mouse.move(x + 150, y, { steps: 8 });
        await page.mouse.up();
        await statedAfter(group, whole);
        // The line follows the drag's last moves a moment after the button is up: read it once
        // it has stopped changing.
        const slid = await statedSettled(group);
        expect(slid.start).toBeGreaterThan(5);
        expect(slid.end).toBe(100);
        await expect.poll(() => summaryRange(page, v.slider.table)).toEqual([slid.from, slid.to]);
      }
    }
    await page.context().close();
  });
});
