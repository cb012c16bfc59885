/**
 * Alerts for the dashboard: the list and one alert's history for every role (only the sites
 * it is assigned to), and acknowledgement by operators and engineers. An acknowledgement
 * goes through `@turnstone/condition`'s state machine on the point's locked state row, so it
 * cannot race the worker judging a new capture of the same point.
 */

import {
  acknowledgeAlert,
  bandClearAfterHours,
  bandClearLevel,
  bandClearPersistence,
  describeBand,
  levelsInForce,
  type PointState,
} from '@turnstone/condition';
import type {
  Alert,
  AlertClearRule,
  AlertDetail,
  AlertListQuery,
} from '@turnstone/contracts/alerts';
import { alertListQuerySchema } from '@turnstone/contracts/alerts';

import type { AppContext } from '../../lib/context.ts';
import type { Db, Tx } from '@turnstone/db/client';
import { AppError, forbidden, notFound } from '../../lib/app-error.ts';
import { canSeeSite, type SessionUser } from '../../lib/session-user.ts';
import * as conditionRepo from '../condition/condition-repository.ts';
import { writeAudit } from '../audit/audit-repository.ts';
import { currentDiagnosis } from '../points/points-service.ts';
import { loadLimitSet } from '../limits/limit-set-repository.ts';
import { bandStatesOf } from '../points/points-repository.ts';
import * as repo from './alerts-repository.ts';
import { isAlertLinkSignature } from './alert-mail-link.ts';
import { queueWebhookEvent } from '../webhooks/webhooks-service.ts';
import { decodeCursor, pageOf } from '../../lib/cursor.ts';

const iso = (d: Date | null) => (d ? d.toISOString() : null);

export function toAlert(r: repo.AlertRow): Alert {
  return {
    ...r,
    suspect: Boolean(r.suspect),
    firstAt: r.firstAt.toISOString(),
    lastAt: r.lastAt.toISOString(),
    clearedAt: iso(r.clearedAt),
    acknowledgedAt: iso(r.acknowledgedAt),
    acknowledgedBy: r.acknowledgedBy ?? null,
    acknowledgeNote: r.acknowledgeNote ?? null,
    updatedAt: r.updatedAt.toISOString(),
  };
}

const visibleSites = (user: SessionUser) => (user.role === 'admin' ? null : user.siteIds);

/** Queues `alert.<kind>` with the alert as `GET /alerts` lists it, as it is in `tx`. */
export async function queueAlertWebhook(
  tx: Tx,
  alertId: number,
  kind: 'raised' | 'escalated' | 'acknowledged' | 'cleared',
): Promise<void> {
  const [row] = await repo.listAlerts(tx, { ids: [alertId], siteIds: null, limit: 1 });
  if (row) await queueWebhookEvent(tx, `alert.${kind}`, toAlert(row));
}

export async function listAlerts(ctx: AppContext, user: SessionUser, query: AlertListQuery) {
  const { since, cursor, ...q } = alertListQuerySchema.parse(query);
  const rows = await repo.listAlerts(ctx.db, {
    ...q,
    siteIds: visibleSites(user),
    limit: q.limit + 1,
    ...(since ? { since: new Date(since) } : {}),
    ...(cursor ? { after: decodeCursor(cursor) } : {}),
  });
  const page = pageOf(rows, q.limit, (r) => ({ at: r.lastAt, id: r.id }));
  return { items: page.items.map(toAlert), nextCursor: page.nextCursor };
}

/**
 * The open (raised or acknowledged) alerts on a machine's points: danger before alert, then
 * newest activity first. The caller has checked the machine's site.
 */
export async function openAlertsOfMachine(
  ctx: AppContext,
  user: SessionUser,
  machineId: number,
): Promise<Alert[]> {
  const rows = await repo.listAlerts(ctx.db, {
    machineId,
    open: true,
    siteIds: visibleSites(user),
    limit: 200,
  });
  const rank = (l: Alert['level']) => (l === 'danger' ? 0 : 1);
  return rows.map(toAlert).sort((a, b) => rank(a.level) - rank(b.level));
}

/**
 * How the band's open alert clears under the point's limit set in force: the levels the
 * worker judges at (`levelsInForce`), its clear level and clear rules (`evaluateBand` rule 6).
 * Null when the set no longer has the band.
 */
export async function bandRuleOf(
  db: Db | Tx,
  pointId: number,
  bandKey: string,
): Promise<{ clearRule: AlertClearRule; bandMeaning: string } | null> {
  const [set, states] = await Promise.all([loadLimitSet(db, pointId), bandStatesOf(db, pointId)]);
  const band = set?.bands.find((b) => b.key === bandKey);
  if (!band) return null;
  const levels = levelsInForce(band, states.get(bandKey));
  return {
    clearRule: {
      alertLevel: levels.alertLevel,
      dangerLevel: levels.dangerLevel,
      clearLevel: bandClearLevel(band, levels),
      clearPersistence: bandClearPersistence(band),
      clearAfterHours: bandClearAfterHours(band),
    },
    bandMeaning: describeBand(band),
  };
}

/**
 * Where an alert mail's link leads: the alerts page with the alert open. A signature that is
 * not this alert's is refused (403), so the link cannot be bent towards anything else.
 */
export function alertPageFromMail(ctx: AppContext, id: number, sig: string): string {
  if (!isAlertLinkSignature(ctx.jwtSecret, id, sig))
    throw new AppError(
      'bad_link_signature',
      'This link was not sent by Turnstone or has been changed. Open the alert from the Alerts page instead.',
      403,
    );
  return `/alerts?alert=${id}`;
}

