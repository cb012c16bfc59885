// Benchmarks @turnstone/dsp against scipy on the same input, in the same run.
// Run: npx tsx tests/bench/dsp-bench.ts   (or npm run bench for every bench file)
// Prints times (fastest batch mean, interleaved with scipy) and ratios ours/scipy.
// No pass/fail on time.
import { spawn, spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createInterface } from 'node:readline';
import { analyzeSnapshot, rfft, welch } from '@turnstone/dsp';
import { lcg32 } from '@turnstone/dsp/seeded-random';

const FS = 25600;
const RFFT_SIZES = [4096, 8192, 16384, 32768, 65536, 131072, 262144];
const BATCHES = 2;
const BATCH_SECONDS = 0.15;

function signal(n: number): Float64Array {
  const u = lcg32(2024);
  return Float64Array.from({ length: n }, (_, i) => {
    const t = i / FS;
    return (
      Math.sin(2 * Math.PI * 24.6 * t) +
      0.3 * Math.sin(2 * Math.PI * 1234.5 * t) +
      0.2 * (u() - 0.5)
    );
  });
}

/**
 * Fastest batch mean per call, in ms. The minimum (as Python's timeit advises) is the
 * figure least disturbed by other work on the machine; scipy is timed the same way.
 */
function time(fn: () => unknown): number {
  for (let i = 0; i < 5; i++) fn();
  let reps = 1;
  for (;;) {
    const t0 = performance.now();
    for (let i = 0; i < reps; i++) fn();
    if (performance.now() - t0 > BATCH_SECONDS * 1000 || reps > 1 << 20) break;
    reps *= 2;
  }
  const means: number[] = [];
  for (let b = 0; b < BATCHES; b++) {
    const t0 = performance.now();
    for (let i = 0; i < reps; i++) fn();
    means.push((performance.now() - t0) / reps);
  }
  return Math.min(...means);
}

// A persistent Python process answers one timing per line ("welch65536", "rfft4096", …), so
// each scipy figure is taken right next to ours and a busy machine skews both alike.
const PY_SERVER = String.raw`
import sys, json, time
import numpy as np
from scipy import signal, fft
BATCHES, BATCH_SECONDS = ${BATCHES}, ${BATCH_SECONDS}
def bench(fn):
    for _ in range(5): fn()
    reps = 1
    while True:
        t0 = time.perf_counter()
        for _ in range(reps): fn()
        if time.perf_counter() - t0 > BATCH_SECONDS or reps > (1 << 20): break
        reps *= 2
    means = []
    for _ in range(BATCHES):
        t0 = time.perf_counter()
        for _ in range(reps): fn()
        means.append((time.perf_counter() - t0) / reps * 1e3)
    return min(means)
x = np.fromfile(sys.argv[1], dtype='<f8')
fs = ${FS}
# Warm-up: until a large block has been freed once, glibc malloc serves scipy's big
# temporaries from fresh mmap pages, which makes welch about 3x slower here. Steady state
# is the fair figure for a long-running process, so reach it before timing anything.
for _ in range(3):
    fft.rfft(x)
    signal.welch(x[:65536], fs=fs, window='hann', nperseg=8192, noverlap=4096)
print('ready', flush=True)
for line in sys.stdin:
    name = line.strip()
    if name.startswith('welch'):
        n = int(name[5:]); y = x[:n].copy()
        t = bench(lambda: signal.welch(y, fs=fs, window='hann', nperseg=8192, noverlap=4096))
    else:
        n = int(name[4:]); y = x[:n].copy()
        t = bench(lambda: fft.rfft(y))
    print(json.dumps(t), flush=True)
`;

interface Scipy {
  time(name: string): Promise<number>;
  close(): void;
}

