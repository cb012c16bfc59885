import type { Db } from '@turnstone/db/client';
import { auditLog } from '@turnstone/db/schema';

export interface AuditEntry {
  actorUserId: number | null;
  action: string;
  entity: string;
  entityId: string | number;
  before?: unknown;
  after?: unknown;
  reason?: string | null;
}

/** Writes one audit row; pass the transaction so the change and its record commit together. */
export async function writeAudit(db: Pick<Db, 'insert'>, e: AuditEntry): Promise<void> {
  await db.insert(auditLog).values({
    actorUserId: e.actorUserId,
    action: e.action,
    entity: e.entity,
    entityId: String(e.entityId),
    before: e.before ?? null,
    after: e.after ?? null,
    reason: e.reason ?? null,
  });
}
