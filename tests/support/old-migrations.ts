/** An older migration set and a database to upgrade, for upgrade tests (tests/api/migrat*.test.ts). */
import { copyFileSync, mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import mysql, { type Pool } from 'mysql2/promise';
import { afterAll, beforeAll } from 'vitest';
import { migrationsFolder } from '@turnstone/db/migrate';
import { freshDatabase, startQuietServer } from './test-server.ts';

const tmp = () => process.env.TURNSTONE_TEST_TMP ?? tmpdir();

/** A migrations folder holding only the journal's entries up to `lastTag`. */
export function migrationsUpTo(lastTag: string): string {
  const dir = mkdtempSync(join(tmp(), 'old-migrations-'));
  mkdirSync(join(dir, 'meta'));
  const journal = JSON.parse(readFileSync(join(migrationsFolder, 'meta', '_journal.json'), 'utf8'));
  const upTo = journal.entries.findIndex((e: { tag: string }) => e.tag === lastTag);
  if (upTo < 0) throw new Error(`no migration ${lastTag}`);
  journal.entries = journal.entries.slice(0, upTo + 1);
  writeFileSync(join(dir, 'meta', '_journal.json'), JSON.stringify(journal));
  for (const e of journal.entries as Array<{ tag: string }>)
    copyFileSync(join(migrationsFolder, `${e.tag}.sql`), join(dir, `${e.tag}.sql`));
  return dir;
}

/**
 * A new, empty database for a describe block: its URL and a pool on it from `beforeAll`, the
 * pool closed after the block.
 */
export function databaseForBlock(): { readonly url: string; readonly pool: Pool } {
  const db = {} as { url: string; pool: Pool };
  beforeAll(async () => {
    db.url = await freshDatabase();
    db.pool = mysql.createPool({ uri: db.url, connectionLimit: 2, timezone: 'Z' });
  });
  afterAll(async () => {
    await db.pool?.end();
  });
  return db;
}

/**
 * Starts the real server (without the demo) over the database at `url`, which migrates it to
 * the code's level, and stops it again; answers the server's data folder (backups are there).
 */
export async function upgradeByStarting(url: string, folderPrefix: string): Promise<string> {
  const dataDir = mkdtempSync(join(tmp(), folderPrefix));
  const srv = await startQuietServer(url, dataDir, { SEED_DEMO: 'false' });
  await srv.stop();
  return dataDir;
}
