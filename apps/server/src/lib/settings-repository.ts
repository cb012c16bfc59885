/** The `settings` table: one JSON value a key, for process-wide facts kept in the database. */
import { eq } from 'drizzle-orm';
import type { Db } from '@turnstone/db/client';
import { settings } from '@turnstone/db/schema';

/** Writes `value` under `key`, over any earlier one. */
export async function putSetting(db: Db, key: string, value: unknown): Promise<void> {
  const now = new Date();
  await db
    .insert(settings)
    .values({ key, value, updatedAt: now })
    .onDuplicateKeyUpdate({ set: { value, updatedAt: now } });
}

/** Writes `value` under `key` unless the key has one; true when this call wrote it. */
export async function addSettingIfAbsent(db: Db, key: string, value: unknown): Promise<boolean> {
  const [res] = await db.insert(settings).ignore().values({ key, value, updatedAt: new Date() });
  return (res as { affectedRows?: number }).affectedRows === 1;
}

/** The value under `key`, or undefined. */
export async function readSetting(db: Db, key: string): Promise<unknown> {
  const [row] = await db.select().from(settings).where(eq(settings.key, key)).limit(1);
  return row?.value;
}
