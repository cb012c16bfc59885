/**
 * A band's trend for a point: values thinned for a chart (alert transitions kept), the levels
 * in force with the baseline, the projection to the next level, events and findings; and the
 * trend as CSV.
 */

import { displayUnit, toDisplay } from '@turnstone/contracts/units';
import { levelsInForce, projectTrend } from '@turnstone/condition';

import { DEFAULT_TREND_DAYS, type TrendResponse } from '@turnstone/contracts/trend';

import { AppError } from '../../lib/app-error.ts';
import type { AppContext } from '../../lib/context.ts';
import { accessiblePoint } from '../places/point-access.ts';
import { type SessionUser } from '../../lib/session-user.ts';
import { loadLimitSet } from '../limits/limit-set-repository.ts';
import { limitChangesIn } from '../limits/limits-repository.ts';

import * as repo from './points-repository.ts';
import * as eventsRepo from './trend-events-repository.ts';
import { bandLimitChanges } from './trend-events.ts';
import { rawValues } from './trend-hours-repository.ts';
import { trendValues } from './trend-values.ts';

const DAY_MS = 86_400_000;
/** Overall velocity band key that the machine page's small trends follow. */

const iso = (d: Date) => d.toISOString();

async function trendBand(ctx: AppContext, pointId: number, bandKey: string) {
  const set = await loadLimitSet(ctx.db, pointId);
  const band = set?.bands.find((b) => b.key === bandKey);
  if (!band)
    throw new AppError('unknown_band', `This point has no band "${bandKey}".`, 404, [
      { path: 'band', message: `no band "${bandKey}" on this point` },
    ]);
  return band;
}

function period(q: { from?: string; to?: string }, now: number) {
  const to = q.to ? new Date(q.to) : new Date(now);
  const from = q.from ? new Date(q.from) : new Date(to.getTime() - DEFAULT_TREND_DAYS * DAY_MS);
  if (!(from.getTime() < to.getTime()))
    throw new AppError('validation_failed', '"from" must be before "to".', 400, [
      { path: 'from', message: 'must be before "to"' },
    ]);
  return { from, to };
}

export async function trend(
  ctx: AppContext,
  user: SessionUser,
  pointId: number,
  q: { band: string; from?: string; to?: string },
  now = Date.now(),
): Promise<TrendResponse> {
  const { from, to } = period(q, now);
  const eventsP = repo.alertEventsOf(ctx.db, pointId, q.band, from, to);
  const uploadsP = eventsRepo.uploadsOf(ctx.db, pointId, q.band, from, to);
  // the values behind alert transitions and the uploaded captures stay in a thinned trend
  const marksP = Promise.all([eventsP, uploadsP]).then(([events, uploads]) =>
    [...events, ...uploads].map((e) => e.at),
  );
  // All reads at once (the trend budget is 200 ms at p95); nothing is answered before the
  // access check has passed, and its error wins over any other.
  const [
    access,
    bandResult,
    valuesResult,
    eventsResult,
    findingsResult,
    stateResult,
    limitsResult,
    uploadsResult,
  ] = await Promise.allSettled([
    accessiblePoint(ctx.db, user, pointId),
    trendBand(ctx, pointId, q.band),
    trendValues(ctx.db, pointId, q.band, from, to, marksP),
    eventsP,
    repo.findingsOf(ctx.db, pointId, q.band, from, to),
    repo.bandStatesOf(ctx.db, pointId),
    limitChangesIn(ctx.db, pointId, from, to, eventsRepo.TREND_EVENT_CAP),
    uploadsP,
  ]);
  const settled = <T>(r: PromiseSettledResult<T>): T => {
    if (r.status === 'rejected') throw r.reason;
    return r.value;
  };
  settled(access);
  const band = settled(bandResult);
  const values = settled(valuesResult);
  const events = settled(eventsResult);
  const findingRows = settled(findingsResult);
  const uploads = settled(uploadsResult);
  // the levels the worker alerts at (statistical once the baseline is complete), drawn and
  // projected to by the trend page
  const levels = levelsInForce(band, settled(stateResult).get(band.key));
  const items = values.items.map((r) => ({
    t: new Date(r.t).toISOString(),
    v: r.value,
    q: r.quality,
    analysisId: r.analysisId,
  }));
  const recent = values.recent.map((r) => ({ takenAt: r.t, value: r.value, quality: r.quality }));
  const p = projectTrend(recent, levels, { now: Math.min(now, to.getTime()) });
  return {
    pointId,
    band: { key: band.key, name: band.name, unit: band.unit, spectrum: band.spectrum },
    levels: { alert: levels.alertLevel, danger: levels.dangerLevel, source: levels.source },
    baseline: levels.baseline
      ? { mean: levels.baseline.mean, sigma: levels.baseline.sigma, count: levels.baseline.count }
      : null,
    items,
    decimation: values.decimation,
    projection: {
      outcome: p.outcome,
      model: p.fit?.model ?? null,
      r2: p.fit?.r2 ?? null,
      target: p.target ? { level: p.target.level, value: p.target.value } : null,
      crossingAt: p.crossingAt === null ? null : new Date(p.crossingAt).toISOString(),
      overdue: p.overdue,
      window: p.window && {
        from: new Date(p.window.fromAt).toISOString(),
        to: new Date(p.window.toAt).toISOString(),
        points: p.window.points,
        changed: p.window.changed,
      },
    },
    events: events.map((e) => ({
      t: iso(e.at),
      kind: e.kind,
      level: e.level,
      alertId: e.alertId,
      by: e.by ?? null,
      note: e.note ?? null,
    })),
    findings: findingRows.map((f) => ({
      t: iso(f.createdAt),
      title: f.title,
      workOrderRef: f.workOrderRef,
      state: f.state,
    })),
    limitChanges: bandLimitChanges(settled(limitsResult), band.key),
    uploads: uploads.map((u) => ({
      t: iso(u.at),
      v: u.value,
      q: u.quality,
      analysisId: u.analysisId,
      by: u.by ?? null,
      fileName: u.fileName ?? null,
    })),
  };
}

