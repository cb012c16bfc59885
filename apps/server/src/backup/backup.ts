/**
 * A Turnstone backup is one folder:
 *
 *   manifest.json      product version, migration level, row counts, times, checksums
 *   database.sql.gz    the database, one consistent snapshot (mariadb-dump --single-transaction)
 *   files/…            the data folder's own files: generated secrets, gateway keys, the
 *                      private server's generated passwords, uploads kept as files
 *
 * It is taken while ingest and workers run (no table locks) from the private server or from
 * DATABASE_URL, and restored by `restore.ts` into an empty data folder.
 */
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import {
  copyFileSync,
  createReadStream,
  existsSync,
  lstatSync,
  mkdirSync,
  readdirSync,
  readFileSync,
  renameSync,
  rmSync,
  writeFileSync,
} from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import mysql from 'mysql2/promise';
import { dumpDatabase, parseDatabaseUrl } from '@turnstone/db/dump';
import { codeMigrations, MIGRATIONS_TABLE } from '@turnstone/db/migrate';
import { runningLocalUrl, startLocalMariadb, type LocalMariadb } from '@turnstone/db/local-server';

export const MANIFEST = 'manifest.json';
export const DATABASE_FILE = 'database.sql.gz';
export const FILES_DIR = 'files';
export const BACKUP_FORMAT = 'turnstone-backup';
export const BACKUP_FORMAT_VERSION = 1;
/** Where backups go by default, and where the start puts one before a destructive upgrade. */
export const BACKUPS_DIR = 'backups';

export interface Manifest {
  format: typeof BACKUP_FORMAT;
  formatVersion: number;
  product: { name: string; version: string; commit: string | null };
  migrations: { level: number; tag: string | null };
  database: {
    name: string;
    server: string;
    source: 'private' | 'DATABASE_URL';
    tool: string;
    file: string;
    bytes: number;
    sha256: string;
  };
  /** Rows per table, counted in the dump itself (exactly the snapshot that was saved). */
  rows: Record<string, number>;
  files: Array<{ path: string; bytes: number; mode: number; sha256: string }>;
  startedAt: string;
  finishedAt: string;
  durationMs: number;
  reason: string;
}

const repoRoot = fileURLToPath(new URL('../../../../', import.meta.url));

export function productInfo(): Manifest['product'] {
  const pkg = JSON.parse(readFileSync(join(repoRoot, 'package.json'), 'utf8')) as {
    name: string;
    version: string;
  };
  const git = spawnSync('git', ['rev-parse', 'HEAD'], { cwd: repoRoot, encoding: 'utf8' });
  const commit = git.status === 0 ? git.stdout.trim() : null;
  return { name: pkg.name, version: pkg.version, commit };
}

/** The private server's own files: everything in `mariadb/` is its data and runtime state … */
const PRIVATE_SERVER_DIR = 'mariadb';
/** … except the credentials generated for it, which a restore must carry. */
const PRIVATE_SERVER_RUNTIME = new Set([
  'data',
  'url',
  'mariadbd.pid',
  'mariadbd.sock',
  'error.log',
]);

/**
 * The data folder's files a backup carries: every regular file except the private
 * server's data and runtime files and the backups folder itself.
 */
export function dataFolderFiles(dataDir: string): string[] {
  const out: string[] = [];
  const walk = (dir: string) => {
    if (!existsSync(dir)) return;
    for (const entry of readdirSync(dir, { withFileTypes: true })) {
      const path = join(dir, entry.name);
      const rel = relative(dataDir, path);
      const top = rel.split('/')[0];
      if (rel === BACKUPS_DIR) continue;
      if (top === PRIVATE_SERVER_DIR && rel !== PRIVATE_SERVER_DIR) {
        const second = rel.split('/')[1]!;
        if (PRIVATE_SERVER_RUNTIME.has(second) || rel.split('/').length > 2) continue;
      }
      if (entry.isDirectory()) walk(path);
      else if (entry.isFile()) out.push(rel);
    }
  };
  walk(dataDir);
  return out.sort();
}

export function sha256File(path: string): Promise<string> {
  return new Promise((resolveHash, reject) => {
    const hash = createHash('sha256');
    createReadStream(path)
      .on('data', (d) => hash.update(d))
      .on('error', reject)
      .on('end', () => resolveHash(hash.digest('hex')));
  });
}

/**
 * The database URL for tools: DATABASE_URL, else the private server of the data folder —
 * the running one, or one started for the duration (stopped by `release`).
 */
export async function databaseFor(
  dataDir: string,
  databaseUrl: string | undefined,
  log: (m: string) => void,
): Promise<{ url: string; source: Manifest['database']['source']; release(): Promise<void> }> {
  const running = runningLocalUrl(dataDir);
  if (databaseUrl) {
    const source = databaseUrl === running ? 'private' : 'DATABASE_URL';
    return { url: databaseUrl, source, release: async () => {} };
  }
  if (running && (await answers(running)))
    return { url: running, source: 'private', release: async () => {} };
  if (!existsSync(join(dataDir, PRIVATE_SERVER_DIR, 'data', 'mysql')))
    throw new Error(`No Turnstone database in ${dataDir} (and DATABASE_URL is not set).`);
  const local: LocalMariadb = await startLocalMariadb({ dataDir, log });
  return { url: local.url, source: 'private', release: () => local.stop() };
}

