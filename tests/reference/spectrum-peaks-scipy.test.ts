// The spectrum view's real peaks (local maxima at or above the median line + 10 dB of the range
// shown) against scipy.signal.find_peaks(x, height=floor) run live (Debian python3-scipy),
// with the floor computed by numpy.median on the same lines.
import { describe, expect, it } from 'vitest';
import { realPeaks } from '../../apps/web/src/components/charts/spectrum-math.ts';
import { runPython, scipyAvailable, testSignal } from './scipy.ts';

const available = scipyAvailable();

/** |rfft| of the shared test signal (a 0.3 offset, 123.4 Hz and 2345.6 Hz tones, noise), Hann-windowed. */
function spectrum(): number[] {
  const n = 2048;
  const fs = 10240;
  const x = testSignal(n, fs, 11);
  const out: number[] = [];
  for (let k = 0; k <= n / 2; k++) {
    let re = 0;
    let im = 0;
    for (let i = 0; i < n; i++) {
      const w = 0.5 - 0.5 * Math.cos((2 * Math.PI * i) / n);
      re += w * x[i]! * Math.cos((2 * Math.PI * k * i) / n);
      im -= w * x[i]! * Math.sin((2 * Math.PI * k * i) / n);
    }
    out.push((2 * Math.hypot(re, im)) / n);
  }
  // A flat top of two equal lines above the floor (a quantised spectrum has them).
  out[700] = out[701] = 0.2;
  return out;
}

describe.skipIf(!available)('real peaks against scipy, live', { timeout: 60_000 }, () => {
  // scipy live: find_peaks(x[first:last+1], height=median(x[first:last+1]) · 10^(10/20)).
  it.each([
    ['the whole spectrum above the 3-line low cut', 0, 5120],
    ['a window around the 123.4 Hz tone', 60, 300],
    ['a window with the flat top', 3000, 4000],
  ])(
    'when the peaks of %s are listed, they are the lines scipy.find_peaks finds above the same floor',
    (_what, from, to) => {
      const lines = spectrum();
      const step = 5; // 10240 Hz / 2048
      const lowCut = 3 * step;
      const ref = runPython<{ floor: number; peaks: number[] }>(
        `from scipy.signal import find_peaks
x = np.array(data['x'])
first = int(np.ceil(max(data['lo'], data['cut']) / data['step'] - 1e-9))
last = min(len(x) - 1, int(np.floor(data['hi'] / data['step'] + 1e-9)))
seg = x[first:last + 1]
floor = float(np.median(seg) * 10 ** (10 / 20))
p, props = find_peaks(seg, height=floor)
idx = [int(i) + first for i in p]
idx.sort(key=lambda i: (-x[i], i))
print(json.dumps({'floor': floor, 'peaks': idx[:12]}))`,
        { x: lines, step, lo: from, hi: to, cut: lowCut },
      );
      const ours = realPeaks(lines, step, from, to, { lowCut });
      expect(ours.floor).toBeCloseTo(ref.floor, 12);
      expect(ours.peaks.map((p) => Math.round(p.x / step))).toEqual(ref.peaks);
      expect(ours.peaks.length).toBeGreaterThan(0);
    },
  );
});
