import { eq } from 'drizzle-orm';
import type { Db } from '@turnstone/db/client';
import { areas, machines, points } from '@turnstone/db/schema';
import { forbidden, notFound } from './app-error.ts';
import { canSeeSite, type SessionUser } from './session-user.ts';

/** The point, if it exists and the user may see its site: 404 / 403 otherwise. */
export async function accessiblePoint(db: Db, user: SessionUser, pointId: number) {
  const [row] = await db
    .select({ point: points, machine: machines, siteId: areas.siteId })
    .from(points)
    .innerJoin(machines, eq(machines.id, points.machineId))
    .innerJoin(areas, eq(areas.id, machines.areaId))
    .where(eq(points.id, pointId));
  if (!row) throw notFound('Point');
  if (!canSeeSite(user, row.siteId))
    throw forbidden('This point belongs to a site you are not assigned to.');
  return row;
}