export async function trendCsv(
  ctx: AppContext,
  user: SessionUser,
  pointId: number,
  q: { band: string; from?: string; to?: string },
  now = Date.now(),
) {
  const { point } = await accessiblePoint(ctx.db, user, pointId);
  const band = await trendBand(ctx, pointId, q.band);
  const { from, to } = period(q, now);
  const rows = await rawValues(ctx.db, pointId, band.key, from, to, true);
  // Values in the user's unit system (stored metric), named in the column: mm_per_s, in_per_s,
  // um, mil, g.
  const shownUnit = displayUnit(band.unit, user.unitSystem);
  const unit = shownUnit.replace('/', '_per_');
  // an overall value's band, per row (it follows each capture's speed and sample rate)
  const own =
    band.kind === 'overall' && band.fromHz !== undefined && band.toHz !== undefined
      ? ([band.fromHz, band.toHz] as [number, number])
      : null;
  const bands =
    band.kind === 'overall' && own === null && band.spectrum !== 'envelope'
      ? await repo.analysisBandsOf(
          ctx.db,
          rows.map((r) => r.analysisId),
        )
      : null;
  const bandOf = (analysisId: number) => {
    if (own !== null) return own;
    const b = bands?.get(analysisId);
    if (b === undefined) return null;
    return (band.spectrum === 'acceleration' ? b.accelBandHz : b.isoBandHz) ?? null;
  };
  const overall = band.kind === 'overall';
  const lines = [
    `taken_at_utc,${band.key}_${unit},quality${overall ? ',band_from_hz,band_to_hz' : ''}`,
  ];
  for (const r of rows) {
    const hz = overall ? bandOf(r.analysisId) : null;
    const tail = overall ? `,${hz?.[0] ?? ''},${hz?.[1] ?? ''}` : '';
    const value = toDisplay(r.value, band.unit, user.unitSystem);
    lines.push(`${new Date(Number(r.t)).toISOString()},${value},${r.quality}${tail}`);
  }
  const safeTag = point.tag.replace(/[^A-Za-z0-9._-]+/g, '_');
  return {
    fileName: `${safeTag}_${band.key}_${iso(from).slice(0, 10)}_${iso(to).slice(0, 10)}.csv`,
    text: lines.join('\n') + '\n',
  };
}
