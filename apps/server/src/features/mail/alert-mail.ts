/**
 * Alert notifications: an alert's state change (raised, escalated, cleared) → one outbox
 * row per subscribed user, inside the analysis transaction. The dedupe key
 * `alert:<alert event id>:<user id>` makes "one message per user per alert event" a
 * database rule even when a user has several matching subscriptions.
 */
import type { AppContext } from '../../lib/context.ts';
import {
  SAFETY_CAUTION,
  esc,
  htmlFacts,
  htmlLayout,
  htmlLink,
  num,
  textFacts,
  utc,
  type Rendered,
} from './mail-templates.ts';
import { mailBaseUrl, pointLink } from './mail-links.ts';
import type { Tx } from '@turnstone/db/client';
import {
  diagnosisCodeNames,
  evidenceUnits,
  type Diagnosis,
  type DiagnosisHintItem,
} from '@turnstone/contracts/points';
import { formatQuantity, restateUnits } from '@turnstone/contracts/number-format';
import {
  displayUnitText,
  toDisplay,
  unitSystemSchema,
  type UnitSystem,
} from '@turnstone/contracts/units';
import { enqueueMail, HOURLY_KIND } from './outbox-repository.ts';
import {
  alertForMail,
  analysisAtOrBefore,
  lastAlertEvent,
  subscribersOf,
} from './mail-repository.ts';
import {
  PICTURE_HEIGHT,
  PICTURE_WIDTH,
  renderBandPicture,
  svgDataUrl,
  type BandPictureInput,
} from './band-picture.ts';
import { alertMailLink } from '../alerts/alert-mail-link.ts';
import { recentBandValues } from '../alerts/alerts-repository.ts';
import { bandRuleOf } from '../alerts/alerts-service.ts';

/** How every alert mail ends: the safety caution, then why the reader receives it. */
const closingText = (footer: string) => [`Safety: ${SAFETY_CAUTION}`, '', footer, ''];
const SAFETY_HTML = `<p style="border-left:3px solid #1d5c63;padding-left:8px"><strong>Safety:</strong> ${esc(SAFETY_CAUTION)}</p>`;

export type AlertChangeKind = 'raised' | 'escalated' | 'cleared';

export interface AlertMailFacts {
  alertId: number;
  kind: AlertChangeKind;
  level: 'alert' | 'danger';
  siteCode: string;
  siteName: string;
  areaName: string;
  machineId: number;
  machineName: string;
  pointId: number;
  pointTag: string;
  pointName: string;
  bandName: string;
  unit: string;
  value: number;
  limit: number;
  peak: number;
  at: Date;
  verdict: string;
  suspect: boolean;
  /** The top diagnosis hint of the capture that changed the alert, when it has one. */
  topHint?: DiagnosisHintItem | null;
}

/** "1× 24.7 Hz (1.00×) 6.40 mm/s RMS; 2× …", amplitudes in the reader's unit system. */
function evidenceText(h: DiagnosisHintItem, system: UnitSystem): string {
  return h.evidence
    .map((e) => {
      const [unit, measure] = evidenceUnits[e.spectrum].split(' ') as [string, string];
      return `${e.label} ${num(e.hz)} Hz (${e.order.toFixed(2)}×) ${formatQuantity(e.amplitude, unit, system)} ${measure}`;
    })
    .join('; ');
}

const HINT_CAUTION =
  'A likely cause read from the spectral pattern — a hint, not a verdict; confirm on the machine.';

const VERDICT_TEXT: Record<string, string> = {
  ok: 'ok — the capture passed the quality checks',
  suspect: 'suspect — the capture has quality findings; treat the value with care',
  unusable: 'unusable — the capture failed the quality checks',
};

/** What an alert mail carries besides its facts: the signed link to the alert, the picture. */
export interface AlertMailExtras {
  /** The signed link that opens the alert (alert-mail-link.ts). */
  alertLink?: string;
  /** The band's recent trend with its levels, an SVG document (band-picture.ts). */
  pictureSvg?: string | null;
  /** The recipient's unit system: values in mm/s and µm (metric) or in/s and mil. */
  unitSystem?: UnitSystem;
}

