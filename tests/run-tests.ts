/**
 * `npm test`: first the Debian packages the tests need (packages/db/src/provision.ts:
 * mariadb-server, chromium, python3-numpy, python3-scipy; installed as root with apt-get,
 * otherwise a message naming them and the command, before anything runs), then one
 * throw-away MariaDB for the whole run (temporary folder, free port), the web build the
 * browser tests need, then every vitest project. Ends with the line `N passed, N failed`
 * (`, N skipped` when something was skipped, named on the lines before it) and a non-zero
 * exit on any failure. TURNSTONE_SKIP_REFERENCES=1 skips the scipy/numpy reference checks
 * (and does not install scipy/numpy); without it they run or fail.
 * Extra arguments go to vitest, e.g. `npm test -- --project unit`.
 */
import { spawn } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import { startLocalMariadb } from '@turnstone/db/local-server';
import { provision, ProvisionError, referencesSkipped } from '@turnstone/db/provision';
import { ensureWebBuilt } from '../apps/server/src/lib/web-build.ts';

const args = process.argv.slice(2);
const skipReferences = referencesSkipped();
try {
  provision('test', { log: (m) => console.log(m), skipReferences });
} catch (err) {
  if (!(err instanceof ProvisionError)) throw err;
  console.error(err.message);
  process.exit(1);
}
const work = mkdtempSync(join(tmpdir(), 'turnstone-test-'));
const t0 = Date.now();
const db = await startLocalMariadb({
  dataDir: work,
  database: 'turnstone_test',
  log: (m) => console.log(m),
});
let code = 1;
let passed = 0;
let failed = 0;
let skipped = 0;
const skippedByFile = new Map<string, number>();
try {
  const wantsBrowser = args.length === 0 || args.some((a) => a.includes('browser'));
  if (wantsBrowser) await ensureWebBuilt((m) => console.log(m));
  const report = join(work, 'vitest.json');
  code = await new Promise<number>((resolve) => {
    const child = spawn(
      process.execPath,
      [
        join('node_modules', 'vitest', 'vitest.mjs'),
        'run',
        '--reporter=default',
        '--reporter=json',
        `--outputFile.json=${report}`,
        ...args,
      ],
      {
        stdio: 'inherit',
        env: { ...process.env, TEST_DATABASE_URL: db.url, TURNSTONE_TEST_TMP: work },
      },
    );
    child.on('exit', (c, signal) => resolve(c ?? (signal ? 1 : 0)));
  });
  if (existsSync(report)) {
    const r = JSON.parse(readFileSync(report, 'utf8')) as {
      numPassedTests: number;
      numFailedTests: number;
      numPendingTests: number;
      numTodoTests: number;
      numFailedTestSuites: number;
      testResults: Array<{ name: string; assertionResults: Array<{ status: string }> }>;
    };
    passed = r.numPassedTests;
    failed =
      r.numFailedTests +
      (r.numFailedTests === 0 && code !== 0 ? Math.max(1, r.numFailedTestSuites) : 0);
    skipped = r.numPendingTests + r.numTodoTests;
    for (const file of r.testResults) {
      const n = file.assertionResults.filter((a) => a.status !== 'passed' && a.status !== 'failed');
      const name = relative(process.cwd(), file.name);
      if (n.length) skippedByFile.set(name, (skippedByFile.get(name) ?? 0) + n.length);
    }
  } else if (code !== 0) {
    failed = 1;
  }
} finally {
  await db.stop();
  rmSync(work, { recursive: true, force: true });
}
console.log(`\nTest run took ${((Date.now() - t0) / 1000).toFixed(1)} s.`);
let why = '';
if (skipped) {
  if (skipReferences) {
    console.log('The scipy/numpy reference checks were skipped (TURNSTONE_SKIP_REFERENCES=1).');
  }
  console.log('Skipped:');
  for (const [file, n] of skippedByFile) console.log(`  ${n} in ${file}`);
  why = skipReferences
    ? ' (reference checks skipped: TURNSTONE_SKIP_REFERENCES=1)'
    : ' (see above)';
}
console.log(`${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped${why}` : ''}`);
process.exit(code !== 0 || failed > 0 ? 1 : 0);
