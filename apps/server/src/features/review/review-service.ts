/**
 * The planner's weekly review (issue 6 screen 6), built once here for the Review screen, its
 * CSV export and the weekly digest mail (`buildWeeklyReview` takes no request).
 */
import {
  levelsInForce,
  projectTrend,
  type BandDefinition as LimitBand,
  type BaselineAccumulator,
  type TrendPoint,
} from '@turnstone/condition';
import type {
  ReviewAlert,
  ReviewFindingDue,
  ReviewForecast,
  ReviewMover,
  ReviewQualityNotice,
  WeeklyReview,
} from '@turnstone/contracts/review';
import type { AppContext } from '../../lib/context.ts';
import type { SessionUser } from '../../lib/session-user.ts';
import * as findingsRepo from '../findings/findings-repository.ts';
import { siteScope, toFinding } from '../findings/findings-service.ts';
import * as repo from './review-repository.ts';

const DAY_MS = 86_400_000;
/** How far back the forecast looks: six weeks of daily means. Common practice, no source. */
export const FORECAST_LOOKBACK_DAYS = 42;
/**
 * A rise is listed only when this week's mean is at least this fraction of the band's alert
 * level in force: below it the band reads its noise floor, where a large percentage means
 * nothing. Common practice, no source.
 */
export const MOVER_FLOOR_FRACTION = 0.1;
/** Rows kept per table; the summary counts every row. */
export const MAX_ROWS = 100;

export interface WeeklyReviewOptions {
  /** Last day of the reviewed week (UTC), `YYYY-MM-DD`; default today. */
  weekEnding?: string | undefined;
  /** Forecast horizon in weeks. @default 4 */
  weeksAhead?: number | undefined;
  /** One site; default every site the user may see (403 when the user may not see it). */
  siteId?: number | undefined;
  /** The time of the review (epoch ms), for ages and "overdue". @default Date.now() */
  now?: number;
}

const isoDay = (ms: number) => new Date(ms).toISOString().slice(0, 10);

/** Start of the UTC day after `date` (YYYY-MM-DD), epoch ms: the week's exclusive end. */
export function weekEnd(date: string): number {
  const [y, m, d] = date.split('-').map(Number);
  return Date.UTC(y!, m! - 1, d! + 1);
}

const bandId = (pointId: number, key: string) => `${pointId}|${key}`;

interface BandTrackLike {
  band?: { baseline?: BaselineAccumulator; baselineComplete?: boolean };
}

/**
 * The review for `user`: movers (this week's mean vs last week's, per point and band, only
 * where both weeks have usable values, largest percentage rise first), forecasts
 * (`projectTrend` through the last six weeks of daily means against the levels in force,
 * crossings within `weeksAhead` weeks), open alerts by age, this week's unreviewed quality
 * notices, and the findings due by the end of the coming week.
 */
