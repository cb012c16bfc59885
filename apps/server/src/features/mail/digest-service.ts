/**
 * The planner's weekly digest: the Review screen's summary (`buildWeeklyReview`, the same
 * service the screen reads) as an e-mail — counts, largest increases, forecasts, open
 * alerts by age, quality notices and findings due, each row with a link to its point.
 */
import type { WeeklyReview } from '@turnstone/contracts/review';
import { formatDateTimeZone } from '@turnstone/contracts/dates';
import { formatQuantity } from '@turnstone/contracts/number-format';
import { toDisplay, type UnitSystem } from '@turnstone/contracts/units';
import type { AppContext } from '../../lib/context.ts';
import { buildWeeklyReview } from '../review/review-service.ts';
import { findUserById } from '../auth/auth-repository.ts';
import { sessionUserOf } from '../auth/auth-service.ts';
import { esc, htmlLayout, num, SAFETY_CAUTION, type Rendered } from './mail-templates.ts';
import { mailBaseUrl, pointLink } from './mail-links.ts';
import { enqueueMail } from './outbox-repository.ts';
import { digestRecipientIds } from './mail-repository.ts';

const TOP = 10;

interface Line {
  text: string;
  pointId: number;
}

function sections(
  r: WeeklyReview,
  system: UnitSystem,
): { title: string; lines: Line[]; total: number }[] {
  const zones = new Map(r.siteWeeks.map((w) => [w.siteId, w.timeZone]));
  const zoneOf = (siteId: number) => zones.get(siteId) ?? 'UTC';
  const at = (x: { machineName: string; pointTag: string }) => `${x.machineName} ${x.pointTag}`;
  const v = (value: number, unit: string) => formatQuantity(value, unit, system);
  const bare = (value: number, unit: string) => num(toDisplay(value, unit, system));
  return [
    {
      title: 'Largest increases this week',
      total: r.summary.movers,
      lines: r.movers.slice(0, TOP).map((m) => ({
        pointId: m.pointId,
        text: `${at(m)} · ${m.bandName} ${bare(m.lastWeekMean, m.unit)} → ${v(m.thisWeekMean, m.unit)}${m.changePercent === null ? '' : ` (+${num(m.changePercent)} %)`}`,
      })),
    },
    {
      title: `Projected to reach a level within ${r.period.weeksAhead} weeks`,
      total: r.summary.forecasts,
      lines: r.forecasts.slice(0, TOP).map((f) => ({
        pointId: f.pointId,
        text: `${at(f)} · ${f.bandName} ${v(f.latestValue, f.unit)} → ${f.target.level} ${v(f.target.value, f.unit)} in about ${Math.round(f.daysToCrossing)} days`,
      })),
    },
    {
      title: `Open alerts (${r.summary.openDanger} danger, ${r.summary.unacknowledged} not acknowledged)`,
      total: r.summary.openAlerts,
      lines: r.openAlerts.slice(0, TOP).map((a) => ({
        pointId: a.pointId,
        text: `${a.level.toUpperCase()} ${a.state} · ${at(a)} · ${a.bandName} ${v(a.lastValue, a.unit)} vs ${v(a.limitValue, a.unit)} · open ${a.ageDays} d`,
      })),
    },
    {
      title: 'Quality notices this week',
      total: r.summary.qualityNotices,
      lines: r.qualityNotices.slice(0, TOP).map((q) => ({
        pointId: q.pointId,
        text: `${q.verdict} · ${at(q)} · ${formatDateTimeZone(q.takenAt, zoneOf(q.siteId))}`,
      })),
    },
  ];
}

/** The digest, its values in the planner's unit system. */
export function renderDigest(
  r: WeeklyReview,
  base: string,
  system: UnitSystem = 'metric',
): Rendered {
  const day = r.period.weekEnding;
  const s = r.summary;
  const subject = `[Turnstone] Weekly digest, week ending ${day}: ${s.openAlerts} open alerts, ${s.forecasts} forecasts, ${s.qualityNotices} quality notices`;
  const sites = r.sites.map((x) => x.code).join(', ');
  const counts = `Sites ${sites}. Increases: ${s.movers} · forecasts: ${s.forecasts} · open alerts: ${s.openAlerts} · quality notices: ${s.qualityNotices} · findings due: ${s.findingsDue} (${s.findingsOverdue} overdue).`;
  const secs = sections(r, system);
  const more = (n: number, shown: number) => (n > shown ? ` (${n - shown} more in Turnstone)` : '');
  const reviewLink = `${base}/review?weekEnding=${day}`;
  const text = [
    `Weekly digest, week ending ${day}.`,
    counts,
    '',
    ...secs.flatMap((sec) => [
      `${sec.title}: ${sec.total}${more(sec.total, sec.lines.length)}`,
      ...(sec.lines.length
        ? sec.lines.map((l) => `- ${l.text}\n  ${pointLink(base, l.pointId)}`)
        : ['- none']),
      '',
    ]),
    `The whole review: ${reviewLink}`,
    '',
    `Safety: ${SAFETY_CAUTION}`,
    '',
  ].join('\n');
  const html = htmlLayout(
    `Weekly digest — week ending ${day}`,
    [
      `<p>${esc(counts)}</p>`,
      ...secs.map(
        (sec) =>
          `<h2 style="font-size:15px;margin:16px 0 4px">${esc(sec.title)}: ${esc(sec.total)}${esc(more(sec.total, sec.lines.length))}</h2>` +
          (sec.lines.length
            ? `<ul style="padding-left:18px;margin:0">${sec.lines
                .map(
                  (l) =>
                    `<li style="margin:3px 0">${esc(l.text)} — <a href="${esc(pointLink(base, l.pointId))}" style="color:#1d5c63">point view</a></li>`,
                )
                .join('')}</ul>`
            : '<p style="margin:0">None.</p>'),
      ),
      `<p><a href="${esc(reviewLink)}" style="color:#1d5c63">Open the whole review</a></p>`,
      `<p><strong>Safety:</strong> ${esc(SAFETY_CAUTION)}</p>`,
    ].join(''),
    'You receive this because the weekly digest is on in your notification settings.',
  );
  return { subject, text, html };
}

/** The week a digest sent at `now` covers: the seven UTC days ending yesterday. */
export const digestWeekEnding = (now: Date) =>
  new Date(now.getTime() - 86_400_000).toISOString().slice(0, 10);

/** Queues the digest for every planner who asked for it; one per user and week. */
export async function queueWeeklyDigests(
  ctx: AppContext,
  options: { now?: Date; weekEnding?: string } = {},
): Promise<number> {
  const now = options.now ?? new Date();
  const weekEnding = options.weekEnding ?? digestWeekEnding(now);
  const ids = await digestRecipientIds(ctx.db);
  const base = await mailBaseUrl(ctx);
  let queued = 0;
  for (const id of ids) {
    const row = await findUserById(ctx.db, id);
    if (!row) continue;
    const user = await sessionUserOf(ctx.db, row);
    const review = await buildWeeklyReview(ctx, user, {
      weekEnding,
      weeksAhead: 4,
      now: now.getTime(),
    });
    await enqueueMail(ctx.db, {
      kind: 'digest',
      dedupeKey: `digest:${weekEnding}:${user.id}`,
      to: user.email,
      ...renderDigest(review, base, user.unitSystem),
    });
    queued++;
  }
  return queued;
}
