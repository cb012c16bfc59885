// Test support only (not exported by the package): runs Debian's python3 with numpy live,
// so least-squares and statistics checks compare against numpy rather than numbers we typed.
import { spawnSync } from 'node:child_process';
import { it } from 'vitest';

const PYTHON = '/usr/bin/python3';

function probe(): { available: boolean; reason: string } {
  const run = spawnSync(PYTHON, ['-c', 'import numpy; print(numpy.__version__)'], {
    encoding: 'utf8',
  });
  if (run.error)
    return { available: false, reason: `${PYTHON} not runnable: ${run.error.message}` };
  if (run.status !== 0) return { available: false, reason: `numpy not importable: ${run.stderr}` };
  return { available: true, reason: `numpy ${run.stdout.trim()}` };
}

const status = probe();
// Same switch as packages/db/src/provision.ts (not imported: condition stays free of db).
const skipReferences = process.env.TURNSTONE_SKIP_REFERENCES === '1';

/**
 * `it` for tests that run numpy live: they run (and fail with the reason when numpy is
 * missing), in and out of CI alike; skipped only when TURNSTONE_SKIP_REFERENCES=1.
 */
export const itWithNumpy = skipReferences ? it.skip : it;

/** Runs a Python snippet that prints one JSON value, and returns it parsed. */
export function runNumpy(code: string): unknown {
  if (!status.available) throw new Error(`numpy live check needed, but ${status.reason}`);
  const run = spawnSync(PYTHON, ['-c', `import json, numpy as np\n${code}`], { encoding: 'utf8' });
  if (run.status !== 0) throw new Error(`python failed: ${run.stderr}`);
  return JSON.parse(run.stdout) as unknown;
}
