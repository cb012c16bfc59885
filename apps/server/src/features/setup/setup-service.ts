/**
 * Plant setup: the machine tree and its engineering data. Every change and its audit row
 * commit in one transaction. Engineers may change machines and points of their own sites;
 * sites and areas are the administrator's.
 */
import type { Tx } from '@turnstone/db/client';
import { isDuplicateKey } from '@turnstone/db/errors';

import type { Db } from '@turnstone/db/client';
import { areas, bearings, gears, machines, sites } from '@turnstone/db/schema';
import type {
  AreaInput,
  BearingInput,
  GearInput,
  MachineInput,
  SetupTree,
  SiteInput,
} from '@turnstone/contracts/setup';
import { AppError, forbidden, notFound } from '../../lib/app-error.ts';
import { canSeeSite, type SessionUser } from '../../lib/session-user.ts';
import { auditAction } from '../audit/audit-repository.ts';
import { forgetPointTags } from '../ingest/ingest-service.ts';
import { resumMachineDays, resumSiteDays } from '../analysis/band-day-sums.ts';
import * as repo from './setup-repository.ts';
import { MACHINE_FIELDS, POINT_FIELDS, pick } from './setup-columns.ts';

export const conflict = (path: string, message: string) =>
  new AppError('conflict', message, 409, [{ path, message }]);
export const invalid = (path: string, message: string) =>
  new AppError('validation_failed', `Invalid request: ${path}: ${message}`, 400, [
    { path, message },
  ]);
export const siteForbidden = () => forbidden('This belongs to a site you are not assigned to.');

export async function setupTree(db: Db, user: SessionUser): Promise<SetupTree> {
  const siteRows = await repo.listSites(db, user.siteIds);
  const areaRows = await repo.listAreas(
    db,
    siteRows.map((s) => s.id),
  );
  const machineRows = await repo.listMachines(
    db,
    areaRows.map((a) => a.id),
  );
  const { bearingRows, gearRows, pointRows } = await repo.componentsOf(
    db,
    machineRows.map((m) => m.id),
  );
  return {
    sites: siteRows.map((s) => ({ id: s.id, name: s.name, code: s.code, timeZone: s.timeZone })),
    areas: areaRows.map((a) => ({ id: a.id, siteId: a.siteId, name: a.name })),
    machines: machineRows.map((m) => ({
      id: m.id,
      areaId: m.areaId,
      ...pick(m, MACHINE_FIELDS),
      lineHz: m.lineHz,
      notes: m.notes,
      bearings: bearingRows
        .filter((b) => b.machineId === m.id)
        .map(({ machineId: _m, ...b }) => ({ ...b, designation: b.designation ?? null })),
      gears: gearRows.filter((g) => g.machineId === m.id).map(({ machineId: _m, ...g }) => g),
      points: pointRows
        .filter((p) => p.machineId === m.id)
        .map((p) => ({
          id: p.id,
          ...pick(p, POINT_FIELDS),
          envelopeLoHz: p.envelopeLoHz,
          envelopeHiHz: p.envelopeHiHz,
        })),
    })),
  };
}

// ---------------------------------------------------------------- sites and areas

export async function createSite(db: Db, user: SessionUser, input: SiteInput) {
  if (await repo.siteByCode(db, input.code))
    throw conflict('code', `A site with code ${input.code} already exists.`);
  try {
    return await db.transaction(async (tx) => {
      const row = { id: await repo.insertRow(tx, sites, input) };
      await auditAction(tx, user, 'site.create', row!.id, { after: input });
      return { id: row!.id, ...input };
    });
  } catch (err) {
    if (isDuplicateKey(err))
      throw conflict('code', `A site with code ${input.code} already exists.`);
    throw err;
  }
}

export async function updateSite(db: Db, user: SessionUser, id: number, input: SiteInput) {
  const before = await repo.siteById(db, id);
  if (!before) throw notFound('Site');
  if (await repo.siteByCode(db, input.code, id))
    throw conflict('code', `A site with code ${input.code} already exists.`);
  await db.transaction(async (tx) => {
    await repo.updateRow(tx, sites, id, input);
    // Band values are summed by the site's local day: a new zone moves the days.
    if (input.timeZone !== undefined && input.timeZone !== before.timeZone)
      await resumSiteDays(tx, id, input.timeZone);
    await auditAction(tx, user, 'site.update', id, {
      before: { name: before.name, code: before.code, timeZone: before.timeZone },
      after: input,
    });
  });
  return { id, ...input };
}

