/**
 * What a database error means, decided in one place. Drizzle (0.45) wraps the driver's error
 * in its own (`DrizzleQueryError`) with the mysql2 error as `.cause`, so every check walks
 * the `.cause` chain rather than reading `err.code` of the outermost error.
 */

/** The errors of `err`'s `.cause` chain, outermost first (a few levels at most). */
function* chain(
  err: unknown,
): Generator<{ code?: unknown; errno?: unknown; fatal?: unknown; syscall?: unknown }> {
  for (let e: unknown = err, i = 0; e && typeof e === 'object' && i < 6; i++) {
    yield e as { code?: unknown };
    e = (e as { cause?: unknown }).cause;
  }
}

function hasCode(err: unknown, codes: ReadonlySet<string>): boolean {
  for (const e of chain(err)) if (typeof e.code === 'string' && codes.has(e.code)) return true;
  return false;
}

const UNAVAILABLE = new Set([
  'ECONNREFUSED',
  'PROTOCOL_CONNECTION_LOST',
  'ETIMEDOUT',
  'ECONNRESET',
  'EPIPE',
  'ER_SERVER_SHUTDOWN',
  'ER_CON_COUNT_ERROR',
  'PROTOCOL_SEQUENCE_TIMEOUT',
]);

/** The database is away (connection refused or lost, server shutting down), not a bad query. */
export function isDbUnavailable(err: unknown): boolean {
  for (const e of chain(err)) {
    if (typeof e.code === 'string' && UNAVAILABLE.has(e.code)) return true;
    // The server's socket file is gone while it is stopped.
    if (e.code === 'ENOENT' && e.syscall === 'connect') return true;
    if (e.fatal === true && e.errno === undefined) return true;
  }
  return false;
}

const LOCK_CONFLICT = new Set(['ER_LOCK_DEADLOCK', 'ER_LOCK_WAIT_TIMEOUT']);

/**
 * Deadlock or lock-wait timeout. InnoDB has rolled the transaction back (a deadlock always,
 * a lock-wait timeout too when the caller cannot tell which statement took effect): the
 * transaction must not carry on; running it again from the start is safe.
 */
export function isLockConflict(err: unknown): boolean {
  return hasCode(err, LOCK_CONFLICT);
}

const DUPLICATE = new Set(['ER_DUP_ENTRY']);

/** A unique index refused the row. */
export function isDuplicateKey(err: unknown): boolean {
  return hasCode(err, DUPLICATE);
}

/**
 * A partition of that name or range exists already (two workers adding the same month):
 * MariaDB's ER_SAME_NAME_PARTITION, or ER_RANGE_NOT_INCREASING_ERROR when the month was
 * split off `p_future` by the other one first.
 */
export function isDuplicatePartition(err: unknown): boolean {
  return hasCode(err, DUPLICATE_PARTITION);
}
const DUPLICATE_PARTITION = new Set(['ER_SAME_NAME_PARTITION', 'ER_RANGE_NOT_INCREASING_ERROR']);

/**
 * Errors after which the current transaction is gone (rolled back by the server, or its
 * connection lost): nothing more may be written in it, and the caller must let it fail.
 */
export function abortsTransaction(err: unknown): boolean {
  return isDbUnavailable(err) || isLockConflict(err);
}

/**
 * What went wrong reaching the database, in words an installer can act on, or null when
 * `err` is not a connection problem (a bad query, say). Drizzle reports a failed first
 * query as `Failed query: create table … params:`, which hides the driver's reason.
 */
export function describeConnectionError(err: unknown, url: string): string | null {
  let where = url;
  try {
    const u = new URL(url);
    const socket = u.searchParams.get('socketPath');
    where = socket ? `the socket file ${socket}` : `${u.hostname}:${u.port || '3306'}`;
    const db = u.pathname.replace(/^\//, '');
    for (const e of chain(err)) {
      const code = typeof e.code === 'string' ? e.code : '';
      const text = (e as { message?: unknown }).message;
      const reason = typeof text === 'string' && text ? ` (${text})` : '';
      switch (code) {
        case 'ER_ACCESS_DENIED_ERROR':
        case 'ER_ACCESS_DENIED_NO_PASSWORD_ERROR':
          return `The database at ${where} refused the user "${decodeURIComponent(u.username)}": wrong user name or password in DATABASE_URL${reason}.`;
        case 'ER_DBACCESS_DENIED_ERROR':
        case 'ER_TABLEACCESS_DENIED_ERROR':
          return `The user "${decodeURIComponent(u.username)}" may not use the database "${db}" at ${where}: grant it ALL PRIVILEGES on ${db}.*${reason}.`;
        case 'ER_BAD_DB_ERROR':
          return `The database "${db}" does not exist at ${where}: create it (CREATE DATABASE \`${db}\`) or fix the name in DATABASE_URL${reason}.`;
        case 'ECONNREFUSED':
          return `Nothing is listening at ${where}: is MariaDB running, and are the host and port in DATABASE_URL right?${reason}`;
        case 'ENOENT':
          return `Nothing is at ${where}: is MariaDB running, and is the socketPath in DATABASE_URL right?${reason}`;
        case 'EACCES':
          return `This user may not open ${where}${reason}.`;
        case 'ENOTFOUND':
        case 'EAI_AGAIN':
          return `The database host "${u.hostname}" does not resolve${reason}.`;
        case 'ETIMEDOUT':
          return `The database at ${where} did not answer in time (firewall, or the wrong host?)${reason}.`;
        case 'ER_NOT_SUPPORTED_AUTH_MODE':
        case 'HANDSHAKE_SSL_ERROR':
          return `The database at ${where} refused the connection set-up${reason}.`;
      }
    }
  } catch {
    // an unparsable URL: config.ts refuses those before anything starts
  }
  return isDbUnavailable(err) ? `The database at ${where} is not answering.` : null;
}
