import { z } from 'zod';
import { sinceSchema } from './paging.ts';

/** Filters of `GET /api/v1/audit`; every one optional. Times are ISO 8601 with an offset. */
export const auditQuerySchema = z.object({
  entity: z.string().trim().max(32).optional(),
  entityId: z.string().trim().max(64).optional(),
  /** User id of the actor. */
  actor: z.coerce.number().int().positive().optional(),
  /** Exact action (`gateway.create`) or a prefix ending in a dot (`gateway.`). */
  action: z.string().trim().max(64).optional(),
  from: z.iso.datetime({ offset: true }).optional(),
  /**
   * Entries written at or after this instant (as `from`; the name the other lists an
   * integrator pulls use). With `cursor`, a pull walks every entry since the last pull.
   */
  since: sinceSchema.optional(),
  to: z.iso.datetime({ offset: true }).optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
  /** Opaque: the `nextCursor` of the previous page. */
  // An id: at most 15 digits stays an exact JavaScript number (no Infinity in the query).
  cursor: z
    .string()
    .regex(/^\d{1,15}$/, 'cursor is the nextCursor of the previous page')
    .optional(),
});
export type AuditQuery = z.input<typeof auditQuerySchema>;

export const auditEntrySchema = z.object({
  id: z.number().int(),
  at: z.string(),
  actorUserId: z.number().int().nullable(),
  /** Null for the system (worker) or a deleted user. */
  actorName: z.string().nullable(),
  action: z.string(),
  entity: z.string(),
  entityId: z.string(),
  /** What people call the entity ("MFP-P101-MDE-H · Intake pump P-101"); null once deleted. */
  entityLabel: z.string().nullable(),
  /** The change in plain lines: field, old → new (limit sets compared band by band). */
  changes: z.array(
    z.object({ field: z.string(), before: z.string().nullable(), after: z.string().nullable() }),
  ),
  before: z.unknown(),
  after: z.unknown(),
  reason: z.string().nullable(),
});
export type AuditEntry = z.infer<typeof auditEntrySchema>;

export const auditPageSchema = z.object({
  items: z.array(auditEntrySchema),
  nextCursor: z.string().nullable(),
});
export type AuditPage = z.infer<typeof auditPageSchema>;
