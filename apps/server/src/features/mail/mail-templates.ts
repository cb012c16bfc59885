/**
 * Shared pieces of every message: HTML escaping, the plain layout and the safety caution.
 * Every value that reaches HTML goes through `esc`.
 */
import { formatDateTimeZone } from '@turnstone/contracts/dates';

/** The sentence every alert message carries (DESIGN.md "Safety"). */
export const SAFETY_CAUTION =
  'Turnstone is not a machine-protection system: alerts are guidance, limits are set by competent people against the manufacturer’s data, and any inspection follows the site’s isolation and lock-out procedures.';

const HTML_ESCAPES: Record<string, string> = {
  '&': '&amp;',
  '<': '&lt;',
  '>': '&gt;',
  '"': '&quot;',
  "'": '&#39;',
};

export function esc(value: unknown): string {
  return String(value ?? '').replace(/[&<>"']/g, (c) => HTML_ESCAPES[c]!);
}

/** Numbers in messages follow the app's one number rule (three significant digits). */
export { formatNumber as num } from '@turnstone/contracts/number-format';

export function utc(d: Date): string {
  // The one date format of screens, files and mail (contracts/dates.ts): 2026-11-30 02:17 UTC.
  return formatDateTimeZone(d, 'UTC');
}

export interface Rendered {
  subject: string;
  text: string;
  html: string;
}

/**
 * Wraps already-escaped HTML rows in the one plain layout all messages share; the document
 * names its language and carries the title (WCAG 3.1.1, 2.4.2), as every message is English.
 */
export function htmlLayout(title: string, bodyHtml: string, footer: string): string {
  return [
    `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>${esc(title)}</title></head>`,
    '<body style="margin:0;padding:24px;background:#f6f2ea;color:#1f2328;font-family:system-ui,sans-serif;font-size:14px;line-height:1.5">',
    '<div style="max-width:640px;margin:0 auto;background:#fffdf8;border:1px solid #d9d2c3;padding:20px">',
    `<h1 style="font-size:18px;margin:0 0 12px">${esc(title)}</h1>`,
    bodyHtml,
    `<p style="margin-top:20px;font-size:12px;color:#555">${esc(footer)}</p>`,
    '</div></body></html>',
  ].join('');
}

/** A two-column table of label → value (values escaped here). */
export function htmlFacts(rows: [string, string][]): string {
  const tr = rows
    .map(
      ([k, v]) =>
        `<tr><th style="text-align:left;padding:2px 12px 2px 0;font-weight:600;vertical-align:top">${esc(k)}</th><td style="padding:2px 0;font-family:'Roboto Mono',monospace">${esc(v)}</td></tr>`,
    )
    .join('');
  return `<table style="border-collapse:collapse">${tr}</table>`;
}

export function htmlLink(href: string, label: string): string {
  return `<p><a href="${esc(href)}" style="color:#1d5c63">${esc(label)}</a></p>`;
}

export function textFacts(rows: [string, string][]): string {
  const w = Math.max(...rows.map(([k]) => k.length));
  return rows.map(([k, v]) => `${(k + ':').padEnd(w + 2)}${v}`).join('\n');
}
