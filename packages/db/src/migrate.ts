/**
 * The committed migrations (drizzle-kit generate), applied in order, each once, inside a
 * safe procedure: one process at a time (a named lock), never on a database that a newer
 * Turnstone has migrated, and with a hook that runs first (a backup) when a pending
 * migration is destructive.
 */
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { migrate } from 'drizzle-orm/mysql2/migrator';
import type { Pool, RowDataPacket } from 'mysql2/promise';
import type { DbHandle } from './client.ts';

export const migrationsFolder = fileURLToPath(new URL('../migrations', import.meta.url));
/** drizzle's own record of applied migrations: one row per migration (hash, journal time). */
export const MIGRATIONS_TABLE = '__drizzle_migrations';
const LOCK_NAME = 'turnstone.migrations';
/**
 * The oldest database a newer Turnstone upgrades: one made by the migrations up to this
 * one. tests/api/migrations.test.ts builds such a database, fills it and upgrades it.
 */
export const OLDEST_SUPPORTED = '0000_init';

export interface Migration {
  /** The file name without `.sql`, e.g. `0002_audit-site`. */
  tag: string;
  /** The journal's time of the migration; drizzle stores it as `created_at`. */
  when: number;
  /** sha256 of the file, as drizzle stores it. */
  hash: string;
  statements: string[];
  /** The statements that are not purely additive (empty: the migration only adds). */
  destructive: string[];
}

/** The migrations this code carries, oldest first (the journal's order). */
export function codeMigrations(folder = migrationsFolder): Migration[] {
  const journal = JSON.parse(readFileSync(join(folder, 'meta', '_journal.json'), 'utf8')) as {
    entries: Array<{ tag: string; when: number }>;
  };
  return journal.entries.map(({ tag, when }) => {
    const text = readFileSync(join(folder, `${tag}.sql`), 'utf8');
    const statements = text
      .split('--> statement-breakpoint')
      .map((s) => s.trim())
      .filter((s) => stripComments(s) !== '');
    return {
      tag,
      when,
      hash: createHash('sha256').update(text).digest('hex'),
      statements,
      destructive: statements.filter((s) => !isAdditive(s)),
    };
  });
}

function stripComments(sql: string): string {
  return sql
    .replace(/\/\*[\s\S]*?\*\//g, ' ')
    .replace(/^\s*--.*$/gm, ' ')
    .trim();
}

/**
 * Whether a migration statement only adds (a table, an index, a column, rows) or drops an
 * index, and so can lose nothing already stored. Decided from the SQL itself, so no one has to remember to
 * mark a migration: anything not recognised as additive — DROP, RENAME, MODIFY/CHANGE of a
 * column, UPDATE, DELETE, TRUNCATE, or any statement of another form — counts as
 * destructive, and the product backs the database up before applying it.
 */
export function isAdditive(statement: string): boolean {
  const sql = stripComments(statement);
  // Identifiers and strings may contain any word ("dropped_at"); judge the keywords only.
  const bare = sql
    .replace(/`(?:[^`]|``)*`/g, '`x`')
    .replace(/'(?:[^'\\]|\\.|'')*'/g, "''")
    .replace(/\s+/g, ' ');
  if (/;\s*\S/.test(bare)) return false; // several statements in one: judge none of them as safe
  if (/^CREATE TABLE (IF NOT EXISTS )?`x`/i.test(bare)) return true;
  if (/^CREATE (UNIQUE )?INDEX /i.test(bare)) return true;
  // An index holds no data of its own (it is rebuilt from the rows).
  if (
    /^DROP INDEX `x` ON `x`;?$/i.test(bare) ||
    /^ALTER TABLE `x` DROP (INDEX|KEY) `x`;?$/i.test(bare)
  )
    return true;
  // An index rebuilt in one statement (dropped and added again, so the table is never
  // without it): index clauses only.
  const id = '`x`';
  const clause = `(DROP (INDEX|KEY) ${id}|ADD (UNIQUE )?(INDEX|KEY) ${id} ?\\(${id}( ?, ?${id})*\\))`;
  if (new RegExp(`^ALTER TABLE ${id} ${clause}(, ?${clause})*;?$`, 'i').test(bare)) return true;
  if (/^INSERT (IGNORE )?INTO /i.test(bare)) return !/\bON DUPLICATE KEY\b/i.test(bare);
  if (/^ALTER TABLE `x` ADD /i.test(bare))
    return !/\b(DROP|MODIFY|CHANGE|RENAME|ALTER COLUMN|ORDER BY|CONVERT|ENGINE)\b/i.test(bare);
  return false;
}

export interface MigrationState {
  /** Migrations applied to the database (drizzle's table), oldest first. */
  applied: Array<{ hash: string; createdAt: number }>;
  /** The code's migrations not yet applied, oldest first. */
  pending: Migration[];
  /** Applied migrations this code does not know: the database is newer than the code. */
  unknown: Array<{ hash: string; createdAt: number }>;
  /** The last applied migration's tag, when the code knows it. */
  levelTag: string | null;
}

export async function migrationState(pool: Pool, code = codeMigrations()): Promise<MigrationState> {
  const [tables] = await pool.query<RowDataPacket[]>(
    'SELECT 1 FROM information_schema.tables WHERE table_schema = DATABASE() AND table_name = ?',
    [MIGRATIONS_TABLE],
  );
  let applied: MigrationState['applied'] = [];
  if (tables.length > 0) {
    const [rows] = await pool.query<RowDataPacket[]>(
      `SELECT hash, created_at FROM \`${MIGRATIONS_TABLE}\` ORDER BY created_at, id`,
    );
    applied = rows.map((r) => ({ hash: String(r.hash), createdAt: Number(r.created_at) }));
  }
  const known = new Set(code.map((m) => m.when));
  const unknown = applied.filter((a) => !known.has(a.createdAt));
  const last = applied.at(-1)?.createdAt ?? -Infinity;
  return {
    applied,
    unknown,
    pending: code.filter((m) => m.when > last),
    levelTag: code.find((m) => m.when === applied.at(-1)?.createdAt)?.tag ?? null,
  };
}

