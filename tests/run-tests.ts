/**
 * `npm test`: one throw-away MariaDB for the whole run (temporary folder, free port), the
 * web build the browser tests need, then every vitest project. Ends with the line
 * `N passed, N failed` and a non-zero exit on any failure.
 * Extra arguments go to vitest, e.g. `npm test -- --project unit`.
 */
import { spawn } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { startLocalMariadb } from '@turnstone/db/local-server';
import { ensureWebBuilt } from '../apps/server/src/lib/web-build.ts';

const args = process.argv.slice(2);
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
    };
    passed = r.numPassedTests;
    failed =
      r.numFailedTests +
      (r.numFailedTests === 0 && code !== 0 ? Math.max(1, r.numFailedTestSuites) : 0);
    skipped = r.numPendingTests + r.numTodoTests;
  } else if (code !== 0) {
    failed = 1;
  }
} finally {
  await db.stop();
  rmSync(work, { recursive: true, force: true });
}
console.log(`\nTest run took ${((Date.now() - t0) / 1000).toFixed(1)} s.`);
console.log(`${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`);
process.exit(code !== 0 || failed > 0 ? 1 : 0);
