import { and, asc, desc, eq, gte, inArray, lt, lte, ne, sql, type SQL } from 'drizzle-orm';
import type { CursorPosition } from '../../lib/cursor.ts';
import type { Db, Tx } from '@turnstone/db/client';
import { alerts, findings, machines, points, sites, users } from '@turnstone/db/schema';
import { afterPosition } from '../../lib/cursor.ts';
import { withPlaceAndSite } from '../places/places-repository.ts';

export type FindingRow = typeof findings.$inferSelect;

const listColumns = {
  finding: findings,
  pointTag: points.tag,
  pointName: points.name,
  machineName: machines.name,
  siteId: sites.id,
  siteCode: sites.code,
  createdByName: users.name,
};
export type FindingListRow = {
  finding: FindingRow;
  pointTag: string;
  pointName: string;
  machineName: string;
  siteId: number;
  siteCode: string;
  createdByName: string;
};

export interface FindingFilter {
  siteIds: number[];
  state?: FindingRow['state'];
  pointId?: number;
  /** Findings on the points of this machine. */
  machineId?: number;
  /** Open or planned (not done). */
  notDone?: boolean;
  ids?: number[];
  /** Not done and due on or before this date (YYYY-MM-DD). */
  dueBy?: string;
  /** Due within these dates (YYYY-MM-DD, both inclusive). */
  dueWithin?: { from: string; to: string };
  /** Created at or after `from` and before `to`. */
  createdWithin?: { from: Date; to: Date };
  /** updatedAt at or after. */
  since?: Date;
  /** Rows after this (updatedAt, id) in the list's descending order. */
  after?: CursorPosition;
  /** At most this many rows (1000 unless said). */
  limit?: number;
}

/**
 * Findings on points of the given sites, last changed first by (updatedAt, id), or by due date for
 * `dueBy`.
 */
export async function listFindings(db: Db | Tx, f: FindingFilter): Promise<FindingListRow[]> {
  if (f.siteIds.length === 0) return [];
  const where: SQL[] = [inArray(sites.id, f.siteIds)];
  if (f.state) where.push(eq(findings.state, f.state));
  if (f.pointId !== undefined) where.push(eq(findings.pointId, f.pointId));
  if (f.machineId !== undefined) where.push(eq(points.machineId, f.machineId));
  if (f.notDone) where.push(ne(findings.state, 'done'));
  if (f.ids) where.push(inArray(findings.id, f.ids.length ? f.ids : [0]));
  if (f.dueBy) where.push(ne(findings.state, 'done'), lte(findings.dueDate, f.dueBy));
  if (f.dueWithin)
    where.push(gte(findings.dueDate, f.dueWithin.from), lte(findings.dueDate, f.dueWithin.to));
  if (f.createdWithin)
    where.push(
      gte(findings.createdAt, f.createdWithin.from),
      lt(findings.createdAt, f.createdWithin.to),
    );
  if (f.since) where.push(gte(findings.updatedAt, f.since));
  if (f.after) where.push(afterPosition(findings.updatedAt, findings.id, f.after));
  return withPlaceAndSite(
    db
      .select(listColumns)
      .from(findings)
      .innerJoin(points, eq(points.id, findings.pointId))
      .$dynamic(),
  )
    .innerJoin(users, eq(users.id, findings.createdBy))
    .where(and(...where))
    .orderBy(
      ...(f.dueBy
        ? [asc(findings.dueDate), asc(findings.id)]
        : [desc(findings.updatedAt), desc(findings.id)]),
    )
    .limit(f.limit ?? 1000);
}

export async function insertFinding(tx: Tx, values: typeof findings.$inferInsert) {
  const [row] = await tx.insert(findings).values(values).$returningId();
  return row!.id;
}

export async function lockFinding(tx: Tx, id: number): Promise<FindingRow | undefined> {
  const [row] = await tx.select().from(findings).where(eq(findings.id, id)).for('update');
  return row;
}

export async function updateFinding(
  tx: Tx,
  id: number,
  set: Partial<
    Pick<
      FindingRow,
      | 'state'
      | 'title'
      | 'workOrderRef'
      | 'dueDate'
      | 'note'
      | 'priority'
      | 'owner'
      | 'plannedDowntimeHours'
    >
  >,
) {
  await tx
    .update(findings)
    .set({ ...set, updatedAt: sql`CURRENT_TIMESTAMP(3)` })
    .where(eq(findings.id, id));
}

export async function alertOfPoint(db: Db | Tx, alertId: number) {
  const [row] = await db
    .select({ id: alerts.id, pointId: alerts.pointId, bandKey: alerts.bandKey })
    .from(alerts)
    .where(eq(alerts.id, alertId));
  return row;
}
