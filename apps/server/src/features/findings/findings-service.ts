import type { Tx } from '@turnstone/db/client';
import { z } from 'zod';
import type {
  Finding,
  FindingPage,
  createFindingSchema,
  findingListQuerySchema,
  updateFindingSchema,
} from '@turnstone/contracts/findings';
import type { AppContext } from '../../lib/context.ts';
import { AppError, forbidden, notFound } from '../../lib/app-error.ts';
import { accessiblePoint } from '../places/point-access.ts';
import { canSeeSite, type SessionUser } from '../../lib/session-user.ts';
import { auditAction, writeAudit } from '../audit/audit-repository.ts';
import * as repo from './findings-repository.ts';
import { queueWebhookEvent } from '../webhooks/webhooks-service.ts';
import { decodeCursor, pageOf } from '../../lib/cursor.ts';
import { isoWeekDays } from '@turnstone/contracts/dates';

type CreateInput = z.output<typeof createFindingSchema>;
type UpdateInput = z.output<typeof updateFindingSchema>;
type ListQuery = z.output<typeof findingListQuerySchema>;

export function toFinding(r: repo.FindingListRow): Finding {
  const f = r.finding;
  return {
    id: f.id,
    pointId: f.pointId,
    pointTag: r.pointTag,
    pointName: r.pointName,
    machineName: r.machineName,
    siteId: r.siteId,
    siteCode: r.siteCode,
    alertId: f.alertId,
    bandKey: f.bandKey,
    title: f.title,
    workOrderRef: f.workOrderRef,
    dueDate: f.dueDate,
    state: f.state,
    priority: f.priority,
    owner: f.owner,
    plannedDowntimeHours: f.plannedDowntimeHours,
    note: f.note,
    createdBy: { id: f.createdBy, name: r.createdByName },
    createdAt: f.createdAt.toISOString(),
    updatedAt: f.updatedAt.toISOString(),
  };
}

/** The audited picture of a finding: what a person can change, and where it sits. */
const auditView = (f: repo.FindingRow) => ({
  pointId: f.pointId,
  alertId: f.alertId,
  bandKey: f.bandKey,
  title: f.title,
  state: f.state,
  workOrderRef: f.workOrderRef,
  dueDate: f.dueDate,
  note: f.note,
  priority: f.priority,
  owner: f.owner,
  plannedDowntimeHours: f.plannedDowntimeHours,
});

/** Site scope of a request: every visible site, or the one asked for (403 when not visible). */
export function siteScope(user: SessionUser, siteId: number | undefined): number[] {
  if (siteId === undefined) return user.siteIds;
  if (!canSeeSite(user, siteId)) throw forbidden('You are not assigned to this site.');
  return [siteId];
}

export async function listFindings(
  ctx: AppContext,
  user: SessionUser,
  q: ListQuery,
): Promise<FindingPage> {
  if (q.pointId !== undefined) await accessiblePoint(ctx.db, user, q.pointId);
  const rows = await repo.listFindings(ctx.db, {
    siteIds: siteScope(user, q.siteId),
    ...(q.state ? { state: q.state } : {}),
    ...(q.pointId !== undefined ? { pointId: q.pointId } : {}),
    ...(q.dueWeek ? { dueWithin: weekDates(q.dueWeek) } : {}),
    ...(q.since ? { since: new Date(q.since) } : {}),
    ...(q.cursor ? { after: decodeCursor(q.cursor) } : {}),
    limit: q.limit + 1,
  });
  const page = pageOf(rows, q.limit, (r) => ({ at: r.finding.updatedAt, id: r.finding.id }));
  return { items: page.items.map(toFinding), nextCursor: page.nextCursor };
}

/**
 * The findings not yet done (open or planned) on a machine's points, last changed first. The
 * caller has checked the machine's site.
 */
export async function openFindingsOfMachine(
  ctx: AppContext,
  user: SessionUser,
  machineId: number,
): Promise<Finding[]> {
  const rows = await repo.listFindings(ctx.db, {
    siteIds: siteScope(user, undefined),
    machineId,
    notDone: true,
    limit: 200,
  });
  return rows.map(toFinding);
}

function weekDates(week: string) {
  const days = isoWeekDays(week);
  if (!days) throw new AppError('validation_failed', 'Use a week like 2026-W49.', 400);
  return { from: days.monday, to: days.sunday };
}

