/**
 * The Debian packages Turnstone needs and the one place that installs them: `npm start`
 * (through startLocalMariadb), `npm test` (tests/run-tests.ts, which `.ci/run` calls).
 * Each package is checked by what the code actually runs (a program file, a Python import),
 * so a machine that already has them does nothing. Missing ones are installed when the
 * process is root and apt-get is there: one `apt-get update`, then
 * `apt-get install -y --no-install-recommends …`. Otherwise a ProvisionError names the
 * packages and the command, before anything runs.
 */
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { join } from 'node:path';

/** Debian's python3, the one the scipy/numpy reference checks run. */
export const REFERENCE_PYTHON = '/usr/bin/python3';

/** The Chromium the browser tests drive: CHROMIUM_PATH, else Debian's. */
export function chromiumPath(): string {
  return process.env.CHROMIUM_PATH || '/usr/bin/chromium';
}

const SEARCH_DIRS = ['/usr/sbin', '/usr/bin', '/usr/local/sbin', '/usr/local/bin'];

/** The first of `names` found in the usual program folders, or null. */
export function findProgram(names: string[]): string | null {
  for (const name of names) {
    for (const dir of SEARCH_DIRS) {
      const path = join(dir, name);
      if (existsSync(path)) return path;
    }
  }
  return null;
}

export const MARIADB_SERVER = ['mariadbd', 'mysqld'];
export const MARIADB_INSTALL_DB = ['mariadb-install-db', 'mysql_install_db'];
export const MARIADB_DUMP = ['mariadb-dump', 'mysqldump'];
export const MARIADB_CLIENT = ['mariadb', 'mysql'];

function pythonImports(module: string): boolean {
  const r = spawnSync(REFERENCE_PYTHON, ['-c', `import ${module}`], { stdio: 'ignore' });
  return r.status === 0;
}

interface DebianPackage {
  name: string;
  /** Needed only by the scipy/numpy reference checks (TURNSTONE_SKIP_REFERENCES=1 drops it). */
  reference: boolean;
  present(): boolean;
}

const PACKAGES: Record<string, DebianPackage> = {
  'mariadb-server': {
    name: 'mariadb-server',
    reference: false,
    present: () => !!findProgram(MARIADB_SERVER) && !!findProgram(MARIADB_INSTALL_DB),
  },
  // The dump and load of npm run backup / restore (mariadb-server depends on it; a product
  // on DATABASE_URL may have only the client).
  'mariadb-client': {
    name: 'mariadb-client',
    reference: false,
    present: () => !!findProgram(MARIADB_DUMP) && !!findProgram(MARIADB_CLIENT),
  },
  chromium: { name: 'chromium', reference: false, present: () => existsSync(chromiumPath()) },
  'python3-numpy': {
    name: 'python3-numpy',
    reference: true,
    present: () => pythonImports('numpy'),
  },
  'python3-scipy': {
    name: 'python3-scipy',
    reference: true,
    present: () => pythonImports('scipy'),
  },
};

/** The one list: which Debian packages each command needs. */
export const DEBIAN_PACKAGES = {
  /** `npm start`: a private MariaDB (unless DATABASE_URL points elsewhere). */
  start: ['mariadb-server'],
  /** `npm run backup` / `restore`, and a start's backup before a destructive migration. */
  backup: ['mariadb-client'],
  /** `npm test`: MariaDB, Chromium for the browser tests, scipy and numpy for the references. */
  test: ['mariadb-server', 'mariadb-client', 'chromium', 'python3-numpy', 'python3-scipy'],
} as const satisfies Record<string, readonly (keyof typeof PACKAGES)[]>;

export type Purpose = keyof typeof DEBIAN_PACKAGES;

/** True when TURNSTONE_SKIP_REFERENCES=1: the scipy/numpy checks are skipped on purpose. */
export function referencesSkipped(env: NodeJS.ProcessEnv = process.env): boolean {
  return env.TURNSTONE_SKIP_REFERENCES === '1';
}

export class ProvisionError extends Error {
  constructor(
    message: string,
    readonly missing: string[],
  ) {
    super(message);
    this.name = 'ProvisionError';
  }
}

export interface ProvisionOptions {
  /** Progress messages. @default console.log */
  log?: (message: string) => void;
  /** Leave out the packages only the scipy/numpy reference checks need. */
  skipReferences?: boolean;
}

/** The packages of `purpose` that are not usable on this machine. */
export function missingPackages(purpose: Purpose, skipReferences = false): string[] {
  return DEBIAN_PACKAGES[purpose]
    .map((name) => PACKAGES[name]!)
    .filter((p) => !(skipReferences && p.reference) && !p.present())
    .map((p) => p.name);
}

function installCommand(missing: string[]): string {
  return `apt-get update && apt-get install -y --no-install-recommends ${missing.join(' ')}`;
}

function cannotInstall(purpose: Purpose, missing: string[], why: string): ProvisionError {
  const lines = [
    `npm ${purpose} needs Debian packages that are not installed: ${missing.join(', ')}.`,
    `${why}, so they cannot be installed from here. Install them as root with:`,
    `  ${installCommand(missing)}`,
  ];
  if (purpose === 'start') {
    lines.push('or set DATABASE_URL to an existing MariaDB server.');
  } else if (missing.some((m) => PACKAGES[m]!.reference)) {
    lines.push(
      'To run without the scipy/numpy reference checks instead, set TURNSTONE_SKIP_REFERENCES=1.',
    );
  }
  return new ProvisionError(lines.join('\n'), missing);
}

function aptGetAvailable(): boolean {
  const r = spawnSync('apt-get', ['--version'], { stdio: 'ignore' });
  return !r.error && r.status === 0;
}

/**
 * Makes sure the Debian packages of `purpose` are usable; installs the missing ones as root
 * with apt-get, else throws a ProvisionError naming them and the command. Returns what it
 * installed.
 */
export function provision(purpose: Purpose, options: ProvisionOptions = {}): string[] {
  const log = options.log ?? ((m: string) => console.log(m));
  const skipReferences = options.skipReferences ?? false;
  const missing = missingPackages(purpose, skipReferences);
  if (missing.length === 0) return [];
  if (!aptGetAvailable()) throw cannotInstall(purpose, missing, 'apt-get is not available');
  if (process.getuid?.() !== 0) throw cannotInstall(purpose, missing, 'This process is not root');

  log(`Installing Debian packages for npm ${purpose}: ${missing.join(' ')}`);
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  for (const args of [
    ['update', '-qq'],
    ['install', '-y', '-qq', '--no-install-recommends', ...missing],
  ]) {
    const r = spawnSync('apt-get', args, { stdio: 'inherit', env });
    if (r.status !== 0) {
      throw new ProvisionError(
        `apt-get ${args.join(' ')} failed (exit ${r.status ?? r.signal}).`,
        missing,
      );
    }
  }
  const still = missingPackages(purpose, skipReferences);
  if (still.length > 0) {
    throw new ProvisionError(
      `apt-get installed ${missing.join(' ')}, but ${still.join(', ')} is still not usable` +
        (still.includes('chromium') ? ` (no Chromium at ${chromiumPath()}).` : '.'),
      still,
    );
  }
  log(`Installed: ${missing.join(' ')}`);
  return missing;
}