export async function buildWeeklyReview(
  ctx: AppContext,
  user: SessionUser,
  options: WeeklyReviewOptions = {},
): Promise<WeeklyReview> {
  const now = options.now ?? Date.now();
  const weekEnding = options.weekEnding ?? isoDay(now);
  const weeksAhead = options.weeksAhead ?? 4;
  const siteIds = siteScope(user, options.siteId);
  const thisTo = weekEnd(weekEnding);
  const thisFrom = thisTo - 7 * DAY_MS;
  const lastFrom = thisTo - 14 * DAY_MS;
  const db = ctx.db;

  const [siteRows, refs, daily, bandRows, states, alertRows, noticeRows, dueRows] =
    await Promise.all([
      repo.sitesIn(db, siteIds),
      repo.pointRefs(db, siteIds),
      repo.dailyMeans(
        db,
        siteIds,
        new Date(thisTo - FORECAST_LOOKBACK_DAYS * DAY_MS),
        new Date(thisTo),
      ),
      repo.pointBands(db, siteIds),
      repo.conditionStates(db, siteIds),
      repo.openAlerts(db, siteIds),
      repo.unreviewedNotices(db, siteIds, new Date(thisFrom), new Date(thisTo)),
      findingsRepo.listFindings(db, { siteIds, dueBy: isoDay(thisTo + 6 * DAY_MS) }),
    ]);

  const bandsById = new Map<string, { name: string; unit: string; definition: LimitBand }>();
  for (const b of bandRows) {
    if (b.pointId === null) continue;
    bandsById.set(bandId(b.pointId, b.key), {
      name: b.name,
      unit: b.unit,
      definition: b.definition as unknown as LimitBand,
    });
  }

  /** The levels in force for a point's band (the worker's own decision, `levelsInForce`). */
  const levelsOf = (pointId: number, bandKey: string, definition: LimitBand) => {
    const track = (states.get(pointId)?.[bandKey] ?? null) as BandTrackLike | null;
    const band = track?.band;
    return levelsInForce(
      definition,
      band?.baseline && band.baselineComplete
        ? { baseline: band.baseline, baselineComplete: true }
        : null,
    );
  };

  // ---- weekly means, from the daily means
  const weekly = new Map<
    string,
    {
      pointId: number;
      bandKey: string;
      thisSum: number;
      thisCount: number;
      lastSum: number;
      lastCount: number;
    }
  >();
  for (const d of daily) {
    if (d.t < lastFrom) continue;
    const id = bandId(d.pointId, d.bandKey);
    let w = weekly.get(id);
    if (!w)
      weekly.set(
        id,
        (w = {
          pointId: d.pointId,
          bandKey: d.bandKey,
          thisSum: 0,
          thisCount: 0,
          lastSum: 0,
          lastCount: 0,
        }),
      );
    if (d.t >= thisFrom) {
      w.thisSum += d.v * d.n;
      w.thisCount += d.n;
    } else {
      w.lastSum += d.v * d.n;
      w.lastCount += d.n;
    }
  }
  const means = [...weekly.values()].map((w) => ({
    ...w,
    thisMean: w.thisCount > 0 ? w.thisSum / w.thisCount : null,
    lastMean: w.lastCount > 0 ? w.lastSum / w.lastCount : null,
  }));

  // ---- movers
  const movers: ReviewMover[] = [];
  for (const m of means) {
    const ref = refs.get(m.pointId);
    if (!ref || m.thisMean === null || m.lastMean === null) continue;
    if (m.thisCount === 0 || m.lastCount === 0) continue;
    const change = m.thisMean - m.lastMean;
    if (!(change > 0)) continue;
    const band = bandsById.get(bandId(m.pointId, m.bandKey));
    if (
      band &&
      m.thisMean < MOVER_FLOOR_FRACTION * levelsOf(m.pointId, m.bandKey, band.definition).alertLevel
    )
      continue;
    movers.push({
      ...ref,
      bandKey: m.bandKey,
      bandName: band?.name ?? m.bandKey,
      unit: band?.unit ?? '',
      lastWeekMean: m.lastMean,
      thisWeekMean: m.thisMean,
      lastWeekCount: m.lastCount,
      thisWeekCount: m.thisCount,
      change,
      changePercent: m.lastMean > 0 ? (100 * change) / m.lastMean : null,
    });
  }
  movers.sort(
    (a, b) =>
      (b.changePercent ?? Number.POSITIVE_INFINITY) -
        (a.changePercent ?? Number.POSITIVE_INFINITY) || b.change - a.change,
  );

  // ---- forecasts
  const series = new Map<string, TrendPoint[]>();
  for (const d of daily) {
    const id = bandId(d.pointId, d.bandKey);
    let list = series.get(id);
    if (!list) series.set(id, (list = []));
    list.push({ takenAt: d.t, value: d.v });
  }
  const forecasts: ReviewForecast[] = [];
  for (const [id, trend] of series) {
    const band = bandsById.get(id);
    const [pointIdText, bandKey] = id.split('|') as [string, string];
    const pointId = Number(pointIdText);
    const ref = refs.get(pointId);
    if (!band || !ref) continue;
    const levels = levelsOf(pointId, bandKey, band.definition);
    const p = projectTrend(trend, levels, { horizonDays: weeksAhead * 7, now: thisTo });
    if (p.outcome !== 'projected' || p.crossingAt === null || !p.fit || !p.target) continue;
    const latest = trend.reduce((a, b) => (b.takenAt > a.takenAt ? b : a));
    forecasts.push({
      ...ref,
      bandKey,
      bandName: band.name,
      unit: band.unit,
      latestValue: latest.value,
      latestAt: new Date(latest.takenAt).toISOString(),
      target: p.target,
      levelSource: levels.source,
      crossingAt: new Date(p.crossingAt).toISOString(),
      daysToCrossing: Math.max(0, Math.round((p.crossingAt - thisTo) / DAY_MS)),
      model: p.fit.model,
      r2: p.fit.r2,
      points: p.points,
    });
  }
  forecasts.sort((a, b) => a.crossingAt.localeCompare(b.crossingAt));

  // ---- open alerts
  const openAlerts: ReviewAlert[] = [];
  for (const { alert: a } of alertRows) {
    const ref = refs.get(a.pointId);
    if (!ref || (a.state !== 'raised' && a.state !== 'acknowledged')) continue;
    openAlerts.push({
      ...ref,
      alertId: a.id,
      bandKey: a.bandKey,
      bandName: a.bandName,
      unit: a.unit,
      level: a.level,
      state: a.state,
      limitValue: a.limitValue,
      lastValue: a.lastValue,
      peakValue: a.peakValue,
      firstAt: a.firstAt.toISOString(),
      lastAt: a.lastAt.toISOString(),
      ageDays: Math.max(0, Math.floor((now - a.firstAt.getTime()) / DAY_MS)),
      suspect: a.suspect,
    });
  }

  // ---- quality notices
  const qualityNotices: ReviewQualityNotice[] = [];
  for (const { notice: n } of noticeRows) {
    const ref = refs.get(n.pointId);
    if (!ref) continue;
    qualityNotices.push({
      ...ref,
      noticeId: n.id,
      snapshotId: n.snapshotId,
      verdict: n.verdict,
      takenAt: n.takenAt.toISOString(),
      findings: (Array.isArray(n.findings) ? n.findings : []).map((f) => {
        const o = (f ?? {}) as Record<string, unknown>;
        return {
          code: String(o.code ?? 'unknown'),
          severity: String(o.severity ?? ''),
          message: String(o.message ?? ''),
          value: typeof o.value === 'number' && Number.isFinite(o.value) ? o.value : null,
        };
      }),
    });
  }

  // ---- findings due
  const today = isoDay(now);
  const findingsDue: ReviewFindingDue[] = dueRows.map((r) => {
    const f = toFinding(r);
    return { ...f, overdue: f.dueDate !== null && f.dueDate < today };
  });

  return {
    period: {
      weekEnding,
      thisWeek: { from: new Date(thisFrom).toISOString(), to: new Date(thisTo).toISOString() },
      lastWeek: { from: new Date(lastFrom).toISOString(), to: new Date(thisFrom).toISOString() },
      weeksAhead,
      timeZone: 'UTC',
      generatedAt: new Date(now).toISOString(),
    },
    sites: siteRows,
    summary: {
      movers: movers.length,
      forecasts: forecasts.length,
      openAlerts: openAlerts.length,
      openDanger: openAlerts.filter((a) => a.level === 'danger').length,
      unacknowledged: openAlerts.filter((a) => a.state === 'raised').length,
      qualityNotices: qualityNotices.length,
      findingsDue: findingsDue.length,
      findingsOverdue: findingsDue.filter((f) => f.overdue).length,
    },
    movers: movers.slice(0, MAX_ROWS),
    forecasts: forecasts.slice(0, MAX_ROWS),
    openAlerts: openAlerts.slice(0, MAX_ROWS),
    qualityNotices: qualityNotices.slice(0, MAX_ROWS),
    findingsDue: findingsDue.slice(0, MAX_ROWS),
  };
}
