import { describe, expect, it } from 'vitest';
import { findPeaks } from './spectral-peaks.ts';
import { welch } from './welch.ts';

/** 1 V peak tone at `f` Hz with fs = N = 1024 (one bin = 1 Hz), read once with `window`. */
function lines(
  f: number,
  window: 'hann' | 'rect' | 'flattop' | 'hamming',
  amplitude = 1,
  phase = 0.3,
): Float64Array {
  const n = 1024;
  const x = Float64Array.from(
    { length: n },
    (_, i) => amplitude * Math.sin((2 * Math.PI * f * i) / n + phase),
  );
  return welch(x, { sampleRateHz: n, nperseg: n, window, scaling: 'spectrum', detrend: 'none' })
    .power;
}

describe('spectral peaks', () => {
  // Computed from the window definitions (Harris 1978, Proc. IEEE 66(1)): tone half a bin off, fs = N = 1024: Hann 0.8488 (−1.424 dB), rect 0.6380
  it('when a tone sits half a bin off, the Hann line reads 0.8488 and the rectangular line 0.6380', () => {
    const peakOf = (p: Float64Array): number => Math.sqrt(2 * p[100]!);
    expect(peakOf(lines(100.5, 'hann', 1, 0))).toBeCloseTo(0.8488, 3);
    expect(peakOf(lines(100.5, 'rect', 1, 0))).toBeCloseTo(0.638, 3);
  });

  // Harris 1978, Proc. IEEE 66(1): flat-top reads an off-bin tone within 0.1 % without interpolation
  it.each([0.13, 0.25, 0.37])(
    'when a tone sits %f bin off, the flat-top line reads its amplitude within 0.1 percent',
    (offset) => {
      const p = lines(200 + offset, 'flattop', 3);
      expect(Math.abs(Math.sqrt(2 * p[200]!) - 3) / 3).toBeLessThan(1e-3);
    },
  );

  // Flat-top scalloping loss 0.01 dB (computed from scipy.signal.windows.flattop's coefficients, D'Antona & Ferrero 2006) (worst case, half a bin off)
  it('when a tone sits exactly half a bin off, the flat-top line is within 0.02 dB', () => {
    const p = lines(200.5, 'flattop', 3);
    expect(Math.abs(20 * Math.log10(Math.sqrt(2 * p[200]!) / 3))).toBeLessThan(0.02);
  });

  // Harris 1978 kernels; Grandke 1983 ratio interpolation: exact for a lone tone up to the negative-frequency image
  it.each(['hann', 'rect', 'hamming', 'flattop'] as const)(
    'when a tone sits between bins, %s interpolation recovers frequency and RMS amplitude',
    (window) => {
      for (const f of [100.5, 150.23, 301.81]) {
        const [peak] = findPeaks(lines(f, window, 2), 1, { window, count: 1 });
        expect(peak!.hz).toBeCloseTo(f, window === 'rect' ? 2 : 3);
        expect(peak!.amplitude).toBeCloseTo(Math.SQRT2, window === 'rect' ? 2 : 3);
      }
    },
  );

  it('when several tones are present, the largest come first and the count is honoured', () => {
    const n = 4096;
    const x = Float64Array.from(
      { length: n },
      (_, i) =>
        Math.sin((2 * Math.PI * 100 * i) / n) +
        3 * Math.sin((2 * Math.PI * 300 * i) / n) +
        2 * Math.sin((2 * Math.PI * 700 * i) / n),
    );
    const p = welch(x, { sampleRateHz: n, nperseg: n, scaling: 'spectrum' }).power;
    const peaks = findPeaks(p, 1, { count: 2 });
    expect(peaks.map((q) => Math.round(q.hz))).toEqual([300, 700]);
    expect(findPeaks(p, 1, { minHz: 200, maxHz: 400, count: 5 })[0]!.bin).toBe(300);
  });

  it('when the spectrum is too short or the count negative, it answers [] or throws', () => {
    expect(findPeaks([1, 2], 1)).toEqual([]);
    expect(() => findPeaks([1, 2, 1, 0], 1, { count: -1 })).toThrow(RangeError);
  });
});
