/** A point with its machine and the site it belongs to (through the machine's area). */
import { eq } from 'drizzle-orm';
import type { Db } from '@turnstone/db/client';
import { areas, machines, points } from '@turnstone/db/schema';

export async function pointWithPlace(db: Db, pointId: number) {
  const [row] = await db
    .select({ point: points, machine: machines, siteId: areas.siteId })
    .from(points)
    .innerJoin(machines, eq(machines.id, points.machineId))
    .innerJoin(areas, eq(areas.id, machines.areaId))
    .where(eq(points.id, pointId));
  return row;
}