export async function createArea(db: Db, user: SessionUser, input: AreaInput) {
  if (!(await repo.siteById(db, input.siteId)))
    throw invalid('siteId', 'That site does not exist.');
  if (await repo.areaByName(db, input.siteId, input.name))
    throw conflict('name', `This site already has an area named "${input.name}".`);
  return db.transaction(async (tx) => {
    const row = { id: await repo.insertRow(tx, areas, input) };
    await auditAction(tx, user, 'area.create', row!.id, { after: input });
    return { id: row!.id, ...input };
  });
}

export async function updateArea(db: Db, user: SessionUser, id: number, input: { name: string }) {
  const before = await repo.areaById(db, id);
  if (!before) throw notFound('Area');
  if (await repo.areaByName(db, before.siteId, input.name, id))
    throw conflict('name', `This site already has an area named "${input.name}".`);
  await db.transaction(async (tx) => {
    await repo.updateRow(tx, areas, id, { name: input.name });
    await auditAction(tx, user, 'area.update', id, {
      before: { name: before.name },
      after: { name: input.name },
    });
  });
  return { id, siteId: before.siteId, name: input.name };
}

// ---------------------------------------------------------------- machines

async function areaForUser(db: Db, user: SessionUser, areaId: number) {
  const area = await repo.areaById(db, areaId);
  if (!area) throw invalid('areaId', 'That area does not exist.');
  if (!canSeeSite(user, area.siteId)) throw siteForbidden();
  return area;
}

async function machineForUser(db: Db, user: SessionUser, id: number) {
  const row = await repo.machineById(db, id);
  if (!row) throw notFound('Machine');
  if (!canSeeSite(user, row.siteId)) throw siteForbidden();
  return row;
}

const machineColumns = (input: MachineInput) => ({
  areaId: input.areaId,
  ...pick(input, MACHINE_FIELDS),
  // Left out (an older client's edit): the stored supply frequency stays.
  ...(input.lineHz !== undefined ? { lineHz: input.lineHz } : {}),
  notes: input.notes ?? null,
});

const bearingColumns = (b: BearingInput) => ({
  name: b.name,
  designation: b.designation ?? null,
  rollingElements: b.rollingElements,
  ballDiameterMm: b.ballDiameterMm,
  pitchDiameterMm: b.pitchDiameterMm,
  contactAngleDeg: b.contactAngleDeg,
  speedRatio: b.speedRatio,
});
const gearColumns = (g: GearInput) => ({
  name: g.name,
  teeth: g.teeth,
  mateTeeth: g.mateTeeth,
  speedRatio: g.speedRatio,
});

/**
 * Replaces the machine's bearings and gears with the lists given: items with an id of this
 * machine are updated in place (so points keep their bearing), the rest inserted, and
 * those left out deleted.
 */
async function replaceComponents(tx: Tx, machineId: number, input: MachineInput) {
  const [oldBearings, oldGears] = await Promise.all([
    repo.bearingsOf(tx, machineId),
    repo.gearsOf(tx, machineId),
  ]);
  const oldBearingIds = new Set(oldBearings.map((b) => b.id));
  const oldGearIds = new Set(oldGears.map((g) => g.id));
  input.bearings.forEach((b, i) => {
    if (b.id !== undefined && !oldBearingIds.has(b.id))
      throw invalid(`bearings.${i}.id`, 'That bearing belongs to another machine.');
  });
  input.gears.forEach((g, i) => {
    if (g.id !== undefined && !oldGearIds.has(g.id))
      throw invalid(`gears.${i}.id`, 'That gear belongs to another machine.');
  });
  const keepB = new Set(input.bearings.flatMap((b) => (b.id ? [b.id] : [])));
  const keepG = new Set(input.gears.flatMap((g) => (g.id ? [g.id] : [])));
  for (const b of oldBearings) if (!keepB.has(b.id)) await repo.deleteRow(tx, bearings, b.id);
  for (const g of oldGears) if (!keepG.has(g.id)) await repo.deleteRow(tx, gears, g.id);
  for (const b of input.bearings) {
    if (b.id) await repo.updateRow(tx, bearings, b.id, bearingColumns(b));
    else await repo.insertRow(tx, bearings, { machineId, ...bearingColumns(b) });
  }
  for (const g of input.gears) {
    if (g.id) await repo.updateRow(tx, gears, g.id, gearColumns(g));
    else await repo.insertRow(tx, gears, { machineId, ...gearColumns(g) });
  }
  return { before: { bearings: oldBearings, gears: oldGears } };
}

