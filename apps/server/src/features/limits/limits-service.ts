/**
 * The Limits screen's services: a point's limit set, saving it (engineer, audited), replay
 * of a proposed set against the stored history, ISO 20816 defaults, baseline suggestions,
 * the audit list, and machine-type templates.
 *
 * Removed bands: when a save drops a band that has an open (raised or acknowledged) alert,
 * that alert is cleared in the same transaction with an alert_events row noting "band
 * removed from the limit set", and the band's track is dropped from the point's condition
 * state — nothing would ever evaluate (and so clear) it again. Bands that stay keep their
 * state; new levels apply from the next capture (an open alert clears then by hysteresis).
 */

import {
  checkBandDefinition,
  baselineShortfall,
  computeBaseline,
  MIN_BASELINE,
  isoDefaultLevels,
  limitSetFromTemplate,
  replayLimitSet,
  statisticalLevel,
  type BandDefinition as LimitBand,
  type PointState,
  type ReplayEntry,
} from '@turnstone/condition';
import type { ReplayResponse } from '@turnstone/contracts/limits';
import type { AppContext } from '../../lib/context.ts';
import { AppError } from '../../lib/app-error.ts';
import type { accessiblePoint } from '../places/point-access.ts';
import type { SessionUser } from '../../lib/session-user.ts';
import type { machines } from '@turnstone/db/schema';
import { writeAudit } from '../audit/audit-repository.ts';
import * as repo from './limits-repository.ts';
import * as limitSets from './limit-set-repository.ts';
import * as conditionRepo from '../condition/condition-repository.ts';

type MachineRow = typeof machines.$inferSelect;

type PointRow = Awaited<ReturnType<typeof accessiblePoint>>;
type MachineType = MachineRow['type'];

const group = (m: MachineRow) => (m.isoGroup === 1 ? 1 : 2);

/** Every band checked with the condition package's rules; 400 with field paths otherwise. */
export function checkBands(list: readonly LimitBand[]) {
  const details = list.flatMap((b, i) =>
    checkBandDefinition(b).map((p) => ({ path: `bands.${i}.${p.field}`, message: p.message })),
  );
  if (details.length > 0)
    throw new AppError('validation_failed', 'Some bands cannot be evaluated.', 400, details);
}

/**
 * The bands a point without its own set starts from: the machine type's stored template
 * when an engineer saved one, else the condition package's built-in template.
 */
export async function templateBandsFor(
  ctx: AppContext,
  machine: MachineRow,
): Promise<{ bands: LimitBand[]; source: 'stored' | 'built-in' }> {
  const stored = await limitSets.loadTemplate(ctx.db, machine.type);
  if (stored && stored.bands.length > 0) return { bands: stored.bands, source: 'stored' };
  return {
    bands: [
      ...limitSetFromTemplate({
        type: machine.type,
        isoGroup: group(machine),
        foundation: machine.foundation,
        nominalRpm: machine.nominalRpm,
        rollingBearings: true,
      }).bands,
    ],
    source: 'built-in',
  };
}

export async function getLimitSet(ctx: AppContext, p: PointRow) {
  const machine = {
    id: p.machine.id,
    name: p.machine.name,
    type: p.machine.type,
    isoGroup: group(p.machine),
    foundation: p.machine.foundation,
    nominalRpm: p.machine.nominalRpm,
  };
  const point = { id: p.point.id, tag: p.point.tag, name: p.point.name };
  const set = await limitSets.loadLimitSet(ctx.db, p.point.id);
  if (!set) {
    // Not yet created (the worker creates it with the first capture): show what it would be.
    const t = await templateBandsFor(ctx, p.machine);
    return {
      pointId: p.point.id,
      name: `${p.machine.type} template`,
      version: 0,
      bands: t.bands,
      updatedBy: null,
      updatedAt: null,
      machine,
      point,
    };
  }
  const meta = await repo.limitSetMeta(ctx.db, p.point.id);
  return {
    pointId: p.point.id,
    name: meta?.name ?? 'limits',
    version: set.version,
    bands: set.bands,
    updatedBy: meta?.updatedBy ?? null,
    updatedAt: meta?.updatedAt?.toISOString() ?? null,
    machine,
    point,
  };
}

