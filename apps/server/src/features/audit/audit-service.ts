import { and, desc, eq, gte, inArray, like, lt, lte, or, type SQL } from 'drizzle-orm';
import type { Db } from '@turnstone/db/client';
import { auditLog, users } from '@turnstone/db/schema';
import type { AuditPage, auditQuerySchema } from '@turnstone/contracts/audit';
import type { z } from 'zod';
import type { SessionUser } from '../../lib/session-user.ts';

type Query = z.output<typeof auditQuerySchema>;

/** Escapes LIKE wildcards so an action prefix matches literally. */
const likePrefix = (s: string) => `${s.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;

/**
 * The audit log, newest first, with the actor's name. Keyset pagination on the id (ids
 * grow with time), so a page stays correct while new rows arrive. An admin sees every
 * entry; anyone else the entries of their sites and the machine-type templates (which
 * belong to no site), not user administration.
 */
export async function listAudit(db: Db, user: SessionUser, q: Query): Promise<AuditPage> {
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
  const page = rows.slice(0, q.limit);
  return {
    items: page.map((r) => ({ ...r, at: r.at.toISOString(), actorName: r.actorName ?? null })),
    nextCursor: rows.length > q.limit ? String(page[page.length - 1]!.id) : null,
  };
}
