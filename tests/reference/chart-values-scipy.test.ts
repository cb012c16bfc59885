// The charts' values tables: a spectrum's largest peaks against scipy.signal.find_peaks run
// live (Debian python3-scipy), and the waveform's thinned rows against a plain scan.
import { describe, expect, it } from 'vitest';
import { largestPeaks, waveformRows } from '../../apps/web/src/components/charts/chart-values.ts';
import { runPython, scipyAvailable, testSignal } from './scipy.ts';

const available = scipyAvailable();

/** A rough spectrum: |rfft| of the shared test signal, plus flat tops cut in by hand. */
function awkwardSpectrum(): number[] {
  const x = testSignal(4096, 10240, 7);
  const lines: number[] = [];
  for (let k = 0; k <= 2048; k++) {
    let re = 0;
    let im = 0;
    for (let i = 0; i < x.length; i += 4) {
      re += x[i]! * Math.cos((2 * Math.PI * k * i) / x.length);
      im -= x[i]! * Math.sin((2 * Math.PI * k * i) / x.length);
    }
    lines.push(Math.round(Math.hypot(re, im) * 1000) / 1000);
  }
  // Flat tops of two and of three equal lines (a clipped or quantised spectrum has them),
  // one flat stretch that then rises (not a peak), and a peak on the last-but-one line.
  lines[300] = lines[301] = 99;
  lines[299] = 1;
  lines[302] = 1;
  lines[500] = lines[501] = lines[502] = 98;
  lines[499] = 2;
  lines[503] = 2;
  lines[700] = 0;
  lines[701] = lines[702] = 97;
  lines[703] = 150;
  lines[704] = 0;
  lines[2047] = 200;
  lines[2046] = 0;
  lines[2048] = 0;
  return lines;
}

describe.skipIf(!available)('chart values against scipy, live', { timeout: 60_000 }, () => {
  // scipy live: scipy.signal.find_peaks(x), the peaks sorted by height, largest first.
  it.each([
    ['the whole spectrum', 0, Infinity],
    ['a band cutting through peaks', 312.5, 1250],
    ['a band holding a flat top of three', 615, 630],
  ])(
    'when the largest peaks of %s are listed, they are scipy.find_peaks’ largest, at the same lines',
    (_what, from, to) => {
      const lines = awkwardSpectrum();
      const step = 1.25;
      const ref = runPython<number[]>(
        `from scipy.signal import find_peaks
x = np.array(data['x'])
p, _ = find_peaks(x)
f = p * data['step']
keep = p[(f >= data['lo'] - 1e-9) & (f <= data['hi'] + 1e-9)]
order = sorted(keep.tolist(), key=lambda i: (-x[i], i))
print(json.dumps(order[:5]))`,
        { x: lines, step, lo: from, hi: Number.isFinite(to) ? to : 1e12 },
      );
      const ours = largestPeaks(lines, step, from, to, 5);
      expect(ours.map((p) => Math.round(p.x / step))).toEqual(ref);
      for (const p of ours) expect(p.value).toBe(lines[Math.round(p.x / step)]);
    },
  );
});

describe('waveform rows', () => {
  // Common practice, no source: a thinned row is the largest magnitude of its run.
  it('when a window holds more samples than rows, each row is the largest magnitude of its run and the runs tile the window', () => {
    const x = testSignal(8192, 10240, 3);
    x[5000] = -9; // an impact between two row centres
    const { rows, perRow } = waveformRows(x, 1234, 7000, 200);
    expect(rows.length).toBe(200);
    expect(perRow).toBeCloseTo(5767 / 200, 9);
    let prevEnd = 1233;
    for (const r of rows) {
      // Its run: from after the previous run up to just before the next row's run begins.
      expect(r.index).toBeGreaterThan(prevEnd);
      expect(r.value).toBe(x[r.index]);
      prevEnd = Math.max(prevEnd, r.index);
    }
    expect(rows.some((r) => r.index === 5000 && r.value === -9)).toBe(true);
    // Brute force over every run of the same split.
    for (let r = 0; r < 200; r++) {
      const a = 1234 + Math.floor((r * 5767) / 200);
      const b = 1234 + Math.floor(((r + 1) * 5767) / 200) - 1;
      let m = 0;
      for (let i = a; i <= b; i++) m = Math.max(m, Math.abs(x[i]!));
      expect(Math.abs(rows[r]!.value)).toBe(m);
    }
  });

  it('when the window holds few samples, every one is listed; a window past the end is cut', () => {
    const x = testSignal(100, 10240, 4);
    const all = waveformRows(x, 90, 150, 200);
    expect(all.rows.map((r) => r.index)).toEqual([90, 91, 92, 93, 94, 95, 96, 97, 98, 99]);
    expect(all.perRow).toBe(1);
    expect(waveformRows(x, 120, 150).rows).toEqual([]);
  });
});
