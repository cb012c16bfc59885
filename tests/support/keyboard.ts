/** Keyboard-only browser steps: what has the focus, and Tab until it reaches something. */
import type { Page } from 'playwright-core';

export interface Focused {
  tag: string;
  role: string | null;
  text: string;
  name: string | null;
  state: string | null;
  id: string;
}

/** What has the focus, described: tag, role, accessible text, checked/selected state. */
export const focused = (page: Page) =>
  page.evaluate<Focused>(
    `(() => { const e = document.activeElement; const by = e.getAttribute('aria-labelledby');
      return { tag: e.tagName, role: e.getAttribute('role'),
      text: (e.textContent || '').trim(), name: e.getAttribute('aria-label') || (e.labels && e.labels[0] ? e.labels[0].textContent.trim() : null) || (by && document.getElementById(by) ? document.getElementById(by).textContent.trim() : null),
      state: e.getAttribute('aria-checked') || e.getAttribute('aria-selected'), id: e.getAttribute('data-alert-open') || '' }; })()`,
  );

/** Presses Tab (or Shift+Tab) until the focused element passes `test`; fails after `max` presses. */
export function tabTo(
  page: Page,
  test: (f: Focused) => boolean,
  what: string,
  options: { back?: boolean; max?: number } = {},
) {
  return tabUntil(page, focused, test, what, options);
}

/** {@link tabTo} with a test's own description of the focused element (`read`). */
export async function tabUntil<F>(
  page: Page,
  read: (page: Page) => Promise<F>,
  test: (f: F) => boolean,
  what: string,
  { back = false, max = 150 } = {},
) {
  for (let i = 0; i < max; i++) {
    await page.keyboard.press(back ? 'Shift+Tab' : 'Tab');
    if (test(await read(page))) return;
  }
  throw new Error(`Tab never reached ${what}`);
}
