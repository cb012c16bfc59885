/**
 * A private MariaDB server for one product start or one test run: Debian's `mariadbd` with
 * its own data folder and socket file, and no TCP listener unless a port is asked for (then
 * on 127.0.0.1 only). Nothing system-wide is used or changed (no system service, no
 * /var/lib/mysql, no option files: --no-defaults).
 *
 * Private to the user who runs it: the folder is mode 0700 (so is the socket inside it), and
 * MariaDB's root has a generated password kept in `<folder>/root-password` (mode 0600),
 * as does the product's account (`<folder>/password`). A folder made by an earlier version,
 * whose root had no password, gets one at the next start.
 *
 * Supervised: when `mariadbd` dies on its own (a crash, the kernel's out-of-memory killer, a
 * stray kill), it is started again after a back-off ({@link RESTART_BACKOFF_MS}, doubling
 * while restarts keep failing), with a log line when it stops and when it is back. InnoDB's
 * crash recovery replays every committed transaction (commits are flushed to the redo log,
 * `--innodb-flush-log-at-trx-commit=1`), so nothing acknowledged is lost; the product's
 * pool reconnects by itself and answers 503 with Retry-After meanwhile.
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { chmodSync, existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:net';
import { join, resolve } from 'node:path';
import mysql from 'mysql2/promise';
import { findProgram, MARIADB_INSTALL_DB, MARIADB_SERVER, provision } from './provision.ts';

export interface LocalMariadbOptions {
  /** Folder that holds everything; the server's files go into `<dataDir>/mariadb`. */
  dataDir: string;
  /** Database to create. @default 'turnstone' */
  database?: string;
  /**
   * TCP port on 127.0.0.1 for tools that want host and port. Absent or 0: no TCP listener
   * at all; clients use the socket file (the URL carries it).
   */
  port?: number;
  /** Progress messages. @default silent */
  log?: (message: string) => void;
  /** Start `mariadbd` again when it dies on its own. @default true */
  supervise?: boolean;
  /**
   * More `mariadbd` options, after the product's own (a later option wins), e.g. a binary
   * log and server id for replication: `['--log-bin=binlog', '--server-id=1']`.
   */
  serverArgs?: string[];
}

/** First wait before restarting a server that died; doubles per failed restart. */
export const RESTART_BACKOFF_MS = 500;
/** Longest wait between restart attempts. */
export const RESTART_BACKOFF_MAX_MS = 30_000;
/** A server up this long counts as healthy again: the next death waits the first back-off. */
const HEALTHY_AFTER_MS = 60_000;

export interface LocalMariadb {
  url: string;
  /** The TCP port, or 0 when the server listens on its socket file only. */
  port: number;
  dir: string;
  socket: string;
  /** Stops the server cleanly (SIGTERM, then waits) and ends supervision. Safe to call twice. */
  stop(): Promise<void>;
  /** Process id of the running `mariadbd` (it changes when supervision restarts it). */
  readonly pid: number | undefined;
  /** How many times supervision has started the server again. */
  readonly restarts: number;
}

const SERVER_USER = 'turnstone';

/**
 * Finds `mariadbd` and `mariadb-install-db`; when they are missing, provisions Debian's
 * `mariadb-server` (installed as root with apt-get, otherwise a clear error naming the
 * package and the command).
 */
export function ensureMariadbInstalled(log: (m: string) => void = () => {}): {
  server: string;
  installDb: string;
} {
  provision('start', { log });
  const server = findProgram(MARIADB_SERVER);
  const installDb = findProgram(MARIADB_INSTALL_DB);
  if (!server || !installDb)
    throw new Error('mariadb-server is installed but mariadbd was not found.');
  return { server, installDb };
}

export async function freePort(): Promise<number> {
  return new Promise((resolvePort, reject) => {
    const srv = createServer();
    srv.unref();
    srv.on('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const address = srv.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      srv.close(() => resolvePort(port));
    });
  });
}

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

async function waitForExit(pid: number, ms: number): Promise<boolean> {
  const until = Date.now() + ms;
  while (Date.now() < until) {
    if (!isAlive(pid)) return true;
    await new Promise((r) => setTimeout(r, 100));
  }
  return !isAlive(pid);
}

/** A server left running on this folder by a killed earlier start would hold its files. */
async function stopOrphan(dir: string, log: (m: string) => void): Promise<void> {
  const pidFile = join(dir, 'mariadbd.pid');
  if (!existsSync(pidFile)) return;
  const pid = Number(readFileSync(pidFile, 'utf8').trim());
  if (!Number.isInteger(pid) || pid <= 0 || !isAlive(pid)) return;
  let cmdline = '';
  try {
    cmdline = readFileSync(`/proc/${pid}/cmdline`, 'utf8');
  } catch {
    return;
  }
  if (!cmdline.includes(dir)) return;
  log(`Stopping a MariaDB server left running on ${dir} (pid ${pid})…`);
  process.kill(pid, 'SIGTERM');
  if (!(await waitForExit(pid, 30_000))) process.kill(pid, 'SIGKILL');
}

