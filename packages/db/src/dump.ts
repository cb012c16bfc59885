/**
 * Logical dumps of one database with Debian's `mariadb-dump --single-transaction` and loads
 * with the `mariadb` client (both from the package `mariadb-client`, which `mariadb-server`
 * depends on). A dump is one consistent InnoDB snapshot taken while ingest and workers keep
 * writing; it reaches the server through the same URL the product uses, so it works for the
 * private server and for any `DATABASE_URL`.
 *
 * The dump is gzipped as it streams, and its rows are counted from the stream itself, so
 * the counts describe exactly the snapshot in the file (a second connection counting rows
 * would see a different moment while ingest runs).
 */
import { spawn, spawnSync } from 'node:child_process';
import { createReadStream, createWriteStream, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Transform, type TransformCallback } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { createGunzip, createGzip, constants as zlibConstants } from 'node:zlib';
import { findProgram, MARIADB_CLIENT, MARIADB_DUMP, provision } from './provision.ts';

/** Connection details of a mysql:// URL as the MariaDB command-line clients take them. */
export interface ClientTarget {
  host: string;
  port: number;
  user: string;
  password: string;
  database: string;
  socketPath?: string;
}

export function parseDatabaseUrl(url: string): ClientTarget {
  const u = new URL(url);
  const database = decodeURIComponent(u.pathname.replace(/^\//, ''));
  if (!database) throw new Error('The database URL names no database (mysql://…/<database>).');
  const socketPath = u.searchParams.get('socketPath') ?? undefined;
  return {
    host: u.hostname || '127.0.0.1',
    port: Number(u.port || 3306),
    user: decodeURIComponent(u.username),
    password: decodeURIComponent(u.password),
    database,
    ...(socketPath ? { socketPath } : {}),
  };
}

/**
 * The clients read the password from an option file (mode 0600) rather than the command
 * line, where any user could see it in the process list.
 */
function withOptionFile<T>(target: ClientTarget, run: (args: string[]) => Promise<T>): Promise<T> {
  const dir = mkdtempSync(join(tmpdir(), 'turnstone-client-'));
  const file = join(dir, 'client.cnf');
  const lines = ['[client]', `user=${target.user}`, `password="${escapeOption(target.password)}"`];
  if (target.socketPath) lines.push(`socket=${target.socketPath}`);
  else lines.push(`host=${target.host}`, `port=${target.port}`, 'protocol=TCP');
  writeFileSync(file, lines.join('\n') + '\n', { mode: 0o600 });
  return run([`--defaults-extra-file=${file}`]).finally(() =>
    rmSync(dir, { recursive: true, force: true }),
  );
}

function escapeOption(value: string): string {
  return value.replace(/\\/g, '\\\\').replace(/"/g, '\\"');
}

/** Finds `mariadb-dump` and `mariadb`, provisioning Debian's `mariadb-client` when missing. */
export function ensureClientTools(log?: (m: string) => void): { dump: string; client: string } {
  provision('backup', { log: log ?? (() => {}) });
  const dump = findProgram(MARIADB_DUMP);
  const client = findProgram(MARIADB_CLIENT);
  if (!dump || !client)
    throw new Error('mariadb-client is installed but mariadb-dump was not found.');
  return { dump, client };
}

/**
 * Counts the rows of each table in a `mariadb-dump` stream. Each table's rows are in
 * extended INSERT lines (`INSERT INTO \`t\` VALUES (…),(…);`); newlines inside values are
 * escaped by the dump, binary columns are hex (--hex-blob), strings are single-quoted with
 * backslash escapes. A row starts at a `(` outside quotes at parenthesis depth 0.
 */
export class RowCounter extends Transform {
  readonly counts: Record<string, number> = {};
  /** The dump's last line says it completed; a dump cut short lacks it. */
  completed = false;
  private mode: 'head' | 'insert' | 'skip' = 'head';
  private head = '';
  private table = '';
  private inQuote = false;
  private escaped = false;
  private depth = 0;
  private tail = '';

  override _transform(chunk: Buffer, _enc: BufferEncoding, done: TransformCallback): void {
    this.scan(chunk);
    const end = chunk.subarray(Math.max(0, chunk.length - 80)).toString('latin1');
    this.tail = (this.tail + end).slice(-80);
    done(null, chunk);
  }

  override _flush(done: TransformCallback): void {
    this.completed = /-- Dump completed[^\n]*\n?$/.test(this.tail);
    done();
  }

  private scan(buf: Buffer): void {
    const PREFIX = 'INSERT INTO `';
    for (let i = 0; i < buf.length; i++) {
      const c = buf[i]!;
      if (this.mode === 'insert') {
        if (this.inQuote) {
          if (this.escaped) this.escaped = false;
          else if (c === 0x5c)
            this.escaped = true; // backslash
          else if (c === 0x27) this.inQuote = false;
        } else if (c === 0x27) {
          this.inQuote = true;
        } else if (c === 0x28) {
          if (this.depth === 0) this.counts[this.table]! += 1;
          this.depth += 1;
        } else if (c === 0x29) {
          this.depth -= 1;
        } else if (c === 0x3b && this.depth === 0) {
          this.mode = 'skip'; // the statement's closing semicolon
        }
        continue;
      }
      if (c === 0x0a) {
        // `INSERT INTO \`t\` VALUES` then one row per line (mariadb-dump 10.11+).
        if (this.mode === 'head' && this.head.endsWith('` VALUES')) this.startInsert(' ');
        else this.mode = 'head';
        this.head = '';
        continue;
      }
      if (this.mode === 'skip') continue;
      this.head += String.fromCharCode(c);
      const n = this.head.length;
      if (n <= PREFIX.length) {
        if (PREFIX.charCodeAt(n - 1) !== c) this.mode = 'skip';
      } else if (this.head.endsWith('` VALUES ')) {
        this.startInsert('');
      } else if (n > 300) {
        this.mode = 'skip';
      }
    }
  }

  private startInsert(sep: string): void {
    const PREFIX = 'INSERT INTO `';
    this.table = (this.head + sep).slice(PREFIX.length, -'` VALUES '.length).replace(/``/g, '`');
    this.counts[this.table] ??= 0;
    this.mode = 'insert';
    this.depth = 0;
    this.inQuote = false;
    this.escaped = false;
    this.head = '';
  }
}

export interface DumpResult {
  /** Rows per table in the dump. */
  rows: Record<string, number>;
  /** Size of the gzipped file. */
  bytes: number;
  ms: number;
}

/**
 * Dumps the URL's database into `file` (gzipped SQL) as one consistent snapshot. Ingest and
 * workers keep running: `--single-transaction` reads through a REPEATABLE READ snapshot and
 * takes no table locks (every Turnstone table is InnoDB).
 */
export async function dumpDatabase(
  url: string,
  file: string,
  options: { log?: (m: string) => void; gzipLevel?: number } = {},
): Promise<DumpResult> {
  const { dump } = ensureClientTools(options.log);
  const target = parseDatabaseUrl(url);
  const t0 = Date.now();
  return withOptionFile(target, async (auth) => {
    const child = spawn(
      dump,
      [
        ...auth,
        '--single-transaction',
        '--skip-lock-tables',
        '--quick',
        '--hex-blob',
        '--triggers',
        '--default-character-set=utf8mb4',
        '--tz-utc',
        '--skip-add-drop-table',
        target.database,
      ],
      { stdio: ['ignore', 'pipe', 'pipe'] },
    );
    let stderr = '';
    child.stderr.on('data', (d: Buffer) => (stderr = (stderr + d.toString()).slice(-4000)));
    const exited = new Promise<number>((resolve) =>
      child.on('close', (code, signal) => resolve(code ?? (signal ? 1 : 0))),
    );
    const counter = new RowCounter();
    const out = createWriteStream(file, { mode: 0o600 });
    try {
      await pipeline(
        child.stdout,
        counter,
        createGzip({ level: options.gzipLevel ?? zlibConstants.Z_BEST_SPEED }),
        out,
      );
    } catch (err) {
      child.kill('SIGTERM');
      throw err;
    }
    const code = await exited;
    if (code !== 0) throw new Error(`mariadb-dump failed (exit ${code}): ${stderr.trim()}`);
    if (!counter.completed) throw new Error('mariadb-dump ended without completing the dump.');
    return { rows: counter.counts, bytes: out.bytesWritten, ms: Date.now() - t0 };
  });
}

/**
 * Loads a gzipped dump into the URL's database (which should be empty) with the `mariadb`
 * client, and returns the rows it loaded, counted from the same stream.
 */
export async function loadDump(
  url: string,
  file: string,
  options: { log?: (m: string) => void } = {},
): Promise<{ rows: Record<string, number>; ms: number }> {
  const { client } = ensureClientTools(options.log);
  const target = parseDatabaseUrl(url);
  const t0 = Date.now();
  return withOptionFile(target, async (auth) => {
    const child = spawn(
      client,
      [...auth, '--default-character-set=utf8mb4', '--batch', target.database],
      { stdio: ['pipe', 'ignore', 'pipe'] },
    );
    let stderr = '';
    child.stderr.on('data', (d: Buffer) => (stderr = (stderr + d.toString()).slice(-4000)));
    const exited = new Promise<number>((resolve) =>
      child.on('close', (code, signal) => resolve(code ?? (signal ? 1 : 0))),
    );
    const counter = new RowCounter();
    try {
      await pipeline(createReadStream(file), createGunzip(), counter, child.stdin);
    } catch (err) {
      child.kill('SIGTERM');
      await exited;
      throw new Error(`Loading the dump failed: ${stderr.trim() || (err as Error).message}`);
    }
    const code = await exited;
    if (code !== 0) throw new Error(`Loading the dump failed (exit ${code}): ${stderr.trim()}`);
    if (!counter.completed) throw new Error('The dump file is cut short (no completion line).');
    return { rows: counter.counts, ms: Date.now() - t0 };
  });
}

/** The MariaDB server version, as `mariadb-dump --version` reports it (for the manifest). */
export function clientVersion(program: string): string {
  const r = spawnSync(program, ['--version'], { encoding: 'utf8' });
  return (r.stdout || '').trim();
}
