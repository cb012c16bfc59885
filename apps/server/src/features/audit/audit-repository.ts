import { and, desc, eq, gte, inArray, like, lt, lte, or, type SQL } from 'drizzle-orm';
import type { z } from 'zod';
import type { auditQuerySchema } from '@turnstone/contracts/audit';
import type { SessionUser } from '../../lib/session-user.ts';
import type { Db, Tx } from '@turnstone/db/client';
import {
  alerts,
  areas,
  auditLog,
  findings,
  gateways,
  machines,
  points,
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
}

/**
 * The site of an audited entity, as it is in this transaction; null for entities of no
 * site (users, machine-type templates) and for one that no longer exists.
 */
async function siteOfEntity(db: Db | Tx, entity: string, id: number): Promise<number | null> {
  const bySite = async (q: Promise<{ siteId: number | null }[]>): Promise<number | null> =>
    (await q)[0]?.siteId ?? null;
  const pointSite = (pointId: number) =>
    bySite(
      db
        .select({ siteId: areas.siteId })
        .from(points)
        .innerJoin(machines, eq(machines.id, points.machineId))
        .innerJoin(areas, eq(areas.id, machines.areaId))
        .where(eq(points.id, pointId)),
    );
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
