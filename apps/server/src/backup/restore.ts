/**
 * Restores a backup (see backup.ts) into an empty data folder — the private server's
 * database is created fresh and loaded from the dump — or into the empty database of
 * DATABASE_URL. Afterwards `npm start` runs as usual, migrating when the backup is older.
 */
import { chmodSync, copyFileSync, existsSync, mkdirSync, readdirSync, renameSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import mysql from 'mysql2/promise';
import { loadDump } from '@turnstone/db/dump';
import { codeMigrations } from '@turnstone/db/migrate';
import { startLocalMariadb, type LocalMariadb } from '@turnstone/db/local-server';
import { DATABASE_FILE, FILES_DIR, readManifest, sha256File, type Manifest } from './backup.ts';

export interface RestoreOptions {
  /** The backup folder (the one holding manifest.json). */
  from: string;
  dataDir: string;
  databaseUrl?: string;
  /**
   * Restore although the data folder (or DATABASE_URL's database) is not empty: the
   * folder is moved aside to `<folder>.replaced-<time>`, the database's tables dropped.
   */
  force?: boolean;
  log?: (m: string) => void;
}

export interface RestoreResult {
  manifest: Manifest;
  rows: Record<string, number>;
  ms: number;
  /** Where a non-empty data folder was moved (with force). */
  movedAside: string | null;
}

function isEmptyDir(dir: string): boolean {
  return !existsSync(dir) || readdirSync(dir).length === 0;
}

export async function restore(options: RestoreOptions): Promise<RestoreResult> {
  const log = options.log ?? (() => {});
  const t0 = Date.now();
  const from = resolve(options.from);
  const dataDir = resolve(options.dataDir);
  const manifest = readManifest(from);

  const code = codeMigrations();
  if (manifest.migrations.level > code.length)
    throw new Error(
      `The backup is at migration level ${manifest.migrations.level} ` +
        `(${manifest.migrations.tag ?? 'unknown'}); this Turnstone knows ${code.length}. ` +
        `Restore it with Turnstone ${manifest.product.version} or newer.`,
    );
  // Checksums first: a damaged backup must not replace anything.
  const dumpFile = join(from, DATABASE_FILE);
  if ((await sha256File(dumpFile)) !== manifest.database.sha256)
    throw new Error(`${dumpFile} does not match the manifest's checksum; the backup is damaged.`);
  for (const f of manifest.files) {
    const path = join(from, FILES_DIR, f.path);
    if (!existsSync(path) || (await sha256File(path)) !== f.sha256)
      throw new Error(`${path} is missing or does not match the manifest; the backup is damaged.`);
  }

  let movedAside: string | null = null;
  if (!isEmptyDir(dataDir)) {
    if (!options.force)
      throw new Error(
        `The data folder ${dataDir} is not empty. Restore into a new or empty folder ` +
          '(DATA_DIR=…), or add --force to move this one aside first.',
      );
    if (existsSync(join(dataDir, 'mariadb', 'url')))
      throw new Error(`Turnstone seems to be running on ${dataDir}; stop it before restoring.`);
    movedAside = `${dataDir}.replaced-${new Date().toISOString().replace(/[-:.]/g, '')}`;
    renameSync(dataDir, movedAside);
    log(`Moved the existing data folder aside to ${movedAside}.`);
  }
  mkdirSync(dataDir, { recursive: true });
  // The data folder's files first: the private server starts with its restored passwords.
  for (const f of manifest.files) {
    const to = join(dataDir, f.path);
    mkdirSync(dirname(to), { recursive: true, mode: 0o700 });
    copyFileSync(join(from, FILES_DIR, f.path), to);
    chmodSync(to, f.mode);
  }

  let local: LocalMariadb | null = null;
  let url = options.databaseUrl;
  try {
    if (!url) {
      local = await startLocalMariadb({ dataDir, log });
      url = local.url;
    }
    await ensureEmptyDatabase(url, Boolean(options.force), log);
    log(`Loading ${DATABASE_FILE} (${(manifest.database.bytes / 1e6).toFixed(1)} MB)…`);
    const loaded = await loadDump(url, dumpFile, { log });
    const counted = await countRows(url, Object.keys(manifest.rows));
    const wrong = Object.entries(manifest.rows).filter(
      ([table, n]) => counted[table] !== n || loaded.rows[table] !== n,
    );
    if (wrong.length > 0)
      throw new Error(
        'The restored database does not hold the rows the backup lists: ' +
          wrong.map(([t, n]) => `${t} ${counted[t]} of ${n}`).join(', '),
      );
    return { manifest, rows: counted, ms: Date.now() - t0, movedAside };
  } finally {
    await local?.stop();
  }
}

async function ensureEmptyDatabase(url: string, force: boolean, log: (m: string) => void) {
  const conn = await mysql.createConnection({ uri: url });
  try {
    const [tables] = await conn.query<mysql.RowDataPacket[]>(
      "SELECT table_name AS t FROM information_schema.tables WHERE table_schema = DATABASE() AND table_type = 'BASE TABLE'",
    );
    if (tables.length === 0) return;
    if (!force)
      throw new Error(
        `The database already holds ${tables.length} tables. Restore into an empty database, ` +
          'or add --force to drop its tables first.',
      );
    log(`Dropping the ${tables.length} tables of the target database (--force)…`);
    await conn.query('SET FOREIGN_KEY_CHECKS = 0');
    for (const { t } of tables) await conn.query(`DROP TABLE \`${String(t).replace(/`/g, '``')}\``);
  } finally {
    await conn.end();
  }
}

async function countRows(url: string, tables: string[]): Promise<Record<string, number>> {
  const conn = await mysql.createConnection({ uri: url });
  try {
    const out: Record<string, number> = {};
    for (const t of tables) {
      const [[row]] = await conn.query<mysql.RowDataPacket[]>(
        `SELECT COUNT(*) AS n FROM \`${t.replace(/`/g, '``')}\``,
      );
      out[t] = Number(row?.n);
    }
    return out;
  } finally {
    await conn.end();
  }
}
