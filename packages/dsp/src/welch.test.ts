import { describe, expect, it } from 'vitest';
import { welch } from './welch.ts';

function sine(n: number, fs: number, f: number, amplitude: number, phase = 0): Float64Array {
  return Float64Array.from(
    { length: n },
    (_, i) => amplitude * Math.sin(2 * Math.PI * f * (i / fs) + phase),
  );
}

describe('welch', () => {
  // Computed with scipy.signal.welch (Debian scipy 1.10): 2 V RMS sine at 1234 Hz, fs 10 kHz, 100,000 samples, nperseg 1024
  it.each([
    ['flattop', 2.0002],
    ['hann', 1.8369],
    ['rect', 1.5968],
  ] as const)(
    'when a 2 V RMS tone at 1234 Hz is read with %s (spectrum scaling), √max is %f',
    (window, expected) => {
      const x = sine(100000, 10000, 1234, 2 * Math.SQRT2);
      const r = welch(x, { sampleRateHz: 10000, nperseg: 1024, window, scaling: 'spectrum' });
      expect(Math.sqrt(Math.max(...r.power))).toBeCloseTo(expected, 4);
    },
  );

  // Parseval: Σ density·Δf = mean square = 2² = 4.0000 V² (Welch 1967; Oppenheim & Schafer)
  it('when the density of the same tone is summed over frequency, it gives the mean square 4.0000 V²', () => {
    const x = sine(100000, 10000, 1234, 2 * Math.SQRT2);
    const r = welch(x, { sampleRateHz: 10000, nperseg: 1024 });
    const total = r.power.reduce((a, b) => a + b, 0) * r.dfHz;
    expect(total).toBeCloseTo(4.0, 4);
  });

  // 'spectrum' / 'density' = fs·Σw²/(Σw)² = ENBW·Δf (Harris 1978, Proc. IEEE 66(1); scipy.signal.welch's two scalings)
  it('when spectrum and density scalings are compared, their ratio is ENBW·Δf', () => {
    const x = sine(8192, 1000, 77, 1);
    const d = welch(x, { sampleRateHz: 1000, nperseg: 1024 });
    const s = welch(x, { sampleRateHz: 1000, nperseg: 1024, scaling: 'spectrum' });
    expect(s.power[80]! / d.power[80]!).toBeCloseTo(d.enbwBins * d.dfHz, 10);
  });

  // scipy.signal.welch conventions: segments = ⌊(N − nperseg)/step⌋ + 1 (from memory)
  it('when 65,536 samples are split into 8192-sample halves-overlapping segments, 15 are averaged', () => {
    const r = welch(new Float64Array(65536).fill(1), { nperseg: 8192 });
    expect(r.segments).toBe(15);
    expect(r.power.length).toBe(4097);
    // constant detrend removes DC (common practice): what is left is rounding (a mean square of 1 would read 1)
    expect(Math.max(...r.power)).toBeLessThan(1e-20);
  });

  it('when detrend is none, the DC line keeps the mean', () => {
    const r = welch(new Float64Array(1024).fill(2), {
      nperseg: 256,
      detrend: 'none',
      window: 'rect',
      scaling: 'spectrum',
    });
    expect(r.power[0]).toBeCloseTo(4, 12);
  });

  it('when the options are impossible, it throws RangeError/TypeError', () => {
    const x = new Float64Array(100);
    expect(() => welch(x, { nperseg: 200 })).toThrow(RangeError);
    expect(() => welch(x, { nperseg: 64, noverlap: 64 })).toThrow(RangeError);
    expect(() => welch(x, { sampleRateHz: -1 })).toThrow(RangeError);
    expect(() => welch(x, { scaling: 'power' as never })).toThrow(TypeError);
    expect(() => welch([1], {})).toThrow(RangeError);
  });
});