async function answers(url: string): Promise<boolean> {
  try {
    const conn = await mysql.createConnection({ uri: url, connectTimeout: 3000 });
    await conn.end();
    return true;
  } catch {
    return false;
  }
}

export interface BackupOptions {
  dataDir: string;
  databaseUrl?: string;
  /** Parent folder; the backup is a new folder inside it. @default `<dataDir>/backups` */
  to?: string;
  /** Why the backup was made (the manifest says it). @default 'requested' */
  reason?: string;
  log?: (m: string) => void;
}

export interface BackupResult {
  dir: string;
  manifest: Manifest;
}

function stamp(date: Date): string {
  return date
    .toISOString()
    .replace(/[-:]/g, '')
    .replace(/\.\d+Z$/, 'Z');
}

/** Takes a backup of the database and the data folder's files into a new folder. */
export async function backup(options: BackupOptions): Promise<BackupResult> {
  const log = options.log ?? (() => {});
  const dataDir = resolve(options.dataDir);
  const started = new Date();
  const parent = resolve(options.to ?? join(dataDir, BACKUPS_DIR));
  const dir = join(parent, `turnstone-backup-${stamp(started)}`);
  const partial = `${dir}.partial`;
  rmSync(partial, { recursive: true, force: true });
  mkdirSync(join(partial, FILES_DIR), { recursive: true, mode: 0o700 });
  const db = await databaseFor(dataDir, options.databaseUrl, log);
  try {
    const pool = mysql.createPool({ uri: db.url, connectionLimit: 1 });
    let server = '';
    try {
      const [[v]] = await pool.query<mysql.RowDataPacket[]>('SELECT VERSION() AS v');
      server = String(v?.v);
    } finally {
      await pool.end();
    }
    log(`Dumping the database (mariadb-dump --single-transaction)…`);
    const dumped = await dumpDatabase(db.url, join(partial, DATABASE_FILE), { log });
    const files: Manifest['files'] = [];
    for (const rel of dataFolderFiles(dataDir)) {
      const from = join(dataDir, rel);
      const to = join(partial, FILES_DIR, rel);
      mkdirSync(dirname(to), { recursive: true, mode: 0o700 });
      copyFileSync(from, to);
      const st = lstatSync(from);
      files.push({
        path: rel,
        bytes: st.size,
        mode: st.mode & 0o777,
        sha256: await sha256File(to),
      });
    }
    // drizzle's table is in the dump: one row per applied migration.
    const level = dumped.rows[MIGRATIONS_TABLE] ?? 0;
    const finished = new Date();
    const manifest: Manifest = {
      format: BACKUP_FORMAT,
      formatVersion: BACKUP_FORMAT_VERSION,
      product: productInfo(),
      migrations: { level, tag: migrationTag(level) },
      database: {
        name: parseDatabaseUrl(db.url).database,
        server,
        source: db.source,
        tool: 'mariadb-dump --single-transaction',
        file: DATABASE_FILE,
        bytes: dumped.bytes,
        sha256: await sha256File(join(partial, DATABASE_FILE)),
      },
      rows: dumped.rows,
      files,
      startedAt: started.toISOString(),
      finishedAt: finished.toISOString(),
      durationMs: finished.getTime() - started.getTime(),
      reason: options.reason ?? 'requested',
    };
    writeFileSync(join(partial, MANIFEST), JSON.stringify(manifest, null, 2) + '\n', {
      mode: 0o600,
    });
    // Only a complete backup gets its final name.
    renameSync(partial, dir);
    return { dir, manifest };
  } catch (err) {
    rmSync(partial, { recursive: true, force: true });
    throw err;
  } finally {
    await db.release();
  }
}

function migrationTag(level: number): string | null {
  return level === 0 ? null : (codeMigrations()[level - 1]?.tag ?? null);
}

export function readManifest(dir: string): Manifest {
  const file = join(dir, MANIFEST);
  if (!existsSync(file)) throw new Error(`${dir} is not a Turnstone backup (no ${MANIFEST}).`);
  const manifest = JSON.parse(readFileSync(file, 'utf8')) as Manifest;
  if (manifest.format !== BACKUP_FORMAT)
    throw new Error(`${file} is not a Turnstone backup manifest.`);
  if (manifest.formatVersion > BACKUP_FORMAT_VERSION)
    throw new Error(
      `This backup has format ${manifest.formatVersion}; this Turnstone reads up to ` +
        `${BACKUP_FORMAT_VERSION}. Restore it with the Turnstone that made it (${manifest.product.version}).`,
    );
  return manifest;
}
