// Runs Debian's Python with scipy for live reference checks. The checks run, or the run
// fails: `npm test` installs python3-scipy first (packages/db/src/provision.ts). They are
// skipped only when TURNSTONE_SKIP_REFERENCES=1 asks for it, and the run's closing line says so.
import { spawnSync } from 'node:child_process';
import { REFERENCE_PYTHON, referencesSkipped } from '@turnstone/db/provision';

function probe(candidate: string): boolean {
  const r = spawnSync(candidate, ['-c', 'import scipy, numpy'], { encoding: 'utf8' });
  return r.status === 0;
}

export const python: string | null = probe(REFERENCE_PYTHON) ? REFERENCE_PYTHON : null;

export const MISSING_SCIPY =
  `scipy is not available: install python3-scipy (Debian) so ${REFERENCE_PYTHON} can import ` +
  'scipy and numpy (`npm test` installs it as root), or set TURNSTONE_SKIP_REFERENCES=1 to skip';

/**
 * False only when TURNSTONE_SKIP_REFERENCES=1 (the caller skips its checks); true when scipy
 * runs; throws otherwise, so a missing scipy fails the run instead of skipping quietly.
 */
export function scipyAvailable(): boolean {
  if (referencesSkipped()) return false;
  if (python) return true;
  throw new Error(MISSING_SCIPY);
}

/**
 * Runs `script` with the JSON-encoded `input` on stdin (available as `data`); the script
 * must print one JSON document (e.g. `print(json.dumps(out))`).
 */
export function runPython<T>(script: string, input: unknown): T {
  if (!python) throw new Error(MISSING_SCIPY);
  const prelude = 'import sys, json\nimport numpy as np\ndata = json.load(sys.stdin)\n';
  const r = spawnSync(python, ['-c', prelude + script], {
    input: JSON.stringify(input),
    encoding: 'utf8',
    maxBuffer: 1 << 28,
  });
  if (r.status !== 0) throw new Error(`python failed (${r.status}): ${r.stderr}`);
  return JSON.parse(r.stdout) as T;
}

/** Largest |a − b| / |b| over paired values (b = the reference). */
export function maxRelativeError(actual: ArrayLike<number>, reference: ArrayLike<number>): number {
  if (actual.length !== reference.length) {
    throw new Error(`length ${actual.length} differs from the reference's ${reference.length}`);
  }
  let worst = 0;
  for (let i = 0; i < actual.length; i++) {
    const b = reference[i]!;
    const e = Math.abs(actual[i]! - b) / Math.abs(b);
    if (!(e <= worst)) worst = e; // NaN propagates as a failure
  }
  return worst;
}

/** Deterministic test signal: tones plus uniform noise from a 32-bit LCG (no Math.random). */
export function testSignal(n: number, fs: number, seed = 1): number[] {
  let state = seed >>> 0;
  const rand = (): number => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    return state / 2 ** 32 - 0.5;
  };
  const x: number[] = new Array(n);
  for (let i = 0; i < n; i++) {
    const t = i / fs;
    x[i] =
      0.3 +
      1.0 * Math.sin(2 * Math.PI * 123.4 * t) +
      0.25 * Math.sin(2 * Math.PI * 2345.6 * t + 0.7) +
      0.5 * rand();
  }
  return x;
}
