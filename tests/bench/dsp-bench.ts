// Benchmarks @turnstone/dsp against scipy on the same input, in the same run.
// Run: npx tsx tests/bench/dsp-bench.ts   (or npm run bench for every bench file)
// Prints times (median of batch means) and ratios ours/scipy. No pass/fail on time.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { analyzeSnapshot, rfft, welch } from '@turnstone/dsp';

const FS = 25600;
const RFFT_SIZES = [4096, 8192, 16384, 32768, 65536, 131072, 262144];
const BATCHES = 7;
const BATCH_SECONDS = 0.15;

function signal(n: number): Float64Array {
  let s = 2024;
  return Float64Array.from({ length: n }, (_, i) => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    const t = i / FS;
    return Math.sin(2 * Math.PI * 24.6 * t) + 0.3 * Math.sin(2 * Math.PI * 1234.5 * t) + 0.2 * (s / 2 ** 32 - 0.5);
  });
}

/** Median over batches of the mean time per call, in ms. */
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
  means.sort((a, b) => a - b);
  return means[Math.floor(BATCHES / 2)]!;
}

const PY_SCRIPT = String.raw`
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
    means.sort()
    return means[BATCHES // 2]
x = np.fromfile(sys.argv[1], dtype='<f8')
fs = ${FS}
out = {}
out['welch65536'] = bench(lambda: signal.welch(x[:65536], fs=fs, window='hann', nperseg=8192, noverlap=4096))
out['welch8192'] = bench(lambda: signal.welch(x[:8192], fs=fs, window='hann', nperseg=8192, noverlap=4096))
for n in ${JSON.stringify(RFFT_SIZES)}:
    y = x[:n].copy()
    out['rfft%d' % n] = bench(lambda: fft.rfft(y))
print(json.dumps(out))
`;

function scipyTimes(x: Float64Array): Record<string, number> | null {
  const python = ['/usr/bin/python3', 'python3'].find(
    (p) => spawnSync(p, ['-c', 'import scipy, numpy'], { encoding: 'utf8' }).status === 0,
  );
  if (!python) {
    console.warn('scipy not available (install python3-scipy): printing our times only');
    return null;
  }
  const dir = mkdtempSync(join(tmpdir(), 'turnstone-bench-'));
  try {
    const path = join(dir, 'x.f64');
    writeFileSync(path, new Uint8Array(x.buffer, x.byteOffset, x.byteLength));
    const r = spawnSync(python, ['-c', PY_SCRIPT, path], { encoding: 'utf8', maxBuffer: 1 << 24 });
    if (r.status !== 0) throw new Error(`scipy timing failed: ${r.stderr}`);
    return JSON.parse(r.stdout) as Record<string, number>;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
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
    machine: { bearings: [{ name: 'DE', rollingElements: 9, ballDiameterMm: 7.94, pitchDiameterMm: 39.04 }] },
    bands: [
      { key: 'overall', kind: 'overall' as const },
      { key: '1x', kind: 'fault' as const, fault: '1×', unit: 'mm/s' as const },
      { key: 'bpfo', kind: 'fault' as const, fault: 'DE BPFO', source: 'envelope' as const },
    ],
  };
}

const x = signal(Math.max(...RFFT_SIZES));
const ref = scipyTimes(x);

type Row = { case: string; ours: number; scipy: number | null; target?: string };
const rows: Row[] = [];
const w = x.subarray(0, 65536);
rows.push({
  case: 'welch 65,536 (hann, 8192, 50 %)',
  ours: time(() => welch(w, { sampleRateHz: FS, nperseg: 8192, noverlap: 4096 })),
  scipy: ref?.welch65536 ?? null,
  target: '≤ 1.0',
});
for (const n of RFFT_SIZES) {
  const y = x.slice(0, n);
  rows.push({ case: `rfft ${n.toLocaleString('en')}`, ours: time(() => rfft(y)), scipy: ref?.[`rfft${n}`] ?? null });
}
for (const n of [8192, 65536]) {
  const input = snapshotInput(x, n);
  rows.push({
    case: `analyzeSnapshot ${n.toLocaleString('en')} vs scipy welch alone`,
    ours: time(() => analyzeSnapshot(input)),
    scipy: ref?.[`welch${n}`] ?? null,
    ...(n === 65536 ? { target: '≤ 3.0' } : {}),
  });
}

const header = ['case', 'ours ms', 'scipy ms', 'ours/scipy', 'target'];
const table = rows.map((r) => [
  r.case,
  r.ours.toFixed(4),
  r.scipy === null ? '—' : r.scipy.toFixed(4),
  r.scipy === null ? '—' : (r.ours / r.scipy).toFixed(2),
  r.target ?? '',
]);
const widths = header.map((h, i) => Math.max(h.length, ...table.map((row) => row[i]!.length)));
const line = (cells: string[]): string => cells.map((c, i) => (i === 0 ? c.padEnd(widths[i]!) : c.padStart(widths[i]!))).join('  ');
console.log(`@turnstone/dsp vs scipy (${process.version}; median of ${BATCHES} batch means)`);
console.log(line(header));
console.log(widths.map((wd) => '-'.repeat(wd)).join('  '));
for (const row of table) console.log(line(row));
