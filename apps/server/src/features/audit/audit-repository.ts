import { and, desc, eq, gte, inArray, like, lt, lte, or, type SQL } from 'drizzle-orm';
import type { z } from 'zod';
import type { auditQuerySchema } from '@turnstone/contracts/audit';
import type { SessionUser } from '../../lib/session-user.ts';
import type { Db, Tx } from '@turnstone/db/client';
import { pointWithPlace } from '../places/places-repository.ts';
import {
  alerts,
  areas,
  auditLog,
  findings,
  gateways,
  machines,
  points,
  sites,
  users,
} from '@turnstone/db/schema';

export interface AuditEntry {
  actorUserId: number | null;
  action: string;
  entity: string;
  entityId: string | number;
  before?: unknown;
  after?: unknown;
  reason?: string | null;
  /**
   * The site the entry concerns. Left out, it is looked up from the entity, which must
   * still exist: pass it when the entity was just deleted.
   */
  siteId?: number | null;
  /** When it happened, if not now: an act replayed at its own time (the demo history). */
  at?: Date;
}

/**
 * The site of an audited entity, as it is in this transaction; null for entities of no
 * site (users, machine-type templates) and for one that no longer exists.
 */
async function siteOfEntity(db: Db | Tx, entity: string, id: number): Promise<number | null> {
  const bySite = async (q: Promise<{ siteId: number | null }[]>): Promise<number | null> =>
    (await q)[0]?.siteId ?? null;
  const pointSite = async (pointId: number) => (await pointWithPlace(db, pointId))?.siteId ?? null;
  const viaPoint = async (q: Promise<{ pointId: number }[]>) => {
    const [row] = await q;
    return row ? pointSite(row.pointId) : null;
  };
  switch (entity) {
    case 'site':
      return id;
    case 'area':
      return bySite(db.select({ siteId: areas.siteId }).from(areas).where(eq(areas.id, id)));
    case 'gateway':
      return bySite(
        db.select({ siteId: gateways.siteId }).from(gateways).where(eq(gateways.id, id)),
      );
    case 'machine':
      return bySite(
        db
          .select({ siteId: areas.siteId })
          .from(machines)
          .innerJoin(areas, eq(areas.id, machines.areaId))
          .where(eq(machines.id, id)),
      );
    case 'point':
      return pointSite(id);
    case 'alert':
      return viaPoint(db.select({ pointId: alerts.pointId }).from(alerts).where(eq(alerts.id, id)));
    case 'finding':
      return viaPoint(
        db.select({ pointId: findings.pointId }).from(findings).where(eq(findings.id, id)),
      );
    default:
      return null;
  }
}

/** Writes one audit row; pass the transaction so the change and its record commit together. */
/**
 * An act of a signed-in user on the entity its action names (`gateway.revoke` → entity
 * `gateway`), audited in the act's transaction.
 */
export const auditAction = (
  db: Db | Tx,
  actor: { id: number },
  action: `${string}.${string}`,
  entityId: string | number,
  change: Pick<AuditEntry, 'before' | 'after' | 'reason' | 'siteId'> = {},
) =>
  writeAudit(db, {
    actorUserId: actor.id,
    action,
    entity: action.slice(0, action.indexOf('.')),
    entityId,
    ...change,
  });

export async function writeAudit(db: Db | Tx, e: AuditEntry): Promise<void> {
  const numericId = Number(e.entityId);
  const siteId =
    e.siteId !== undefined
      ? e.siteId
      : Number.isInteger(numericId)
        ? await siteOfEntity(db, e.entity, numericId)
        : null;
  await db.insert(auditLog).values({
    actorUserId: e.actorUserId,
    action: e.action,
    entity: e.entity,
    entityId: String(e.entityId),
    before: e.before ?? null,
    after: e.after ?? null,
    reason: e.reason ?? null,
    siteId,
    ...(e.at ? { at: e.at } : {}),
  });
}

export type AuditQuery = z.output<typeof auditQuerySchema>;