async function loadOne(ctx: AppContext, user: SessionUser, id: number, tx?: Tx) {
  const [row] = await repo.listFindings(tx ?? ctx.db, { siteIds: user.siteIds, ids: [id] });
  if (!row) throw notFound('Finding');
  return toFinding(row);
}

const reopenFirst = () =>
  new AppError('validation_failed', 'A done finding is reopened before it is planned again.', 400, [
    { path: ['state'], message: 'Reopen the finding (state open) first' },
  ]);

const needsWorkOrder = () =>
  new AppError('validation_failed', 'A planned finding needs a work-order reference.', 400, [
    { path: ['workOrderRef'], message: 'Give the work-order reference to mark it planned' },
  ]);

export async function createFinding(
  ctx: AppContext,
  user: SessionUser,
  input: CreateInput,
): Promise<Finding> {
  await accessiblePoint(ctx.db, user, input.pointId);
  let bandKey = input.bandKey ?? null;
  if (input.alertId != null) {
    const alert = await repo.alertOfPoint(ctx.db, input.alertId);
    if (!alert || alert.pointId !== input.pointId)
      throw new AppError('validation_failed', 'The alert does not belong to this point.', 400, [
        { path: ['alertId'], message: 'The alert does not belong to this point' },
      ]);
    bandKey ??= alert.bandKey;
  }
  const id = await ctx.db.transaction(async (tx) => {
    const newId = await repo.insertFinding(tx, {
      pointId: input.pointId,
      alertId: input.alertId ?? null,
      bandKey,
      title: input.title,
      workOrderRef: input.workOrderRef ?? null,
      dueDate: input.dueDate ?? null,
      note: input.note ?? null,
      priority: input.priority ?? 'medium',
      owner: input.owner ?? null,
      plannedDowntimeHours: input.plannedDowntimeHours ?? null,
      // A work order already raised makes the finding planned from the start.
      state: input.workOrderRef ? 'planned' : 'open',
      createdBy: user.id,
    });
    const row = await repo.lockFinding(tx, newId);
    await auditAction(tx, user, 'finding.create', newId, { before: null, after: auditView(row!) });
    await queueWebhookEvent(tx, 'finding.created', await loadOne(ctx, user, newId, tx));
    return newId;
  });
  return loadOne(ctx, user, id);
}

export async function updateFinding(
  ctx: AppContext,
  user: SessionUser,
  id: number,
  input: UpdateInput,
): Promise<Finding> {
  await ctx.db.transaction(async (tx) => {
    const before = await repo.lockFinding(tx, id);
    if (!before) throw notFound('Finding');
    await accessiblePoint(tx as unknown as AppContext['db'], user, before.pointId);
    const set: Parameters<typeof repo.updateFinding>[2] = {};
    if (input.state !== undefined) set.state = input.state;
    if (input.title !== undefined) set.title = input.title;
    if (input.workOrderRef !== undefined) set.workOrderRef = input.workOrderRef;
    if (input.dueDate !== undefined) set.dueDate = input.dueDate;
    if (input.note !== undefined) set.note = input.note;
    if (input.priority !== undefined) set.priority = input.priority;
    if (input.owner !== undefined) set.owner = input.owner;
    if (input.plannedDowntimeHours !== undefined)
      set.plannedDowntimeHours = input.plannedDowntimeHours;
    // The flow: a work-order reference given to an open finding plans it.
    if (input.state === undefined && before.state === 'open' && input.workOrderRef)
      set.state = 'planned';
    const after = { ...before, ...set };
    if (before.state === 'done' && set.state === 'planned') throw reopenFirst();
    if (after.state === 'planned' && !after.workOrderRef) throw needsWorkOrder();
    const changed = (Object.keys(set) as (keyof typeof set)[]).some((k) => set[k] !== before[k]);
    if (!changed) return;
    await repo.updateFinding(tx, id, set);
    await writeAudit(tx, {
      actorUserId: user.id,
      action:
        set.state !== undefined && set.state !== before.state
          ? `finding.${set.state}`
          : 'finding.update',
      entity: 'finding',
      entityId: id,
      before: auditView(before),
      after: auditView(after),
    });
    await queueWebhookEvent(tx, 'finding.updated', await loadOne(ctx, user, id, tx));
  });
  return loadOne(ctx, user, id);
}
