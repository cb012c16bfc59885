import { eq, sql } from 'drizzle-orm';
import type { Db } from '@turnstone/db/client';
import { areas, gateways, jobs, machines, points, snapshots } from '@turnstone/db/schema';

export async function gatewayByPrefix(db: Db, prefix: string) {
  const [g] = await db.select().from(gateways).where(eq(gateways.keyPrefix, prefix)).limit(1);
  return g;
}

export async function touchGateway(db: Db, id: number): Promise<void> {
  await db.update(gateways).set({ lastSeenAt: new Date() }).where(eq(gateways.id, id));
}

export async function pointByTag(db: Db, tag: string) {
  const [p] = await db
    .select({ id: points.id, siteId: areas.siteId })
    .from(points)
    .innerJoin(machines, eq(machines.id, points.machineId))
    .innerJoin(areas, eq(areas.id, machines.areaId))
    .where(eq(points.tag, tag))
    .limit(1);
  return p;
}

export async function snapshotByUid(db: Db, uid: string) {
  const [s] = await db
    .select({ id: snapshots.id, contentHash: snapshots.contentHash })
    .from(snapshots)
    .where(eq(snapshots.uid, uid))
    .limit(1);
  return s;
}

export type NewSnapshot = typeof snapshots.$inferInsert;

/** The snapshot and its analysis job, in one transaction: both or neither. */
export async function insertSnapshotWithJob(db: Db, row: NewSnapshot): Promise<number> {
  return db.transaction(async (tx) => {
    const [s] = await tx.insert(snapshots).values(row).$returningId();
    await tx.insert(jobs).values({
      kind: 'analyze',
      snapshotId: s!.id,
      payload: {},
      runAfter: sql`CURRENT_TIMESTAMP(3)`,
    });
    return s!.id;
  });
}