export function renderAlertMail(
  f: AlertMailFacts,
  link: string,
  extras: AlertMailExtras = {},
): Rendered {
  const system = extras.unitSystem ?? 'metric';
  const v = (value: number) => formatQuantity(value, f.unit, system);
  const what =
    f.kind === 'raised'
      ? `${f.level === 'danger' ? 'Danger' : 'Alert'} raised`
      : f.kind === 'escalated'
        ? 'Escalated to danger'
        : `${f.level === 'danger' ? 'Danger' : 'Alert'} cleared`;
  const valueLine =
    f.kind === 'cleared'
      ? `${v(f.value)}, back below the ${f.level} level ${v(f.limit)} (highest while open: ${v(f.peak)})`
      : `${v(f.value)} against the ${f.level} level ${v(f.limit)}`;
  const facts: [string, string][] = [
    ['Machine', `${f.machineName} (${f.siteCode} · ${f.areaName})`],
    ['Point', `${f.pointTag} — ${f.pointName}`],
    ['Band', f.bandName],
    ['Value', valueLine],
    ['Capture quality', VERDICT_TEXT[f.verdict] ?? f.verdict],
    ['Taken', utc(f.at)],
  ];
  const hint = f.kind === 'cleared' ? null : (f.topHint ?? null);
  if (hint) {
    const summary = restateUnits(hint.summary, system);
    facts.push(['Likely cause (hint)', `${diagnosisCodeNames[hint.code]}: ${summary}`]);
    facts.push(['Evidence', evidenceText(hint, system)]);
  }
  const subject = `[Turnstone] ${what}: ${f.machineName} ${f.pointTag} — ${f.bandName} ${v(f.value)}`;
  const footer = 'You receive this because of your notification settings (Account in Turnstone).';
  const text = [
    `${what} on ${f.machineName}, ${f.siteName}.`,
    '',
    textFacts(facts),
    '',
    ...(hint ? [HINT_CAUTION, ''] : []),
    ...(extras.alertLink ? [`Open the alert (sign-in required): ${extras.alertLink}`] : []),
    `Point view: ${link}`,
    '',
    ...closingText(footer),
  ].join('\n');
  const html = htmlLayout(
    `${what}: ${f.machineName}`,
    [
      `<p>${esc(what)} on ${esc(f.machineName)}, ${esc(f.siteName)}.</p>`,
      htmlFacts(facts),
      ...(extras.pictureSvg ? [pictureHtml(f, extras.pictureSvg, v)] : []),
      ...(hint ? [`<p>${esc(HINT_CAUTION)}</p>`] : []),
      ...(extras.alertLink
        ? [htmlLink(extras.alertLink, 'Open the alert (sign-in required)')]
        : []),
      htmlLink(link, 'Open the point view'),
      SAFETY_HTML,
    ].join(''),
    footer,
  );
  return { subject, text, html };
}

/**
 * The picture as an inline image whose alt text names the values (for clients that block SVG),
 * written by `v` in the recipient's unit system.
 */
function pictureHtml(f: AlertMailFacts, svg: string, v: (value: number) => string): string {
  const alt = `Trend of ${f.bandName}: latest ${v(f.value)} against the ${f.level} level ${v(f.limit)}`;
  return `<p style="margin:12px 0"><img src="${svgDataUrl(svg)}" width="${PICTURE_WIDTH}" height="${PICTURE_HEIGHT}" alt="${esc(alt)}" style="display:block;max-width:100%;height:auto;border:1px solid #d9d2c3"></p>`;
}

/** The first hint of a stored diagnosis (JSON text or parsed), or null. */
function topHintOf(stored: unknown): DiagnosisHintItem | null {
  if (stored === null || stored === undefined) return null;
  const d = (typeof stored === 'string' ? JSON.parse(stored) : stored) as Diagnosis;
  return d.hints?.[0] ?? null;
}

async function loadFacts(tx: Tx, alertId: number, kind: AlertChangeKind) {
  const a = await alertForMail(tx, alertId);
  if (!a) return null;
  const ev = await lastAlertEvent(tx, alertId, kind);
  if (!ev) return null;
  const at = new Date(ev.at as Date);
  const an = await analysisAtOrBefore(tx, Number(a.point_id), at);
  const facts: AlertMailFacts = {
    alertId,
    kind,
    level: ev.level as 'alert' | 'danger',
    siteCode: String(a.site_code),
    siteName: String(a.site_name),
    areaName: String(a.area_name),
    machineId: Number(a.machine_id),
    machineName: String(a.machine_name),
    pointId: Number(a.point_id),
    pointTag: String(a.tag),
    pointName: String(a.point_name),
    bandName: String(a.band_name),
    unit: String(a.unit),
    value: Number(ev.value ?? a.last_value),
    limit: Number(a.limit_value),
    peak: Number(a.peak_value),
    at,
    verdict: String(an?.quality_verdict ?? (a.suspect ? 'suspect' : 'ok')),
    suspect: Boolean(a.suspect),
    topHint: topHintOf(an?.diagnosis),
  };
  return { facts, eventId: Number(ev.id), siteId: Number(a.site_id), bandKey: String(a.band_key) };
}

/** Users whose subscriptions match: scope (site or machine), level, and site access. */
async function recipients(tx: Tx, siteId: number, machineId: number, level: string) {
  const found = await subscribersOf(tx, siteId, machineId, level);
  const byUser = new Map<number, { email: string; immediate: boolean; system: UnitSystem }>();
  for (const r of found) {
    const id = Number(r.id);
    const prev = byUser.get(id);
    const immediate = r.cadence === 'immediate' || (prev?.immediate ?? false);
    const system = unitSystemSchema.catch('metric').parse(r.unit_system);
    byUser.set(id, { email: String(r.email), immediate, system });
  }
  return byUser;
}