function readOrCreatePassword(file: string): string {
  if (existsSync(file)) return readFileSync(file, 'utf8').trim();
  const password = randomBytes(18).toString('base64url');
  writeFileSync(file, password + '\n', { mode: 0o600 });
  return password;
}

const accessDenied = (err: unknown) =>
  (err as { code?: string }).code === 'ER_ACCESS_DENIED_ERROR' ||
  (err as { code?: string }).code === 'ER_ACCESS_DENIED_NO_PASSWORD_ERROR';

/**
 * Connects as root with the generated password. A root that still has the empty password
 * mariadb-install-db gives it (a new folder, or one from before the password) gets it now.
 */
async function connectRoot(socket: string, rootPassword: string): Promise<mysql.Connection> {
  try {
    return await mysql.createConnection({
      socketPath: socket,
      user: 'root',
      password: rootPassword,
    });
  } catch (err) {
    if (!accessDenied(err)) throw err;
  }
  const conn = await mysql.createConnection({ socketPath: socket, user: 'root', password: '' });
  const [rows] = await conn.query("SELECT Host AS host FROM mysql.user WHERE User = 'root'");
  for (const { host } of rows as { host: string }[])
    await conn.query('ALTER USER ?@? IDENTIFIED BY ?', ['root', host, rootPassword]);
  return conn;
}