/** Values of the band the alert detail's sparkline shows. */
export const SPARKLINE_VALUES = 40;

export async function getAlert(
  ctx: AppContext,
  user: SessionUser,
  id: number,
): Promise<AlertDetail> {
  const [row] = await repo.listAlerts(ctx.db, { ids: [id], siteIds: null, limit: 1 });
  if (!row) throw notFound('Alert');
  if (!canSeeSite(user, row.siteId))
    throw forbidden('This alert belongs to a site you are not assigned to.');
  const [history, current, rule, recent, zone] = await Promise.all([
    repo.alertHistory(ctx.db, id),
    currentDiagnosis(ctx.db, row.pointId),
    bandRuleOf(ctx.db, row.pointId, row.bandKey),
    repo.recentBandValues(ctx.db, row.pointId, row.bandKey, SPARKLINE_VALUES),
    repo.machineZone(ctx.db, row.machineId),
  ]);
  // The value that raised the alert is the one its raise event carries (the capture's time).
  const raisedAt = history.find((h) => h.kind === 'raised')?.at ?? row.firstAt;
  const valuesSinceRaised =
    row.state === 'cleared'
      ? null
      : await repo.bandValuesAfter(ctx.db, row.pointId, row.bandKey, raisedAt);
  return {
    ...toAlert(row),
    clearRule: rule?.clearRule ?? null,
    bandMeaning: rule?.bandMeaning ?? null,
    machineZone: zone,
    valuesSinceRaised,
    recentValues: recent.map((v) => ({ at: v.at.toISOString(), value: v.value })),
    history: history.map((h) => ({ ...h, at: h.at.toISOString(), userName: h.userName ?? null })),
    currentDiagnosis: current,
  };
}

/**
 * Acknowledges every alert in `ids` with one note, all or nothing, in one transaction:
 * point state rows locked first (in point order, as the worker locks them), then the alert
 * rows; each alert must be `raised` (409 otherwise: acknowledged or cleared alerts are not
 * acknowledged again). Writes the alert row, an alert_events row and an audit_log row each.
 */
export async function acknowledge(
  ctx: AppContext,
  user: SessionUser,
  ids: number[],
  note: string,
  now = new Date(),
): Promise<{ items: Alert[] }> {
  const unique = [...new Set(ids)].sort((a, b) => a - b);
  const seen = await repo.listAlerts(ctx.db, { ids: unique, siteIds: null, limit: unique.length });
  if (seen.length !== unique.length) throw notFound('Alert');
  for (const r of seen) {
    if (!canSeeSite(user, r.siteId))
      throw forbidden('An alert belongs to a site you are not assigned to.');
  }
  const pointIds = [...new Set(seen.map((r) => r.pointId))].sort((a, b) => a - b);

  await ctx.db.transaction(async (tx) => {
    const states = new Map<number, PointState>();
    for (const pointId of pointIds) {
      const row = await conditionRepo.lockPointState(tx, pointId);
      states.set(pointId, row.state as unknown as PointState);
    }
    const locked = await conditionRepo.lockAlerts(tx, unique);
    const refused = locked.filter((a) => a.state !== 'raised');
    if (refused.length > 0) {
      throw new AppError(
        'alert_not_raised',
        refused.length === 1
          ? `Alert ${refused[0]!.id} is already ${refused[0]!.state}; only raised alerts can be acknowledged.`
          : `${refused.length} of the selected alerts are no longer raised; only raised alerts can be acknowledged.`,
        409,
        refused.map((a) => ({ id: a.id, state: a.state })),
      );
    }
    for (const a of locked) {
      const state = states.get(a.pointId) ?? {};
      const result = acknowledgeAlert(state, a.bandKey, {
        by: String(user.id),
        note,
        at: now.getTime(),
      });
      const ignored = result.changes.find((c) => c.kind === 'ignored');
      if (ignored && ignored.kind === 'ignored' && ignored.reason === 'already-acknowledged') {
        throw new AppError('alert_not_raised', `Alert ${a.id} is already acknowledged.`, 409, [
          { id: a.id, state: 'acknowledged' },
        ]);
      }
      // 'no-alert': the point's state no longer tracks this band (its band was removed
      // from the limit set); the row alone is acknowledged.
      states.set(a.pointId, result.state);
      await conditionRepo.changeAlert(
        tx,
        a.id,
        {
          state: 'acknowledged',
          acknowledgedBy: user.id,
          acknowledgedAt: now,
          acknowledgeNote: note,
        },
        {
          kind: 'acknowledged',
          level: a.level,
          value: a.lastValue,
          userId: user.id,
          note,
          at: now,
        },
      );
      await queueAlertWebhook(tx, a.id, 'acknowledged');
      await writeAudit(tx, {
        actorUserId: user.id,
        action: 'alert.acknowledge',
        entity: 'alert',
        entityId: a.id,
        before: { state: a.state, level: a.level },
        after: { state: 'acknowledged', level: a.level, note },
        reason: note,
        // The same instant as the alert's acknowledgement (a replayed one keeps its own).
        at: now,
      });
    }
    for (const [pointId, state] of states)
      await conditionRepo.replacePointState(
        tx,
        pointId,
        state as unknown as Record<string, unknown>,
        now,
      );
  });
  const rows = await repo.listAlerts(ctx.db, { ids: unique, siteIds: null, limit: unique.length });
  return { items: rows.map(toAlert) };
}
