/** Per-site access to a point, checked by every service that reads or changes one. */
import type { Db } from '@turnstone/db/client';
import { forbidden, notFound } from '../../lib/app-error.ts';
import { canSeeSite, type SessionUser } from '../../lib/session-user.ts';
import { pointWithPlace } from './places-repository.ts';

/** The point, if it exists and the user may see its site: 404 / 403 otherwise. */
export async function accessiblePoint(db: Db, user: SessionUser, pointId: number) {
  const row = await pointWithPlace(db, pointId);
  if (!row) throw notFound('Point');
  if (!canSeeSite(user, row.siteId))
    throw forbidden('This point belongs to a site you are not assigned to.');
  return row;
}
