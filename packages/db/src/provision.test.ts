import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, symlinkSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { DEBIAN_PACKAGES, missingPackages } from './provision.ts';

// `npm test` provisions its Debian packages before anything runs. These run the real command
// (tests/run-tests.ts) in a child process: as the user `nobody` when we are root, to take the
// not-root path, and with a PATH without apt-get for the no-apt path. A missing package is a
// real one: CHROMIUM_PATH pointing where no Chromium is.

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..', '..');
const tsxCli = join(root, 'node_modules', 'tsx', 'dist', 'cli.mjs');
const isRoot = process.getuid?.() === 0;
const NO_CHROMIUM = '/nonexistent/chromium';

function runTests(env: Record<string, string>, asNobody: boolean) {
  const command = [process.execPath, tsxCli, 'tests/run-tests.ts', '--project', 'unit'];
  const envArgs = Object.entries(env).map(([k, v]) => `${k}=${v}`);
  const [file, ...args] = asNobody
    ? ['runuser', '-u', 'nobody', '--', 'env', ...envArgs, ...command]
    : ['env', ...envArgs, ...command];
  return spawnSync(file!, args, { cwd: root, encoding: 'utf8', timeout: 60_000 });
}

describe('provisioning the Debian packages of npm test', { timeout: 90_000 }, () => {
  it('when a package is missing and the process is not root, npm test stops first and names it and the command', () => {
    const r = runTests({ CHROMIUM_PATH: NO_CHROMIUM }, isRoot);
    expect(r.status).toBe(1);
    expect(r.stderr).toContain('npm test needs Debian packages that are not installed: chromium.');
    expect(r.stderr).toContain('This process is not root');
    expect(r.stderr).toContain(
      'apt-get update && apt-get install -y --no-install-recommends chromium',
    );
    // Stopped before anything ran: no MariaDB, no vitest.
    expect(r.stdout).not.toMatch(/MariaDB|passed/);
  });

  it('when a package is missing and apt-get is not on the PATH, npm test stops first and says so', () => {
    // A PATH with node alone (node may live in /usr/bin beside apt-get).
    const bin = mkdtempSync(join(tmpdir(), 'turnstone-no-apt-'));
    symlinkSync(process.execPath, join(bin, 'node'));
    const r = runTests({ CHROMIUM_PATH: NO_CHROMIUM, PATH: bin }, false);
    rmSync(bin, { recursive: true, force: true });
    expect(r.status).toBe(1);
    expect(r.stderr).toContain('apt-get is not available');
    expect(r.stderr).toContain('apt-get install -y --no-install-recommends chromium');
    expect(r.stdout).not.toMatch(/MariaDB|passed/);
  });

  it('when the packages are usable (npm test provisioned them), none is reported missing', () => {
    expect(missingPackages('test')).toEqual([]);
    expect(DEBIAN_PACKAGES.test).toEqual(
      expect.arrayContaining(['mariadb-server', 'chromium', 'python3-numpy', 'python3-scipy']),
    );
    expect(DEBIAN_PACKAGES.start).toEqual(['mariadb-server']);
  });
});
