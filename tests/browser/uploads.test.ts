import { describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { writeWav } from '@turnstone/dsp';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import type { TestServer } from '../support/test-server.ts';
import { newPage, screenshot, signInAs, withServerAndBrowser } from '../support/browser.ts';
import { toneCounts } from '../support/signals.ts';

let srv: TestServer;
let browser: Browser;
withServerAndBrowser((s, b) => {
  srv = s;
  browser = b;
});

async function waitForSnapshots(n: number) {
  for (let i = 0; i < 100; i++) {
    const [rows] = await srv.ctx.dbHandle.pool.query('SELECT COUNT(*) AS n FROM snapshots');
    if (Number((rows as { n: number }[])[0]!.n) >= n) return;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error('the upload never arrived');
}

describe('uploads in a real browser', () => {
  it('an engineer uploads a WAV, sees its progress, verdict and a link to the point; a bad file is refused', async () => {
    const page = await newPage(browser);
    await signInAs(page, srv.url, 'engineer');
    await page.getByRole('navigation').first().getByRole('link', { name: 'Uploads' }).click();
    await page
      .getByLabel('Point', { exact: true })
      .selectOption({ label: 'MFP-P102-MDE-H — Motor drive end, horizontal' });
    await page.getByLabel('Sensitivity').fill('100');
    await page.getByLabel('Full scale').fill('5');
    await page.getByLabel('Speed').fill('1480');
    // "Taken at" is read in the point's site's zone, whatever the browser's: 12:05 on 1 July
    // in Europe/London is 11:05 UTC (British Summer Time, UTC+1; the IANA tz database).
    await page.getByText("In Europe/London, the point's site's time.").waitFor();
    await page.getByLabel('Taken at').fill('2026-07-01T12:05');
    // 0.5 g peak at 100 Hz from the test tone generator: 0.354 g RMS (peak / √2).
    const wav = writeWav(
      toneCounts({ n: 8192, fs: 10240, tones: [{ hz: 100, peakG: 0.5 }] }),
      10240,
      'int16',
    );
    await page.getByLabel('Recordings to upload').setInputFiles([
      { name: 'p102-route.wav', mimeType: 'audio/wav', buffer: Buffer.from(wav) },
      {
        name: 'notes.csv',
        mimeType: 'text/csv',
        buffer: Buffer.from('hello,world\nthis,is\nnot,data\n'),
      },
    ]);
    await page.getByRole('button', { name: 'Upload 2 files' }).click();
    const good = page.getByRole('listitem', { name: 'p102-route.wav' });
    await good.getByRole('progressbar').waitFor();
    const bad = page.getByRole('listitem', { name: 'notes.csv' });
    await bad.getByText(/Refused:/).waitFor();
    await bad.getByText(/Not a readable CSV file/).waitFor();

    await waitForSnapshots(1);
    const [taken] = await srv.ctx.dbHandle.pool.query(
      "SELECT DATE_FORMAT(taken_at, '%Y-%m-%dT%H:%i') AS t FROM snapshots WHERE source = 'upload'",
    );
    expect((taken as { t: string }[]).map((r) => r.t)).toEqual(['2026-07-01T11:05']);
    expect(await createWorker(srv.ctx).drain()).toBe(1);
    await good.getByText('Quality OK').waitFor({ timeout: 10_000 });
    await good.getByText('0.354 g RMS').waitFor();
    const link = good.getByRole('link', { name: 'Open point MFP-P102-MDE-H' });
    expect(await link.getAttribute('href')).toMatch(/^\/points\/\d+$/);
    expect(await good.getByRole('progressbar').getAttribute('aria-valuenow')).toBe('100');
    await screenshot(page, 'uploads-verdict');
    await page.context().close();
  });
});