/** Values of the band the mail's picture shows, up to the capture that changed the alert. */
export const PICTURE_VALUES = 60;

/** The band's recent trend with its levels in force, stored metric. */
async function bandPictureInput(
  tx: Tx,
  f: AlertMailFacts,
  bandKey: string,
): Promise<BandPictureInput> {
  const [values, rule] = await Promise.all([
    recentBandValues(tx, f.pointId, bandKey, PICTURE_VALUES, f.at),
    bandRuleOf(tx, f.pointId, bandKey),
  ]);
  return {
    bandName: f.bandName,
    unit: f.unit,
    values,
    // Without the band in the limit set any more, the level the alert exceeded alone.
    alertLevel: rule ? rule.clearRule.alertLevel : f.level === 'alert' ? f.limit : null,
    dangerLevel: rule ? rule.clearRule.dangerLevel : f.level === 'danger' ? f.limit : null,
  };
}

/** The picture's values and levels in a unit system (its unit named as people write it). */
function bandPictureIn(p: BandPictureInput, unit: string, system: UnitSystem): BandPictureInput {
  const v = (x: number) => toDisplay(x, unit, system);
  return {
    ...p,
    unit: displayUnitText(unit, system),
    values: p.values.map((x) => ({ at: x.at, value: v(x.value) })),
    alertLevel: p.alertLevel === null ? null : v(p.alertLevel),
    dangerLevel: p.dangerLevel === null ? null : v(p.dangerLevel),
  };
}

/** The top of the next hour: when "hourly" subscribers get their messages. */
export function nextHour(now = new Date()): Date {
  const d = new Date(now);
  d.setUTCMinutes(0, 0, 0);
  d.setUTCHours(d.getUTCHours() + 1);
  return d;
}

export async function queueAlertChangeMail(
  ctx: AppContext,
  tx: Tx,
  change: { alertId: number; kind: AlertChangeKind },
): Promise<number> {
  const loaded = await loadFacts(tx, change.alertId, change.kind);
  if (!loaded) return 0;
  const { facts, eventId, siteId, bandKey } = loaded;
  const who = await recipients(tx, siteId, facts.machineId, facts.level);
  if (who.size === 0) return 0;
  const base = await mailBaseUrl(ctx, tx);
  const link = pointLink(base, facts.pointId);
  const alertLink = alertMailLink(base, ctx.jwtSecret, facts.alertId);
  const picture = await bandPictureInput(tx, facts, bandKey);
  // Each recipient reads the values, the picture's too, in their own unit system.
  const bySystem = new Map<UnitSystem, Rendered>();
  for (const [userId, u] of who) {
    let msg = bySystem.get(u.system);
    if (!msg) {
      const pictureSvg = renderBandPicture(bandPictureIn(picture, facts.unit, u.system));
      msg = renderAlertMail(facts, link, { alertLink, pictureSvg, unitSystem: u.system });
      bySystem.set(u.system, msg);
    }
    await enqueueMail(tx, {
      // Hourly subscribers' rows wait for the hour and go out folded into one summary.
      kind: u.immediate ? `alert-${change.kind}` : HOURLY_KIND,
      dedupeKey: `alert:${eventId}:${userId}`,
      to: u.email,
      ...msg,
      ...(u.immediate ? {} : { notBefore: nextHour() }),
    });
  }
  return who.size;
}

/** One message for an hour of alert changes: each change's facts, one link each, one caution. */
export function renderHourlySummary(rows: { subject: string; textBody: string }[]): Rendered {
  const body = (t: string) =>
    t
      .split('\n')
      .filter((l) => !l.startsWith('Safety:') && !l.startsWith('You receive this'))
      .join('\n')
      .trim();
  const title = `${rows.length} alert change${rows.length === 1 ? '' : 's'} in the last hour`;
  const footer =
    'You receive this hourly summary because of your notification settings (Account in Turnstone).';
  const text = [
    `${title}.`,
    '',
    ...rows.flatMap((r, i) => [
      `${i + 1}. ${r.subject.replace(/^\[Turnstone\] /, '')}`,
      body(r.textBody),
      '',
    ]),
    ...closingText(footer),
  ].join('\n');
  const html = htmlLayout(
    title,
    rows
      .map(
        (r, i) =>
          `<h2 style="font-size:14px;margin:16px 0 4px">${i + 1}. ${esc(r.subject.replace(/^\[Turnstone\] /, ''))}</h2>` +
          `<pre style="white-space:pre-wrap;font-family:'Roboto Mono',monospace;font-size:12px;margin:0">${esc(body(r.textBody))}</pre>`,
      )
      .join('') + SAFETY_HTML,
    footer,
  );
  return { subject: `[Turnstone] ${title}`, text, html };
}