export async function saveLimits(
  ctx: AppContext,
  user: SessionUser,
  p: PointRow,
  list: LimitBand[],
  reason: string,
  now = new Date(),
) {
  checkBands(list);
  const pointId = p.point.id;
  return ctx.db.transaction(async (tx) => {
    // Point state first, as the worker locks it, then the limit set row (in saveLimitSet).
    const stateRow = await conditionRepo.lockPointState(tx, pointId);
    const before = await limitSets.loadLimitSet(tx, pointId);
    const saved = await limitSets.saveLimitSet(
      tx,
      pointId,
      before ? 'limits' : `${p.machine.type} limits`,
      list,
      user.id,
    );
    const kept = new Set(list.map((b) => b.key));
    const removed = (before?.bands ?? []).map((b) => b.key).filter((k) => !kept.has(k));
    const open = await conditionRepo.lockOpenAlertsOfBands(tx, pointId, removed);
    for (const a of open)
      await conditionRepo.changeAlert(
        tx,
        a.id,
        { state: 'cleared', clearedAt: now },
        {
          kind: 'cleared',
          level: a.level,
          value: null,
          userId: user.id,
          note: 'band removed from the limit set',
          at: now,
        },
      );
    const state = { ...(stateRow.state as unknown as Record<string, unknown>) };
    let stateChanged = false;
    for (const key of Object.keys(state)) {
      if (!kept.has(key)) {
        delete state[key];
        stateChanged = true;
      }
    }
    if (stateChanged) await conditionRepo.replacePointState(tx, pointId, state, now);
    await writeAudit(tx, {
      actorUserId: user.id,
      action: 'limits.update',
      entity: 'point',
      entityId: pointId,
      before: before?.bands ?? null,
      after: list,
      reason,
    });
    return { version: saved.version, clearedAlertIds: open.map((a) => a.id) };
  });
}

/** Replays the proposed bands over the point's stored history (most recent 5000 analyses). */
export async function replay(
  ctx: AppContext,
  p: PointRow,
  list: LimitBand[],
): Promise<ReplayResponse> {
  checkBands(list);
  const history = await repo.pointHistory(ctx.db, p.point.id);
  const byAnalysis = new Map<number, Record<string, number>>();
  for (const v of history.values) {
    let m = byAnalysis.get(v.analysisId);
    if (!m) byAnalysis.set(v.analysisId, (m = {}));
    m[v.bandKey] = v.value;
  }
  const entries: ReplayEntry[] = history.analyses.map((a) => ({
    takenAt: a.takenAt.getTime(),
    quality: a.verdict,
    values: byAnalysis.get(a.id) ?? {},
  }));
  const report = replayLimitSet(list, entries, { initialState: {} as PointState });
  const iso = (ms: number | null) => (ms === null ? null : new Date(ms).toISOString());
  const defs = new Map(list.map((b) => [b.key, b]));
  return {
    snapshots: entries.length,
    from: iso(entries[0]?.takenAt ?? null),
    to: iso(entries.at(-1)?.takenAt ?? null),
    totals: report.totals,
    qualityNotices: report.qualityNotices.map((t) => new Date(t).toISOString()),
    bands: report.bands.map((b) => {
      const def = defs.get(b.bandKey)!;
      return {
        bandKey: b.bandKey,
        bandName: b.bandName,
        unit: def.unit,
        alertLevel: def.alertLevel,
        dangerLevel: def.dangerLevel,
        evaluated: b.evaluated,
        byLevel: b.byLevel,
        alerts: b.alerts.map((a) => ({
          raisedLevel: a.raisedLevel,
          raisedAt: iso(a.raisedAt)!,
          raisedValue: a.raisedValue,
          escalatedAt: iso(a.escalatedAt),
          clearedAt: iso(a.clearedAt),
          peakValue: a.peakValue,
        })),
        values: history.analyses.flatMap((a) => {
          const v = byAnalysis.get(a.id)?.[b.bandKey];
          return v === undefined ? [] : [{ t: a.takenAt.toISOString(), v, q: a.verdict }];
        }),
      };
    }),
  };
}

