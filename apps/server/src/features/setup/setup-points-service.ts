/**
 * Measurement points of the plant setup: create, change (tag unique per site, bearing of its
 * own machine) and delete (only without recorded data). Ingest's point cache is cleared after
 * each change so gateways reach the new tags at once.
 */

import { isDuplicateKey } from '@turnstone/db/errors';

import type { Db } from '@turnstone/db/client';
import { points } from '@turnstone/db/schema';
import type { PointInput } from '@turnstone/contracts/setup';
import { notFound } from '../../lib/app-error.ts';
import { canSeeSite, type SessionUser } from '../../lib/session-user.ts';
import { forgetPointTags } from '../ingest/ingest-service.ts';
import { pointWithPlace } from '../places/places-repository.ts';
import * as repo from './setup-repository.ts';
import { POINT_FIELDS, pick } from './setup-columns.ts';

import { conflict, invalid, keepData, siteForbidden } from './setup-service.ts';
import { auditAction } from '../audit/audit-repository.ts';

/** Checks a point's input; answers the site of its machine, which the point takes (siteId). */
async function checkPointInput(
  db: Db,
  user: SessionUser,
  input: PointInput,
  exceptId = 0,
): Promise<number> {
  const m = await repo.machineById(db, input.machineId);
  if (!m) throw invalid('machineId', 'That machine does not exist.');
  if (!canSeeSite(user, m.siteId)) throw siteForbidden();
  if (input.bearingId !== null) {
    const own = await repo.bearingsOf(db, input.machineId);
    if (!own.some((b) => b.id === input.bearingId))
      throw invalid('bearingId', 'Choose a bearing of this machine.');
  }
  // Tags are unique per site: another site's tags are neither checked nor revealed.
  if (await repo.pointByTag(db, m.siteId, input.tag, exceptId)) throw tagTaken(input.tag);
  return m.siteId;
}

const tagTaken = (tag: string) =>
  conflict('tag', `Tag ${tag} is already used by another point of this site.`);

const pointColumns = (input: PointInput) => ({
  ...pick(input, POINT_FIELDS),
  envelopeLoHz: input.envelopeLoHz ?? null,
  envelopeHiHz: input.envelopeHiHz ?? null,
});

export async function createPoint(db: Db, user: SessionUser, input: PointInput) {
  const siteId = await checkPointInput(db, user, input);
  try {
    const created = await db.transaction(async (tx) => {
      const row = { id: await repo.insertRow(tx, points, { ...pointColumns(input), siteId }) };
      await auditAction(tx, user, 'point.create', row!.id, { after: input });
      return { id: row!.id };
    });
    forgetPointTags();
    return created;
  } catch (err) {
    if (isDuplicateKey(err)) throw tagTaken(input.tag);
    throw err;
  }
}

export async function updatePoint(db: Db, user: SessionUser, id: number, input: PointInput) {
  const row = await pointWithPlace(db, id);
  if (!row) throw notFound('Point');
  if (!canSeeSite(user, row.siteId)) throw siteForbidden();
  const siteId = await checkPointInput(db, user, input, id);
  try {
    await db.transaction(async (tx) => {
      await repo.updateRow(tx, points, id, { ...pointColumns(input), siteId });
      await auditAction(tx, user, 'point.update', id, {
        before: pointColumns({ ...row.point, bearingId: row.point.bearingId }),
        after: input,
      });
    });
    forgetPointTags();
  } catch (err) {
    if (isDuplicateKey(err)) throw tagTaken(input.tag);
    throw err;
  }
  return { id };
}

export async function deletePoint(db: Db, user: SessionUser, id: number) {
  const row = await pointWithPlace(db, id);
  if (!row) throw notFound('Point');
  if (!canSeeSite(user, row.siteId)) throw siteForbidden();
  await db.transaction(async (tx) => {
    await repo.lockPoints(tx, [id]);
    if ((await repo.dataCount(tx, [id])) > 0) throw keepData('point');
    await repo.deletePoints(tx, [id]);
    await auditAction(tx, user, 'point.delete', id, {
      siteId: row.siteId,
      before: pointColumns(row.point),
    });
  });
  forgetPointTags();
}
