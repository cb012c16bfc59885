/**
 * axe-core (Deque's accessibility engine, npm `axe-core`) run inside the page under test, with
 * the WCAG 2.0 and 2.1 level A and AA rules (axe's tags wcag2a, wcag2aa, wcag21a, wcag21aa).
 * The script is evaluated through the DevTools protocol, so the app's Content-Security-Policy
 * (no inline scripts) stays as it ships.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import type { Page } from 'playwright-core';

const AXE_SOURCE = readFileSync(
  createRequire(import.meta.url).resolve('axe-core/axe.min.js'),
  'utf8',
);
export const WCAG_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'];

export interface AxeFinding {
  rule: string;
  impact: string;
  help: string;
  /** One entry per failing element: its CSS selector and axe's summary. */
  nodes: { target: string; summary: string }[];
}

/** The serious and critical violations on the page as it is now. */
export async function seriousViolations(page: Page): Promise<AxeFinding[]> {
  const loaded = await page.evaluate<boolean>(`typeof window.axe === 'object'`);
  if (!loaded) await page.evaluate(AXE_SOURCE);
  // A string: the root tsconfig has no DOM types.
  return page.evaluate<AxeFinding[]>(`(async () => {
    const r = await window.axe.run(document, {
      runOnly: { type: 'tag', values: ${JSON.stringify(WCAG_TAGS)} },
      resultTypes: ['violations'],
    });
    return r.violations
      .filter((v) => v.impact === 'serious' || v.impact === 'critical')
      .map((v) => ({
        rule: v.id,
        impact: v.impact,
        help: v.help,
        nodes: v.nodes.map((n) => ({
          target: n.target.join(' '),
          summary: (n.failureSummary || '').split('\\n').slice(0, 3).join(' '),
        })),
      }));
  })()`);
}