/** Escapes LIKE wildcards so an action prefix matches literally. */
const likePrefix = (s: string) => `${s.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;

/** Up to `q.limit + 1` entries the user may read that match `q`, newest first. */
export async function auditRows(db: Db, user: SessionUser, q: AuditQuery) {
  const where: SQL[] = [];
  if (user.role !== 'admin') {
    const templates = eq(auditLog.entity, 'limit-template');
    where.push(
      user.siteIds.length ? or(inArray(auditLog.siteId, user.siteIds), templates)! : templates,
    );
  }
  if (q.entity) where.push(eq(auditLog.entity, q.entity));
  if (q.entityId) where.push(eq(auditLog.entityId, q.entityId));
  if (q.actor) where.push(eq(auditLog.actorUserId, q.actor));
  if (q.action)
    where.push(
      q.action.endsWith('.')
        ? like(auditLog.action, likePrefix(q.action))
        : eq(auditLog.action, q.action),
    );
  if (q.from) where.push(gte(auditLog.at, new Date(q.from)));
  if (q.since) where.push(gte(auditLog.at, new Date(q.since)));
  if (q.to) where.push(lte(auditLog.at, new Date(q.to)));
  if (q.cursor) where.push(lt(auditLog.id, Number(q.cursor)));
  const rows = await db
    .select({
      id: auditLog.id,
      at: auditLog.at,
      actorUserId: auditLog.actorUserId,
      actorName: users.name,
      action: auditLog.action,
      entity: auditLog.entity,
      entityId: auditLog.entityId,
      before: auditLog.before,
      after: auditLog.after,
      reason: auditLog.reason,
    })
    .from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.actorUserId))
    .where(where.length ? and(...where) : undefined)
    .orderBy(desc(auditLog.id))
    .limit(q.limit + 1);
  return rows;
}

/**
 * Names people read for the entities of audit entries ("MFP-P101-MDE-H · Intake pump P-101"
 * instead of "point #9"), keyed `entity:id`; entities that no longer exist are left out.
 */
export async function entityLabels(
  db: Db,
  refs: { entity: string; entityId: string }[],
): Promise<Map<string, string>> {
  const ids = (entity: string) => [
    ...new Set(
      refs
        .filter((r) => r.entity === entity && /^\d{1,15}$/.test(r.entityId))
        .map((r) => Number(r.entityId)),
    ),
  ];
  const out = new Map<string, string>();
  const put = (entity: string, rows: { id: number; label: string }[]) => {
    for (const r of rows) out.set(`${entity}:${r.id}`, r.label);
  };
  const pointIds = ids('point');
  const machineIds = ids('machine');
  const alertIds = ids('alert');
  const findingIds = ids('finding');
  const gatewayIds = ids('gateway');
  const siteIds = ids('site');
  const areaIds = ids('area');
  const userIds = ids('user');
  await Promise.all([
    pointIds.length &&
      db
        .select({ id: points.id, tag: points.tag, machine: machines.name })
        .from(points)
        .innerJoin(machines, eq(machines.id, points.machineId))
        .where(inArray(points.id, pointIds))
        .then((r) =>
          put(
            'point',
            r.map((p) => ({ id: p.id, label: `${p.tag} · ${p.machine}` })),
          ),
        ),
    machineIds.length &&
      db
        .select({ id: machines.id, label: machines.name })
        .from(machines)
        .where(inArray(machines.id, machineIds))
        .then((r) => put('machine', r)),
    alertIds.length &&
      db
        .select({ id: alerts.id, tag: points.tag, band: alerts.bandName })
        .from(alerts)
        .innerJoin(points, eq(points.id, alerts.pointId))
        .where(inArray(alerts.id, alertIds))
        .then((r) =>
          put(
            'alert',
            r.map((a) => ({ id: a.id, label: `${a.tag} · ${a.band}` })),
          ),
        ),
    findingIds.length &&
      db
        .select({ id: findings.id, label: findings.title })
        .from(findings)
        .where(inArray(findings.id, findingIds))
        .then((r) => put('finding', r)),
    gatewayIds.length &&
      db
        .select({ id: gateways.id, label: gateways.name })
        .from(gateways)
        .where(inArray(gateways.id, gatewayIds))
        .then((r) => put('gateway', r)),
    siteIds.length &&
      db
        .select({ id: sites.id, label: sites.name })
        .from(sites)
        .where(inArray(sites.id, siteIds))
        .then((r) => put('site', r)),
    areaIds.length &&
      db
        .select({ id: areas.id, label: areas.name })
        .from(areas)
        .where(inArray(areas.id, areaIds))
        .then((r) => put('area', r)),
    userIds.length &&
      db
        .select({ id: users.id, label: users.name })
        .from(users)
        .where(inArray(users.id, userIds))
        .then((r) => put('user', r)),
  ]);
  return out;
}