async function startScipy(x: Float64Array): Promise<Scipy | null> {
  const python = ['/usr/bin/python3', 'python3'].find(
    (p) => spawnSync(p, ['-c', 'import scipy, numpy'], { encoding: 'utf8' }).status === 0,
  );
  if (!python) {
    console.warn('scipy not available (install python3-scipy): printing our times only');
    return null;
  }
  const dir = mkdtempSync(join(tmpdir(), 'turnstone-bench-'));
  const path = join(dir, 'x.f64');
  writeFileSync(path, new Uint8Array(x.buffer, x.byteOffset, x.byteLength));
  const child = spawn(python, ['-u', '-c', PY_SERVER, path], {
    stdio: ['pipe', 'pipe', 'inherit'],
  });
  const lines = createInterface({ input: child.stdout })[Symbol.asyncIterator]();
  const next = async (): Promise<string> => {
    const r = await lines.next();
    if (r.done) throw new Error('the scipy timing process ended early');
    return r.value;
  };
  if ((await next()) !== 'ready') throw new Error('the scipy timing process did not start');
  return {
    async time(name) {
      child.stdin.write(`${name}\n`);
      return Number(JSON.parse(await next()));
    },
    close() {
      child.stdin.end();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

function snapshotInput(x: Float64Array, n: number) {
  const samples = Int32Array.from(x.subarray(0, n), (v) => Math.round(v * 0.1 * 2 ** 23 * 0.5));
  return {
    samples,
    encoding: 'int32' as const,
    sampleRateHz: FS,
    adc: { bits: 24, fullScaleV: 1 },
    sensor: { sensitivityMvPerG: 100 },
    nominalRpm: 1480,
    machine: {
      bearings: [{ name: 'DE', rollingElements: 9, ballDiameterMm: 7.94, pitchDiameterMm: 39.04 }],
    },
    bands: [
      { key: 'overall', kind: 'overall' as const },
      { key: '1x', kind: 'fault' as const, fault: '1×', unit: 'mm/s' as const },
      { key: 'bpfo', kind: 'fault' as const, fault: 'DE BPFO', source: 'envelope' as const },
    ],
  };
}

// Many short rounds, ours and scipy taking turns, so both get the machine's quiet moments.
const ROUNDS = 10;
const x = signal(Math.max(...RFFT_SIZES));
const scipy = await startScipy(x);

type Case = { name: string; scipyCase: string; run: () => unknown; target?: string };
const cases: Case[] = [];
const w = x.subarray(0, 65536);
cases.push({
  name: 'welch 65,536 (hann, 8192, 50 %)',
  scipyCase: 'welch65536',
  run: () => welch(w, { sampleRateHz: FS, nperseg: 8192, noverlap: 4096 }),
  target: '≤ 1.0',
});
for (const n of RFFT_SIZES) {
  const y = x.slice(0, n);
  cases.push({ name: `rfft ${n.toLocaleString('en')}`, scipyCase: `rfft${n}`, run: () => rfft(y) });
}
for (const n of [8192, 65536]) {
  const input = snapshotInput(x, n);
  cases.push({
    name: `analyzeSnapshot ${n.toLocaleString('en')} vs scipy welch alone`,
    scipyCase: `welch${n}`,
    run: () => analyzeSnapshot(input),
    ...(n === 65536 ? { target: '≤ 3.0' } : {}),
  });
}

type Row = { case: string; ours: number; scipy: number | null; target?: string };
const rows: Row[] = [];
for (const c of cases) {
  const ours: number[] = [];
  const theirs: number[] = [];
  for (let r = 0; r < ROUNDS; r++) {
    if (scipy) theirs.push(await scipy.time(c.scipyCase));
    ours.push(time(c.run));
  }
  rows.push({
    case: c.name,
    ours: Math.min(...ours),
    scipy: scipy ? Math.min(...theirs) : null,
    ...(c.target ? { target: c.target } : {}),
  });
}
scipy?.close();

const header = ['case', 'ours ms', 'scipy ms', 'ours/scipy', 'target'];
const table = rows.map((r) => [
  r.case,
  r.ours.toFixed(4),
  r.scipy === null ? '—' : r.scipy.toFixed(4),
  r.scipy === null ? '—' : (r.ours / r.scipy).toFixed(2),
  r.target ?? '',
]);
const widths = header.map((h, i) => Math.max(h.length, ...table.map((row) => row[i]!.length)));
const line = (cells: string[]): string =>
  cells.map((c, i) => (i === 0 ? c.padEnd(widths[i]!) : c.padStart(widths[i]!))).join('  ');
console.log(
  `@turnstone/dsp vs scipy (node ${process.version}; each figure: fastest of ${ROUNDS} interleaved rounds × ${BATCHES} batch means)`,
);
console.log(line(header));
console.log(widths.map((wd) => '-'.repeat(wd)).join('  '));
for (const row of table) console.log(line(row));
