import type { Db } from '@turnstone/db/client';
import type { AuditPage } from '@turnstone/contracts/audit';
import type { SessionUser } from '../../lib/session-user.ts';
import { auditRows, entityLabels, type AuditQuery } from './audit-repository.ts';
import { auditChanges } from './audit-changes.ts';

/**
 * The audit log, newest first, with the actor's name. Keyset pagination on the id (ids
 * grow with time), so a page stays correct while new rows arrive. An admin sees every
 * entry; anyone else the entries of their sites and the machine-type templates (which
 * belong to no site), not user administration. Levels in the changes are in the reader's
 * unit system.
 */
export async function listAudit(db: Db, user: SessionUser, q: AuditQuery): Promise<AuditPage> {
  const rows = await auditRows(db, user, q);
  const page = rows.slice(0, q.limit);
  const labels = await entityLabels(db, page);
  return {
    items: page.map((r) => ({
      ...r,
      at: r.at.toISOString(),
      actorName: r.actorName ?? null,
      entityLabel: labels.get(`${r.entity}:${r.entityId}`) ?? null,
      changes: auditChanges(r.before, r.after, user.unitSystem),
    })),
    nextCursor: rows.length > q.limit ? String(page[page.length - 1]!.id) : null,
  };
}
