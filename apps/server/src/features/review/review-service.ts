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
  ReviewQualityNotice,
  WeeklyReview,
} from '@turnstone/contracts/review';
import { addDays, localDate } from '@turnstone/contracts/dates';
import type { AppContext } from '../../lib/context.ts';
import type { SessionUser } from '../../lib/session-user.ts';
import * as findingsRepo from '../findings/findings-repository.ts';
import { siteScope, toFinding } from '../findings/findings-service.ts';
import * as repo from './review-repository.ts';
import { MOVER_FLOOR_FRACTION, weeklyMovers, type NoiseThreshold } from './review-movers.ts';
import { siteWeek, type SiteWeek } from './review-weeks.ts';

export { MOVER_FLOOR_FRACTION };

const DAY_MS = 86_400_000;
/** How far back the forecast looks: six weeks of daily means. Common practice, no source. */
export const FORECAST_LOOKBACK_DAYS = 42;
/** Rows kept per table; the summary counts every row. */
export const MAX_ROWS = 100;

/** The noise threshold unless the request names one (the query schema's defaults). */
export const DEFAULT_NOISE: NoiseThreshold = { minChangePercent: 5, minValues: 3 };

export interface WeeklyReviewOptions {
  /** Last day of the reviewed week (each site's local day), `YYYY-MM-DD`; default today. */
  weekEnding?: string | undefined;
  /** Forecast horizon in weeks. @default 4 */
  weeksAhead?: number | undefined;
  /** One site; default every site the user may see (403 when the user may not see it). */
  siteId?: number | undefined;
  /** The time of the review (epoch ms), for ages and "overdue". @default Date.now() */
  now?: number;
  minChangePercent?: number | undefined;
  minValues?: number | undefined;
}

const isoDay = (ms: number) => new Date(ms).toISOString().slice(0, 10);
const iso = (ms: number) => new Date(ms).toISOString();

const bandId = (pointId: number, key: string) => `${pointId}|${key}`;

interface BandTrackLike {
  band?: { baseline?: BaselineAccumulator; baselineComplete?: boolean };
}

/**
 * The review for `user`: movers (this week's mean vs last week's, per point and band, above
 * the noise threshold, grouped by machine — `weeklyMovers`), forecasts
 * (`projectTrend` through the last six weeks of daily means against the levels in force,
 * crossings within `weeksAhead` weeks), open alerts by age, this week's unreviewed quality
 * notices, the findings due by the end of the coming week and those created this week.
 * Weeks and days are each site's own (its time zone, `review-weeks.ts`).
 */