/** Starts (initialising on first use) a private MariaDB and returns its connection URL. */
export async function startLocalMariadb(options: LocalMariadbOptions): Promise<LocalMariadb> {
  const log = options.log ?? (() => {});
  const database = options.database ?? 'turnstone';
  if (!/^[A-Za-z0-9_]+$/.test(database)) throw new Error(`Invalid database name: ${database}`);
  const { server, installDb } = ensureMariadbInstalled(log);
  const dir = resolve(options.dataDir, 'mariadb');
  mkdirSync(dir, { recursive: true, mode: 0o700 });
  // Private to this user: the data files, the socket and the password files inside.
  chmodSync(dir, 0o700);
  const rootPassword = readOrCreatePassword(join(dir, 'root-password'));
  const asRoot = process.getuid?.() === 0;
  const userArgs = asRoot ? ['--user=root'] : [];

  if (!existsSync(join(dir, 'data', 'mysql'))) {
    log(`Initialising MariaDB data in ${dir}…`);
    const r = spawnSync(
      installDb,
      [
        '--no-defaults',
        `--datadir=${join(dir, 'data')}`,
        ...userArgs,
        '--auth-root-authentication-method=normal',
        '--skip-test-db',
        '--skip-name-resolve',
      ],
      { encoding: 'utf8' },
    );
    if (r.status !== 0) {
      throw new Error(
        `mariadb-install-db failed (exit ${r.status}): ${(r.stderr || r.stdout).slice(-2000)}`,
      );
    }
  }
  await stopOrphan(dir, log);

  // Its own temporary folder: files in a shared /tmp can be removed by other programs (or a
  // tmp cleaner) while a query's temporary table is open, failing the query.
  const tmp = join(dir, 'tmp');
  mkdirSync(tmp, { recursive: true, mode: 0o700 });
  const port = options.port ?? 0;
  const socket = join(dir, 'mariadbd.sock');
  const errorLog = join(dir, 'error.log');
  const args = [
    '--no-defaults',
    `--datadir=${join(dir, 'data')}`,
    `--socket=${socket}`,
    `--pid-file=${join(dir, 'mariadbd.pid')}`,
    `--tmpdir=${tmp}`,
    `--log-error=${errorLog}`,
    ...(port > 0 ? [`--port=${port}`, '--bind-address=127.0.0.1'] : ['--skip-networking']),
    '--skip-name-resolve',
    ...userArgs,
    '--default-time-zone=+00:00',
    '--character-set-server=utf8mb4',
    '--collation-server=utf8mb4_unicode_ci',
    // Durable commits: an acknowledged snapshot survives a crash (README, operations).
    '--innodb-flush-log-at-trx-commit=1',
    // No binary log unless asked for (replication): it would only grow.
    ...(options.serverArgs?.some((a) => a.startsWith('--log-bin')) ? [] : ['--skip-log-bin']),
    '--max-connections=400',
    '--max-allowed-packet=64M',
    '--innodb-buffer-pool-size=256M',
    ...(options.serverArgs ?? []),
  ];
  const exitedChildren = new WeakSet<ChildProcess>();
  let child!: ChildProcess;
  let supervising = false;
  let stopped = false;
  const launch = () => {
    const c = spawn(server, args, { stdio: 'ignore' });
    child = c;
    c.on('exit', (code, signal) => {
      exitedChildren.add(c);
      if (c === child && supervising && !stopped) onUnexpectedExit(code, signal);
    });
    return c;
  };

  /** Connects as root once the server answers; null when it exited or did not answer in 60 s. */
  const waitUntilUp = async (c: ChildProcess): Promise<mysql.Connection | null> => {
    const deadline = Date.now() + 60_000;
    for (;;) {
      if (exitedChildren.has(c) || stopped) return null;
      try {
        return await connectRoot(socket, rootPassword);
      } catch (err) {
        if (accessDenied(err)) throw new Error(`MariaDB in ${dir} refused its root password.`);
        if (Date.now() > deadline) {
          c.kill('SIGKILL');
          return null;
        }
        await new Promise((r) => setTimeout(r, 150));
      }
    }
  };

  const first = launch();
  const admin = await waitUntilUp(first);
  if (!admin) {
    if (exitedChildren.has(first)) {
      const tail = existsSync(errorLog) ? readFileSync(errorLog, 'utf8').slice(-2000) : '';
      throw new Error(`mariadbd exited during start-up. Its log ends:\n${tail}`);
    }
    throw new Error(`MariaDB did not answer within 60 s (log: ${errorLog}).`);
  }

  // Supervision: restart with back-off, one line when it stops and one when it is back.
  let restarts = 0;
  let backoff = RESTART_BACKOFF_MS;
  let upSince = Date.now();
  let downSince = 0;
  let timer: NodeJS.Timeout | null = null;
  function onUnexpectedExit(code: number | null, signal: NodeJS.Signals | null) {
    const now = Date.now();
    if (downSince === 0) downSince = now;
    if (upSince > 0 && now - upSince >= HEALTHY_AFTER_MS) backoff = RESTART_BACKOFF_MS;
    const wait = backoff;
    backoff = Math.min(backoff * 2, RESTART_BACKOFF_MAX_MS);
    upSince = 0;
    log(
      `MariaDB stopped unexpectedly (${signal ?? `exit code ${code}`}); starting it again in ` +
        `${wait / 1000} s (log: ${errorLog}).`,
    );
    timer = setTimeout(() => void restart(), wait);
  }
  async function restart() {
    timer = null;
    if (stopped) return;
    restarts++;
    const c = launch();
    let conn: mysql.Connection | null = null;
    try {
      conn = await waitUntilUp(c);
    } catch (err) {
      log(`MariaDB restart failed: ${(err as Error).message}`);
      c.kill('SIGKILL');
      return; // Its exit schedules the next attempt.
    }
    if (!conn) return; // It exited (the next attempt is scheduled) or was stopped.
    try {
      chmodSync(socket, 0o600);
    } finally {
      await conn.end().catch(() => undefined);
    }
    if (stopped) return;
    upSince = Date.now();
    log(
      `MariaDB is running again (restart ${restarts}, ${((upSince - downSince) / 1000).toFixed(1)} s after it stopped).`,
    );
    downSince = 0;
  }

  const password = readOrCreatePassword(join(dir, 'password'));
  try {
    chmodSync(socket, 0o600);
    await admin.query(
      `CREATE DATABASE IF NOT EXISTS \`${database}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`,
    );
    // The account over the server's socket file (localhost), and over TCP when it listens.
    for (const host of port > 0 ? ['127.0.0.1', 'localhost'] : ['localhost']) {
      await admin.query(`CREATE USER IF NOT EXISTS '${SERVER_USER}'@'${host}' IDENTIFIED BY ?`, [
        password,
      ]);
      await admin.query(`ALTER USER '${SERVER_USER}'@'${host}' IDENTIFIED BY ?`, [password]);
      // A private, loopback-only server: the product's user may create databases (tests do).
      await admin.query(`GRANT ALL PRIVILEGES ON *.* TO '${SERVER_USER}'@'${host}'`);
    }
  } finally {
    await admin.end();
  }

  let stopping: Promise<void> | null = null;
  const stop = () => {
    stopping ??= (async () => {
      stopped = true;
      if (timer) clearTimeout(timer);
      rmSync(join(dir, 'url'), { force: true });
      const c = child;
      if (exitedChildren.has(c) || c.pid === undefined) return;
      c.kill('SIGTERM');
      if (!(await waitForExit(c.pid, 30_000))) c.kill('SIGKILL');
    })();
    return stopping;
  };

  // Clients connect through the socket file (mysql2 reads socketPath from the URL): on the
  // ingest path a loopback TCP round trip cost the server and MariaDB about 15 % more CPU
  // per snapshot, and the socket inside a 0700 folder is reachable by this user alone.
  const hostPart = port > 0 ? `127.0.0.1:${port}` : 'localhost';
  const url = `mysql://${SERVER_USER}:${encodeURIComponent(password)}@${hostPart}/${database}?socketPath=${encodeURIComponent(socket)}`;
  // Lets `npm run worker` find this private server from the same data folder.
  writeFileSync(join(dir, 'url'), url + '\n', { mode: 0o600 });
  log(
    port > 0
      ? `MariaDB is up on 127.0.0.1:${port} and its socket file (data in ${dir}).`
      : `MariaDB is up on its socket file, no TCP (data in ${dir}).`,
  );
  supervising = options.supervise ?? true;
  return {
    url,
    port,
    dir,
    socket,
    stop,
    get pid() {
      return child.pid;
    },
    get restarts() {
      return restarts;
    },
  };
}

/** The URL of a private server started by another process on the same data folder, if up. */
export function runningLocalUrl(dataDir: string): string | null {
  const file = join(resolve(dataDir, 'mariadb'), 'url');
  return existsSync(file) ? readFileSync(file, 'utf8').trim() : null;
}
