/**
 * Limit sets and their bands: a point's own set, and a machine type's template (a set with
 * no point). Both are saved the same way: the set row is locked, its version goes up by one
 * and its bands are replaced, in the caller's transaction.
 */
import { and, asc, eq, inArray, isNotNull, isNull, type SQL } from 'drizzle-orm';
import type { Db, Tx } from '@turnstone/db/client';
import { bands, limitSets } from '@turnstone/db/schema';
import type { BandDefinition as LimitBand } from '@turnstone/condition';

export type MachineType = (typeof limitSets.$inferSelect)['machineType'] & string;

export interface StoredLimitSet {
  id: number;
  version: number;
  name: string;
  bands: LimitBand[];
}

async function bandsOf(db: Db | Tx, limitSetIds: number[]) {
  return db
    .select()
    .from(bands)
    .where(inArray(bands.limitSetId, limitSetIds))
    .orderBy(asc(bands.sortOrder), asc(bands.id));
}

const definitionOf = (r: typeof bands.$inferSelect) => r.definition as unknown as LimitBand;

export async function loadLimitSet(
  db: Db | Tx,
  pointId: number,
): Promise<StoredLimitSet | undefined> {
  return (await loadLimitSets(db, [pointId])).get(pointId);
}

/** The limit sets of several points (two statements), by point id; points without one are absent. */
export async function loadLimitSets(
  db: Db | Tx,
  pointIds: number[],
): Promise<Map<number, StoredLimitSet>> {
  const out = new Map<number, StoredLimitSet>();
  if (pointIds.length === 0) return out;
  const sets = await db.select().from(limitSets).where(inArray(limitSets.pointId, pointIds));
  if (sets.length === 0) return out;
  const rows = await bandsOf(
    db,
    sets.map((s) => s.id),
  );
  for (const set of sets)
    out.set(set.pointId!, {
      id: set.id,
      version: set.version,
      name: set.name,
      bands: rows.filter((r) => r.limitSetId === set.id).map(definitionOf),
    });
  return out;
}

/** The points that have a limit set of their own. */
export async function pointsWithLimitSets(db: Db): Promise<number[]> {
  const rows = await db
    .select({ pointId: limitSets.pointId })
    .from(limitSets)
    .where(isNotNull(limitSets.pointId));
  return rows.map((r) => r.pointId!);
}

/** The version of each point's limit set (one statement; points without a set are absent). */
export async function limitSetVersions(
  db: Db | Tx,
  pointIds: number[],
): Promise<Map<number, number>> {
  if (pointIds.length === 0) return new Map();
  const rows = await db
    .select({ pointId: limitSets.pointId, version: limitSets.version })
    .from(limitSets)
    .where(inArray(limitSets.pointId, pointIds));
  return new Map(rows.map((r) => [r.pointId!, r.version]));
}

/** A machine type's stored template (point_id null), if an engineer saved one. */
export async function loadTemplate(
  db: Db | Tx,
  machineType: MachineType,
): Promise<StoredLimitSet | undefined> {
  const [set] = await db.select().from(limitSets).where(templateOf(machineType));
  if (!set) return undefined;
  const rows = await bandsOf(db, [set.id]);
  return { id: set.id, version: set.version, name: set.name, bands: rows.map(definitionOf) };
}

const templateOf = (machineType: MachineType) =>
  and(eq(limitSets.machineType, machineType), isNull(limitSets.pointId));

/**
 * The one versioned save: locks the set row found by `where`, bumps its version and replaces
 * its bands; or inserts version 1 with `insert` when there is none.
 */
async function saveVersioned(
  tx: Tx,
  where: SQL | undefined,
  insert: Omit<typeof limitSets.$inferInsert, 'version'>,
  list: readonly LimitBand[],
  change: { name?: string; userId: number | null },
): Promise<{ id: number; version: number }> {
  const [existing] = await tx.select().from(limitSets).where(where).for('update');
  let id: number;
  let version: number;
  if (existing) {
    id = existing.id;
    version = existing.version + 1;
    await tx
      .update(limitSets)
      .set({
        ...(change.name !== undefined ? { name: change.name } : {}),
        version,
        updatedBy: change.userId,
        updatedAt: new Date(),
      })
      .where(eq(limitSets.id, id));
    await tx.delete(bands).where(eq(bands.limitSetId, id));
  } else {
    const [row] = await tx
      .insert(limitSets)
      .values({ ...insert, version: 1 })
      .$returningId();
    id = row!.id;
    version = 1;
  }
  await insertBands(tx, id, list);
  return { id, version };
}

/** Writes a point's limit set (replacing its bands) and returns its new version. */
export function saveLimitSet(
  tx: Tx,
  pointId: number,
  name: string,
  list: readonly LimitBand[],
  userId: number | null,
): Promise<{ id: number; version: number }> {
  return saveVersioned(
    tx,
    eq(limitSets.pointId, pointId),
    { pointId, name, updatedBy: userId },
    list,
    { name, userId },
  );
}

/** Writes a machine type's template (replacing its bands) and returns its new version. */
export async function saveTemplate(
  tx: Tx,
  machineType: MachineType,
  list: readonly LimitBand[],
  userId: number,
): Promise<number> {
  const saved = await saveVersioned(
    tx,
    templateOf(machineType),
    { pointId: null, machineType, name: `${machineType} template`, updatedBy: userId },
    list,
    { userId },
  );
  return saved.version;
}

/** The band rows of a limit set, in order: the list columns plus the whole definition. */
async function insertBands(tx: Tx, limitSetId: number, list: readonly LimitBand[]): Promise<void> {
  if (list.length === 0) return;
  await tx.insert(bands).values(
    list.map((b, i) => ({
      limitSetId,
      key: b.key,
      name: b.name,
      kind: b.kind,
      spectrum: b.spectrum,
      unit: b.unit,
      alertLevel: b.alertLevel,
      dangerLevel: b.dangerLevel,
      definition: b as unknown as Record<string, unknown>,
      sortOrder: i,
    })),
  );
}
