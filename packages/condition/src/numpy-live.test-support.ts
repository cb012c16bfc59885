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
const inCi = process.env.CI === 'true';
if (!status.available && !inCi) {
  console.warn(`numpy live checks skipped (${status.reason}); under CI=true they fail instead`);
}

/**
 * `it` for tests that run numpy live: skipped with a warning when numpy is missing, except
 * under CI=true, where the test runs and fails with the reason.
 */
export const itWithNumpy = status.available || inCi ? it : it.skip;

/** Runs a Python snippet that prints one JSON value, and returns it parsed. */
export function runNumpy(code: string): unknown {
  if (!status.available) throw new Error(`numpy live check needed, but ${status.reason}`);
  const run = spawnSync(PYTHON, ['-c', `import json, numpy as np\n${code}`], { encoding: 'utf8' });
  if (run.status !== 0) throw new Error(`python failed: ${run.stderr}`);
  return JSON.parse(run.stdout) as unknown;
}