export async function createMachine(db: Db, user: SessionUser, input: MachineInput) {
  await areaForUser(db, user, input.areaId);
  if (await repo.machineByName(db, input.areaId, input.name))
    throw conflict('name', `This area already has a machine named "${input.name}".`);
  const id = await db.transaction(async (tx) => {
    const row = { id: await repo.insertRow(tx, machines, machineColumns(input)) };
    await replaceComponents(tx, row!.id, input);
    await auditAction(tx, user, 'machine.create', row!.id, { after: input });
    return row!.id;
  });
  return { id };
}

/**
 * A machine moving to an area of another site takes its points along; their tags must be
 * free at that site (tags are unique per site). The user may see both sites.
 */
async function checkTagsFreeAt(db: Db | Tx, machineId: number, siteId: number) {
  const tags = (await repo.pointsOf(db, machineId)).map((p) => p.tag);
  const taken = await repo.tagsTakenAtSite(db, siteId, tags, machineId);
  if (taken.length > 0)
    throw conflict(
      'areaId',
      `The site of that area already has points tagged ${taken.join(', ')}; rename this machine's points before moving it there.`,
    );
}

export async function updateMachine(db: Db, user: SessionUser, id: number, input: MachineInput) {
  const { machine: before, siteId: fromSiteId } = await machineForUser(db, user, id);
  const area = await areaForUser(db, user, input.areaId);
  if (await repo.machineByName(db, input.areaId, input.name, id))
    throw conflict('name', `This area already has a machine named "${input.name}".`);
  const movesSite = area.siteId !== fromSiteId;
  if (movesSite) await checkTagsFreeAt(db, id, area.siteId);
  await db.transaction(async (tx) => {
    await repo.updateRow(tx, machines, id, machineColumns(input));
    if (movesSite) {
      // A point tagged in between: the unique index refuses it; answer as above.
      try {
        await repo.movePointsToSite(tx, id, area.siteId);
      } catch (err) {
        if (isDuplicateKey(err)) await checkTagsFreeAt(tx, id, area.siteId);
        throw err;
      }
      const to = await repo.siteById(tx, area.siteId);
      if (to) await resumMachineDays(tx, id, to.timeZone);
    }
    const old = await replaceComponents(tx, id, input);
    await auditAction(tx, user, 'machine.update', id, {
      before: { ...before, ...old.before },
      after: input,
    });
  });
  if (movesSite) forgetPointTags();
  return { id };
}

export const keepData = (what: string) =>
  new AppError(
    'has_data',
    `This ${what} has recorded data (snapshots, analyses, alerts or findings), so it cannot be deleted. Rename it instead, e.g. add "(retired)".`,
    409,
  );

/** Deletes a machine and its points, only when none of them has recorded data. */
export async function deleteMachine(db: Db, user: SessionUser, id: number) {
  const found = await repo.machineById(db, id);
  if (!found) throw notFound('Machine');
  if (!canSeeSite(user, found.siteId)) throw siteForbidden();
  const before = found.machine;
  await db.transaction(async (tx) => {
    // Locked first, so the count below sees every capture committed before the lock.
    await repo.lockPointsOfMachine(tx, id);
    const pts = await repo.pointsOf(tx, id);
    if (
      (await repo.dataCount(
        tx,
        pts.map((p) => p.id),
      )) > 0
    )
      throw keepData('machine');
    await repo.deletePoints(
      tx,
      pts.map((p) => p.id),
    );
    await repo.deleteRow(tx, machines, id);
    await auditAction(tx, user, 'machine.delete', id, {
      siteId: found.siteId,
      before: { ...before, points: pts.map((p) => p.tag) },
    });
  });
  forgetPointTags();
}