/** The database was migrated by a newer Turnstone than this code. */
export class DatabaseNewerError extends Error {
  constructor(state: MigrationState, code: Migration[]) {
    super(
      `The database has ${state.unknown.length} migration(s) this Turnstone does not know ` +
        `(it is at migration level ${state.applied.length}; this code knows ` +
        `${code.length}, up to ${code.at(-1)?.tag ?? 'none'}). A newer Turnstone has ` +
        'upgraded it. Run that newer version, or restore a backup made before the upgrade ' +
        '(npm run restore). Nothing was changed.',
    );
    this.name = 'DatabaseNewerError';
  }
}

/** Stops with DatabaseNewerError when the database is newer than the code. */
export async function assertNotNewer(pool: Pool): Promise<MigrationState> {
  const code = codeMigrations();
  const state = await migrationState(pool, code);
  if (state.unknown.length > 0) throw new DatabaseNewerError(state, code);
  return state;
}

export interface RunMigrationsOptions {
  /**
   * Runs before any pending destructive migration is applied to a database that already
   * holds data (a backup); if it throws, nothing is migrated.
   */
  beforeDestructive?: (pending: Migration[], state: MigrationState) => Promise<void>;
  log?: (m: string) => void;
}

/**
 * Applies the pending migrations: under a named lock (several processes starting at once
 * migrate once), refusing a database newer than the code, and calling `beforeDestructive`
 * first when a pending migration is destructive.
 */
export async function runMigrations(
  handle: Pick<DbHandle, 'db' | 'pool'>,
  options: RunMigrationsOptions = {},
): Promise<MigrationState> {
  const lock = await handle.pool.getConnection();
  try {
    const [[got]] = await lock.query<RowDataPacket[]>('SELECT GET_LOCK(?, 600) AS got', [
      LOCK_NAME,
    ]);
    if (Number(got?.got) !== 1)
      throw new Error('Another Turnstone process has been migrating this database for 10 min.');
    try {
      const code = codeMigrations();
      const state = await migrationState(handle.pool, code);
      if (state.unknown.length > 0) throw new DatabaseNewerError(state, code);
      if (state.pending.length === 0) return state;
      const destructive = state.pending.filter((m) => m.destructive.length > 0);
      if (destructive.length > 0 && state.applied.length > 0 && options.beforeDestructive)
        await options.beforeDestructive(state.pending, state);
      options.log?.(
        `Applying ${state.pending.length} migration(s): ${state.pending.map((m) => m.tag).join(', ')}.`,
      );
      await migrate(handle.db, { migrationsFolder });
      return await migrationState(handle.pool, code);
    } finally {
      await lock.query('SELECT RELEASE_LOCK(?)', [LOCK_NAME]).catch(() => {});
    }
  } finally {
    lock.release();
  }
}