export async function buildWeeklyReview(
  ctx: AppContext,
  user: SessionUser,
  options: WeeklyReviewOptions = {},
): Promise<WeeklyReview> {
  const now = options.now ?? Date.now();
  const weeksAhead = options.weeksAhead ?? 4;
  const noise: NoiseThreshold = {
    minChangePercent: options.minChangePercent ?? DEFAULT_NOISE.minChangePercent,
    minValues: options.minValues ?? DEFAULT_NOISE.minValues,
  };
  const siteIds = siteScope(user, options.siteId);
  const db = ctx.db;
  const siteRows = await repo.sitesIn(db, siteIds);
  const zones = [...new Set(siteRows.map((s) => s.timeZone))];
  // "Today" in the sites' zone when they share one; UTC across zones.
  const weekEnding = options.weekEnding ?? localDate(now, zones.length === 1 ? zones[0]! : 'UTC');
  const weeks = siteRows.map((s) => siteWeek(s, weekEnding, FORECAST_LOOKBACK_DAYS));
  const weekOfSite = new Map<number, SiteWeek>(weeks.map((w) => [w.siteId, w]));
  const span = (pick: (w: SiteWeek) => number, f: typeof Math.min) =>
    weeks.length ? f(...weeks.map(pick)) : now;
  const thisFrom = span((w) => w.thisFrom, Math.min);
  const thisTo = span((w) => w.thisTo, Math.max);
  const lastFrom = span((w) => w.lastFrom, Math.min);
  const inThisWeek = (siteId: number, at: Date) => {
    const w = weekOfSite.get(siteId);
    return !!w && at.getTime() >= w.thisFrom && at.getTime() < w.thisTo;
  };

  const [refs, daily, bandRows, states, alertRows, noticeRows, dueRows, createdRows] =
    await Promise.all([
      repo.pointRefs(db, siteIds),
      repo.dailyMeans(db, weeks),
      repo.pointBands(db, siteIds),
      repo.conditionStates(db, siteIds),
      repo.openAlerts(db, siteIds),
      repo.unreviewedNotices(db, siteIds, new Date(thisFrom), new Date(thisTo)),
      findingsRepo.listFindings(db, { siteIds, dueBy: addDays(weekEnding, 7) }),
      findingsRepo.listFindings(db, {
        siteIds,
        createdWithin: { from: new Date(thisFrom), to: new Date(thisTo) },
      }),
    ]);

  /** A point's names as a row shows them (without the machine's criticality). */
  const pointRef = (pointId: number) => {
    const r = refs.get(pointId);
    if (!r) return undefined;
    const { criticality: _c, ...ref } = r;
    return ref;
  };

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

  // ---- movers, above the noise threshold, by machine
  const { movers, groups, belowThreshold } = weeklyMovers(
    daily,
    refs,
    weekOfSite,
    (pointId, bandKey) => {
      const band = bandsById.get(bandId(pointId, bandKey));
      if (!band) return undefined;
      const alertLevel = levelsOf(pointId, bandKey, band.definition).alertLevel;
      return { name: band.name, unit: band.unit, alertLevel };
    },
    noise,
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
    const ref = pointRef(pointId);
    const end = ref && weekOfSite.get(ref.siteId)?.thisTo;
    if (!band || !ref || !end) continue;
    const levels = levelsOf(pointId, bandKey, band.definition);
    const p = projectTrend(trend, levels, { horizonDays: weeksAhead * 7, now: end });
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
      daysToCrossing: Math.max(0, Math.round((p.crossingAt - end) / DAY_MS)),
      model: p.fit.model,
      r2: p.fit.r2,
      points: p.points,
    });
  }
  forecasts.sort((a, b) => a.crossingAt.localeCompare(b.crossingAt));

  // ---- open alerts
  const openAlerts: ReviewAlert[] = [];
  for (const { alert: a } of alertRows) {
    const ref = pointRef(a.pointId);
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
    const ref = pointRef(n.pointId);
    if (!ref || !inThisWeek(ref.siteId, n.takenAt)) continue;
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

  // ---- findings due, and created this week
  const today = isoDay(now);
  const findingsCreated = createdRows
    .filter((r) => inThisWeek(r.siteId, r.finding.createdAt))
    .map(toFinding);
  const findingsDue: ReviewFindingDue[] = dueRows.map((r) => {
    const f = toFinding(r);
    return { ...f, overdue: f.dueDate !== null && f.dueDate < today };
  });

  return {
    period: {
      weekEnding,
      thisWeek: { from: iso(thisFrom), to: iso(thisTo) },
      lastWeek: { from: iso(lastFrom), to: iso(span((w) => w.thisFrom, Math.max)) },
      weeksAhead,
      timeZone: zones.length === 1 ? zones[0]! : zones.length ? 'per site' : 'UTC',
      generatedAt: iso(now),
    },
    siteWeeks: weeks.map((w) => ({
      siteId: w.siteId,
      siteCode: w.siteCode,
      timeZone: w.timeZone,
      thisWeek: { from: iso(w.thisFrom), to: iso(w.thisTo) },
      lastWeek: { from: iso(w.lastFrom), to: iso(w.thisFrom) },
    })),
    noise,
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
      findingsCreated: findingsCreated.length,
      moversBelowThreshold: belowThreshold,
    },
    machineGroups: groups,
    movers: movers.slice(0, MAX_ROWS),
    forecasts: forecasts.slice(0, MAX_ROWS),
    openAlerts: openAlerts.slice(0, MAX_ROWS),
    qualityNotices: qualityNotices.slice(0, MAX_ROWS),
    findingsDue: findingsDue.slice(0, MAX_ROWS),
    findingsCreated: findingsCreated.slice(0, MAX_ROWS),
  };
}