export function isoDefaults(p: PointRow) {
  const g = group(p.machine);
  const levels = isoDefaultLevels(g, p.machine.foundation);
  return {
    isoGroup: g,
    foundation: p.machine.foundation,
    ...levels,
    unit: 'mm/s' as const,
    source:
      'ISO 20816-3 zone boundaries (alert at B/C, danger at C/D), from memory; review against the manufacturer’s data and site standards.',
  };
}

/**
 * The log-domain k-sigma levels (`statisticalLevel`) over the first `count` usable values of
 * the band's stored trend (at least 30, over at least 7 days; the query refuses fewer).
 */
export async function suggest(
  ctx: AppContext,
  p: PointRow,
  q: { band: string; kAlert: number; kDanger: number; count: number },
) {
  const rows = await repo.bandTrend(ctx.db, p.point.id, q.band);
  const stats = computeBaseline(
    { from: 'first-n', count: q.count },
    rows.map((r) => ({ takenAt: r.takenAt.getTime(), value: r.value, quality: r.quality })),
  );
  const short = baselineShortfall(stats);
  return {
    bandKey: q.band,
    baseline: stats,
    alertLevel: stats && !short ? statisticalLevel(stats, q.kAlert) : null,
    dangerLevel: stats && !short ? statisticalLevel(stats, q.kDanger) : null,
    kAlert: q.kAlert,
    kDanger: q.kDanger,
    message: !stats
      ? `This band has ${rows.length} stored value(s); a baseline needs ${q.count} usable ones over at least ${MIN_BASELINE.days} days.`
      : short,
  };
}

/** JSON with object keys sorted, so stored (re-ordered) and sent bands compare equal. */
const canonical = (v: unknown): string =>
  JSON.stringify(v, (_k, x: unknown) =>
    x && typeof x === 'object' && !Array.isArray(x)
      ? Object.fromEntries(Object.entries(x).sort(([a], [b]) => (a < b ? -1 : 1)))
      : x,
  );

const keysOf = (v: unknown): Map<string, string> => {
  const out = new Map<string, string>();
  if (Array.isArray(v))
    for (const b of v as { key?: unknown }[])
      if (typeof b?.key === 'string') out.set(b.key, canonical(b));
  return out;
};

export async function history(ctx: AppContext, pointId: number) {
  const rows = await repo.limitAudit(ctx.db, pointId);
  return {
    items: rows.map((r) => {
      const before = keysOf(r.before);
      const after = keysOf(r.after);
      return {
        id: r.id,
        at: r.at.toISOString(),
        action: r.action,
        actor: r.by ?? null,
        reason: r.reason ?? null,
        added: [...after.keys()].filter((k) => !before.has(k)),
        removed: [...before.keys()].filter((k) => !after.has(k)),
        changed: [...after.keys()].filter((k) => before.has(k) && before.get(k) !== after.get(k)),
      };
    }),
  };
}

export async function getTemplate(ctx: AppContext, machineType: MachineType) {
  const stored = await limitSets.loadTemplate(ctx.db, machineType);
  if (stored)
    return { machineType, source: 'stored' as const, version: stored.version, bands: stored.bands };
  // The built-in template depends on the machine's ISO group, foundation and speed; shown
  // here for a group 2, rigid, 1480 r/min machine.
  const built = limitSetFromTemplate({
    type: machineType,
    isoGroup: 2,
    foundation: 'rigid',
    nominalRpm: 1480,
  });
  return { machineType, source: 'built-in' as const, version: 0, bands: [...built.bands] };
}

export async function saveTemplate(
  ctx: AppContext,
  user: SessionUser,
  machineType: MachineType,
  list: LimitBand[],
  reason: string,
) {
  checkBands(list);
  return ctx.db.transaction(async (tx) => {
    const before = await limitSets.loadTemplate(tx, machineType);
    const version = await limitSets.saveTemplate(tx, machineType, list, user.id);
    await writeAudit(tx, {
      actorUserId: user.id,
      action: 'limits.template',
      entity: 'limit-template',
      entityId: machineType,
      before: before?.bands ?? null,
      after: list,
      reason,
    });
    return { machineType, source: 'stored' as const, version, bands: list };
  });
}
